import { escapeControls } from '../escapeControls.js';

type Write = typeof process.stdout.write;

/**
 * Makes everything the process writes as text to stdout and stderr terminal-safe until the
 * returned function is called: run names, conditions, column names and file names reach many
 * messages, and one guard at the two sinks covers all of them. Bytes (Buffers) pass untouched.
 * The progress bar writes its own escape sequences through another stream on the same terminal.
 */
export function guardOutput(): () => void {
  const streams = [process.stdout, process.stderr];
  const originals = streams.map((s) => s.write);
  streams.forEach((s, k) => {
    const write = originals[k];
    s.write = function (this: NodeJS.WriteStream, chunk: unknown, ...rest: unknown[]) {
      return (write as (c: unknown, ...r: unknown[]) => boolean).call(this, typeof chunk === 'string' ? escapeControls(chunk) : chunk, ...rest);
    } as Write;
  });
  return () => streams.forEach((s, k) => (s.write = originals[k]));
}
