import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { RowTable } from '../store/RowTable.js';
import { quoteCsvField } from '../csv/quoteCsvField.js';

/** How a sweep's logs are laid out on disk, like real sweeps do it. */
export const LOG_SHAPES = ['csv', 'jsonl', 'dirs'] as const;
export type LogShape = (typeof LOG_SHAPES)[number];

/** Columns fixed for a run (written once per run in the `dirs` shape's config.json). */
const RUN_COLUMNS = ['run', 'condition', 'seed', 'width', 'train_size', 'label_noise'] as const;
/** Columns that change along a run's curve. */
const CURVE_COLUMNS = ['epochs', 'test_error', 'train_error', 'test_loss', 'train_loss', 'wall_seconds'] as const;

/**
 * Writes a simulated sweep with canonical column names:
 * - csv: DIR/sweep.csv, one file for the whole sweep, one row per run and logged epoch;
 * - jsonl: DIR/runs/RUN.jsonl, one file per run, one JSON object per logged epoch;
 * - dirs: DIR/RUN/config.json (the run's configuration) + DIR/RUN/metrics.csv (its curve).
 * Columns that are empty for the whole sweep are left out (no test_error in a regression sweep);
 * `condition` only when set. Returns the files written.
 */
export async function writeSweepLogs(opts: { table: RowTable; dir: string; shape: LogShape }): Promise<string[]> {
  const { table: t, dir, shape } = opts;
  const numeric = (name: string): Float64Array | null => {
    const col = name in t.extra ? t.extra[name] : ((t as unknown as Record<string, unknown>)[name] as Float64Array | undefined);
    return col instanceof Float64Array ? col : null;
  };
  const present = (name: string) => {
    if (name === 'run') return true;
    if (name === 'condition') return t.condition.some((c) => c !== '');
    const col = numeric(name);
    if (!col) return false;
    for (let i = 0; i < t.length; i++) if (!Number.isNaN(col[i])) return true;
    return false;
  };
  const runCols = RUN_COLUMNS.filter(present);
  const extraCols = Object.keys(t.extra).filter(present);
  const curveCols = CURVE_COLUMNS.filter(present);
  const value = (name: string, i: number): string | number | null => {
    if (name === 'run') return t.run[i];
    if (name === 'condition') return t.condition[i];
    const v = numeric(name)![i];
    return Number.isFinite(v) ? tidy(v) : null;
  };
  const csvRow = (names: readonly string[], i: number) => names.map((c) => csvField(value(c, i))).join(',');

  await mkdir(dir, { recursive: true });
  const written: string[] = [];
  if (shape === 'csv') {
    const cols = [...runCols, ...curveCols, ...extraCols];
    const lines = [cols.join(',')];
    for (let i = 0; i < t.length; i++) lines.push(csvRow(cols, i));
    const path = join(dir, 'sweep.csv');
    await writeFile(path, lines.join('\n') + '\n');
    return [path];
  }
  const runs = new Map<string, number[]>();
  for (let i = 0; i < t.length; i++) {
    const list = runs.get(t.run[i]);
    if (list) list.push(i);
    else runs.set(t.run[i], [i]);
  }
  if (shape === 'jsonl') {
    await mkdir(join(dir, 'runs'), { recursive: true });
    const cols = [...runCols, ...extraCols, ...curveCols];
    for (const [run, rows] of runs) {
      const text = rows.map((i) => JSON.stringify(Object.fromEntries(cols.map((c) => [c, value(c, i)])))).join('\n');
      const path = join(dir, 'runs', `${run}.jsonl`);
      await writeFile(path, text + '\n');
      written.push(path);
    }
    return written;
  }
  for (const [run, rows] of runs) {
    const runDir = join(dir, run);
    await mkdir(runDir, { recursive: true });
    const config = Object.fromEntries([...runCols, ...extraCols].map((c) => [c, value(c, rows[0])]));
    const cfgPath = join(runDir, 'config.json');
    await writeFile(cfgPath, JSON.stringify(config, null, 2) + '\n');
    const metrics = [curveCols.join(','), ...rows.map((i) => csvRow(curveCols, i))].join('\n') + '\n';
    const mPath = join(runDir, 'metrics.csv');
    await writeFile(mPath, metrics);
    written.push(cfgPath, mPath);
  }
  return written;
}

/** Six significant digits: enough for errors on 2,000 test points, and short files. */
function tidy(v: number): number {
  return Number.isInteger(v) ? v : Number(v.toPrecision(6));
}

/** RFC 4180 field: quoted when it holds a comma, quote or line break. */
function csvField(v: string | number | null): string {
  if (v === null) return '';
  return quoteCsvField(String(v));
}
