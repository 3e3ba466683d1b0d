import { usageError } from '../UserError.js';
import { planText as msg } from '../messages.js';
import type { PlannedRun } from './Plan.js';

/** Placeholders a --command template may use. */
export const PLACEHOLDERS = ['width', 'train_size', 'label_noise', 'seed', 'epochs', 'run', 'condition', 'resume_from', 'index'] as const;
export type Placeholder = (typeof PLACEHOLDERS)[number];

// `{name}` not preceded by `$` (so shell `${VAR}` passes through untouched).
const PATTERN = /(?<!\$)\{([A-Za-z_][A-Za-z0-9_]*)\}/g;

export interface CommandTemplate {
  text: string;
  /** Text and placeholder pieces in order. */
  parts: ({ text: string } | { name: Placeholder })[];
  /** Whether the template can resume a run (uses {resume_from}). */
  resumes: boolean;
}

/** Parses a --command template; unknown placeholders are a usage error. */
export function parseTemplate(text: string): CommandTemplate {
  const parts: CommandTemplate['parts'] = [];
  let last = 0;
  for (const m of text.matchAll(PATTERN)) {
    const name = m[1];
    if (!(PLACEHOLDERS as readonly string[]).includes(name)) throw usageError(msg.badPlaceholder(name, [...PLACEHOLDERS]));
    if (m.index! > last) parts.push({ text: text.slice(last, m.index) });
    parts.push({ name: name as Placeholder });
    last = m.index! + m[0].length;
  }
  if (last < text.length) parts.push({ text: text.slice(last) });
  return { text, parts, resumes: parts.some((p) => 'name' in p && p.name === 'resume_from') };
}

/** The value of each placeholder for a run, as text. */
export function placeholderValues(run: PlannedRun, index: number): Record<Placeholder, string> {
  return {
    width: String(run.width),
    train_size: String(run.train_size),
    label_noise: String(run.label_noise),
    seed: String(run.seed),
    epochs: String(run.epochs),
    run: run.run,
    condition: run.condition,
    resume_from: String(run.resume_from ?? 0),
    index: String(index),
  };
}

/** Fills a template, passing each value (null: none, e.g. bound at run time) through `quote`. */
export function fillTemplate(
  t: CommandTemplate,
  values: Record<Placeholder, string> | null,
  quote: (v: string, name: Placeholder) => string,
): string {
  return t.parts.map((p) => ('text' in p ? p.text : quote(values ? values[p.name] : '', p.name))).join('');
}
