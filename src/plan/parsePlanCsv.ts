import { parse } from 'csv-parse/sync';
import { UserError } from '../UserError.js';
import { planCsvText as msg } from '../messages.js';
import { uninertCell } from './csvCell.js';

/** One run of a plan CSV, as `simulate --plan` (or a cluster job) reads it. */
export interface PlanCsvRun {
  /** 1-based line of the run in the file (for messages). */
  line: number;
  run: string;
  condition: string;
  width: number;
  train_size: number;
  label_noise: number;
  seed: number;
  epochs: number;
  /** Epoch the run continues from (its curve up to there is already logged); null for a fresh run. */
  resume_from: number | null;
}

const REQUIRED = ['width', 'train_size', 'seed', 'epochs'] as const;

/**
 * Reads a plan CSV (the `plan --emit csv` columns, RFC 4180; any column order, extra columns
 * ignored). width, train_size, seed and epochs are required; label_noise defaults to 0,
 * condition to "", run to "" (the caller names the run), resume_from to none. Every bad cell
 * stops the read with file, line and column named: a plan runs exactly what it lists or nothing.
 */
export function parsePlanCsv(text: string, file: string): PlanCsvRun[] {
  let records: string[][];
  try {
    records = parse(text, { bom: true, relax_column_count: false, skip_empty_lines: true });
  } catch (err) {
    const e = err as { lines?: number; message?: string };
    throw new UserError(msg.syntax(file, e.lines ?? 0, String(e.message ?? err)));
  }
  if (records.length === 0) throw new UserError(msg.empty(file));
  const head = records[0].map((h) => h.trim().toLowerCase());
  for (const col of REQUIRED) if (!head.includes(col)) throw new UserError(msg.missingColumn(file, col, head));
  const at = (name: string) => head.indexOf(name);
  const out: PlanCsvRun[] = [];
  const seen = new Map<string, number>();
  for (let r = 1; r < records.length; r++) {
    const rec = records[r];
    const line = r + 1;
    const cell = (name: string) => (at(name) >= 0 ? uninertCell(rec[at(name)].trim()) : '');
    const num = (name: string, ok: (v: number) => boolean, what: string, fallback?: number): number => {
      const s = cell(name);
      if (s === '' && fallback !== undefined) return fallback;
      const v = Number(s);
      if (s === '' || !Number.isFinite(v) || !ok(v)) throw new UserError(msg.badCell(file, line, name, s, what));
      return v;
    };
    const width = num('width', (v) => Number.isInteger(v) && v >= 1, 'a whole number >= 1');
    const train_size = num('train_size', (v) => Number.isInteger(v) && v >= 2, 'a whole number >= 2');
    const label_noise = num('label_noise', (v) => v >= 0 && v < 1, 'a fraction in [0, 1)', 0);
    const seed = num('seed', Number.isInteger, 'a whole number');
    const epochs = num('epochs', (v) => Number.isInteger(v) && v >= 1 && v <= 1e9, 'a whole number of epochs >= 1');
    const resumeText = cell('resume_from');
    const resume_from = resumeText === '' ? null : num('resume_from', (v) => Number.isInteger(v) && v >= 0 && v < epochs, `a whole epoch below epochs (${epochs})`);
    const run = cell('run');
    const condition = cell('condition');
    const key = run !== '' ? `r\u0000${run}` : `c\u0000${condition}\u0000${width}\u0000${train_size}\u0000${label_noise}\u0000${seed}`;
    const first = seen.get(key);
    if (first !== undefined) throw new UserError(msg.duplicate(file, line, first, run || `width ${width}, n ${train_size}, noise ${label_noise}, seed ${seed}`));
    seen.set(key, line);
    out.push({ line, run, condition, width, train_size, label_noise, seed, epochs, resume_from });
  }
  return out;
}
