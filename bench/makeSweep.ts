/**
 * Benchmark workload: a synthetic capacity sweep written as one log file per run, half CSV and
 * half JSON Lines, columns width, train_size, seed, epoch, test_error, train_error.
 * The numbers are deterministic and double-descent shaped (a test-error peak near width ≈
 * train_size that grows with training time, train error reaching zero past the threshold),
 * so every stage downstream of ingest does its real work on them.
 * Files are written one at a time (a 10M-row sweep never sits in memory).
 *   node --import tsx bench/makeSweep.ts DIR [--seeds 5] [--epochs 500]
 */
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';

export interface SweepShape {
  widths: number;
  trainSizes: number;
  seeds: number;
  epochs: number;
}

/** The 1M-row sweep: 40 widths × 10 train sizes × 5 seeds × 500 epochs = 2,000 files. */
export const SWEEP_1M: SweepShape = { widths: 40, trainSizes: 10, seeds: 5, epochs: 500 };
/** Ten times the runs (50 seeds): 20,000 files, 10,000,000 rows. */
export const SWEEP_10M: SweepShape = { widths: 40, trainSizes: 10, seeds: 50, epochs: 500 };

/** n values log-spaced over [lo, hi], rounded to whole numbers. */
function logSpaced(n: number, lo: number, hi: number): number[] {
  return Array.from({ length: n }, (_, i) => Math.round(lo * (hi / lo) ** (i / Math.max(1, n - 1))));
}

/** Deterministic uniform in [-0.5, 0.5) from integer keys (mulberry32-style mix). */
function noise(a: number, b: number): number {
  let t = (Math.imul(a, 0x9e3779b1) ^ Math.imul(b + 0x6d2b79f5, 0x85ebca6b)) >>> 0;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296 - 0.5;
}

/**
 * Test and train error of one run at one epoch. Peak height ∝ (1 − e^(−t/τ)) at log(width/n) ≈ 0
 * (the interpolation threshold); train error falls with t and reaches 0 once width ≥ n.
 */
function errors(width: number, n: number, epoch: number, runKey: number): [number, number] {
  const r = Math.log(width / n);
  const late = 1 - Math.exp(-epoch / 120);
  const early = Math.exp(-epoch / 40);
  const peak = 0.25 * late * Math.exp(-(r * r) / (2 * 0.35 * 0.35));
  const bias = 0.12 + 0.18 / (1 + Math.exp(2 * r)) + 0.05 * Math.log10(1 + 10000 / n) * 0.1;
  const test = Math.min(0.95, bias + peak + 0.3 * early + 0.006 * noise(runKey, epoch));
  const capacityGap = Math.max(0, 1 - width / n);
  const train = Math.max(0, Math.min(0.9, 0.45 * early + 0.25 * capacityGap * (0.4 + 0.6 * (1 - late)) + 0.002 * noise(runKey + 7919, epoch)));
  return [test, train];
}

export interface SweepFiles {
  dir: string;
  files: number;
  rows: number;
  bytes: number;
}

/**
 * Writes the sweep under DIR (csv/ and jsonl/ subfolders) unless a finished one with the same
 * shape is already there (a marker file records the shape).
 */
export function makeSweep(dir: string, shape: SweepShape, log: (line: string) => void = () => {}): SweepFiles {
  const marker = join(dir, '.complete.json');
  const want = JSON.stringify(shape);
  if (existsSync(marker)) {
    const m = JSON.parse(readFileSync(marker, 'utf8')) as { shape: SweepShape; files: number; rows: number; bytes: number };
    if (JSON.stringify(m.shape) === want) return { dir, files: m.files, rows: m.rows, bytes: m.bytes };
  }
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(join(dir, 'csv'), { recursive: true });
  mkdirSync(join(dir, 'jsonl'), { recursive: true });
  const widths = logSpaced(shape.widths, 4, 8192);
  const sizes = logSpaced(shape.trainSizes, 100, 5000);
  let files = 0;
  let rows = 0;
  let bytes = 0;
  const t0 = performance.now();
  for (let wi = 0; wi < widths.length; wi++) {
    for (let ni = 0; ni < sizes.length; ni++) {
      for (let seed = 0; seed < shape.seeds; seed++) {
        const width = widths[wi];
        const n = sizes[ni];
        const runKey = (wi * 1009 + ni) * 10007 + seed;
        const csv = files % 2 === 0;
        const name = `w${width}_n${n}_s${seed}.${csv ? 'csv' : 'jsonl'}`;
        const fd = openSync(join(dir, csv ? 'csv' : 'jsonl', name), 'w');
        // One run's log is built in 64 KB pieces and written as it grows.
        let buf = csv ? 'width,train_size,seed,epoch,test_error,train_error\n' : '';
        for (let epoch = 1; epoch <= shape.epochs; epoch++) {
          const [te, tr] = errors(width, n, epoch, runKey);
          buf += csv
            ? `${width},${n},${seed},${epoch},${te.toFixed(6)},${tr.toFixed(6)}\n`
            : `{"width":${width},"train_size":${n},"seed":${seed},"epoch":${epoch},"test_error":${te.toFixed(6)},"train_error":${tr.toFixed(6)}}\n`;
          if (buf.length > 65536) {
            bytes += writeSync(fd, buf);
            buf = '';
          }
        }
        bytes += writeSync(fd, buf);
        closeSync(fd);
        files++;
        rows += shape.epochs;
        if (files % 2000 === 0) log(`  wrote ${files} files, ${(rows / 1e6).toFixed(1)}M rows (${((performance.now() - t0) / 1000).toFixed(1)} s)`);
      }
    }
  }
  writeFileSync(marker, JSON.stringify({ shape, files, rows, bytes }));
  return { dir, files, rows, bytes };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const args = process.argv.slice(2);
  const flag = (name: string, dflt: number) => {
    const i = args.indexOf(name);
    return i >= 0 ? Number(args[i + 1]) : dflt;
  };
  const dir = args.find((a) => !a.startsWith('--') && !/^\d+$/.test(a)) ?? 'bench/work/sweep-1m';
  const r = makeSweep(dir, { ...SWEEP_1M, seeds: flag('--seeds', SWEEP_1M.seeds), epochs: flag('--epochs', SWEEP_1M.epochs) }, console.log);
  console.log(`${r.files} files, ${r.rows} rows, ${(r.bytes / 1e6).toFixed(1)} MB in ${r.dir}`);
}
