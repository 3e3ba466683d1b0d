/**
 * Control characters that make a terminal do something instead of showing text: C0 controls
 * other than tab and line feed (ESC starts colour and title sequences, CR overwrites a line, BEL),
 * DEL, the C1 controls (U+009B is a one-character CSI on some terminals), the line and paragraph
 * separators, and the bidirectional overrides and isolates that reorder what is shown.
 */
const CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

/**
 * Text with every such character written as a `\uXXXX` escape: a run named `ESC[31m` prints as
 * `\u001b[31m`. The escape is JSON's own, so JSON printed this way still parses to the same value.
 */
export function escapeControls(text: string): string {
  CONTROL.lastIndex = 0;
  if (!CONTROL.test(text)) return text;
  return text.replace(CONTROL, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}
