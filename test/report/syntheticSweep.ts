import { tableFromRows } from '../../src/store/tableFromRows.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import type { RowTable } from '../../src/store/RowTable.js';

export const SYN = {
  widths: [8, 16, 32, 64, 128, 256, 512],
  sizes: [32, 64, 128],
  noise: [0.1, 0.2],
  epochs: [1, 10, 100, 1000],
  seeds: [0, 1, 2],
};

export interface SyntheticRow {
  run: string;
  seed: number;
  width: number;
  train_size: number;
  label_noise: number;
  epochs: number;
  test_error: number;
  train_error: number;
}

/**
 * A synthetic sweep with a known answer: test error has a bump centred at width = train size
 * (the interpolation threshold of random-features models; REFERENCES.md §4, Belkin et al. 2019)
 * that appears only from epoch 100 on and grows with label noise; along train size the same bump
 * makes more data hurt up to n = width. Seeds differ by ±0.004 (deterministic). `runName` names
 * one run (width 64, n 64, noise 0.2, seed 0); `skip` leaves runs out.
 */
export function syntheticRows(opts: { runName?: string; skip?: (w: number, n: number, q: number, s: number) => boolean } = {}): SyntheticRow[] {
  const out: SyntheticRow[] = [];
  for (const q of SYN.noise)
    for (const n of SYN.sizes)
      for (const w of SYN.widths)
        for (const s of SYN.seeds) {
          if (opts.skip?.(w, n, q, s)) continue;
          const run = opts.runName && w === 64 && n === 64 && q === 0.2 && s === 0 ? opts.runName : `w${w}-n${n}-q${q}-s${s}`;
          for (const e of SYN.epochs) {
            const amp = e < 100 ? 0 : (e === 100 ? 0.12 : 0.2) * (1 + q * 2);
            const bump = amp * Math.exp(-(Math.log2(w / n) ** 2) / 0.5);
            const base = 0.35 - 0.02 * Math.log2(w / 8) - 0.015 * Math.log2(n / 32) + (e === 1 ? 0.05 : 0);
            out.push({
              run,
              seed: s,
              width: w,
              train_size: n,
              label_noise: q,
              epochs: e,
              test_error: Number((base + bump + (s - 1) * 0.004).toFixed(5)),
              train_error: Number((e >= 100 ? Math.max(0, 0.3 * (1 - w / n)) : 0.3).toFixed(5)),
            });
          }
        }
  return out;
}

/** The synthetic sweep as CSV (RFC 4180: the run name is quoted). */
export function syntheticCsv(rows: SyntheticRow[]): string {
  const head = 'run,seed,width,train_size,label_noise,epochs,test_error,train_error';
  const q = (s: string) => `"${s.replace(/"/g, '""')}"`;
  return `${[head, ...rows.map((r) => [q(r.run), r.seed, r.width, r.train_size, r.label_noise, r.epochs, r.test_error, r.train_error].join(','))].join('\n')}\n`;
}

/** The synthetic sweep as a RowTable (for in-process report building). */
export function syntheticTable(rows: SyntheticRow[]): RowTable {
  return tableFromRows(rows.map((r) => ({ ...r, source: 'synthetic.csv' }) as Partial<RowRecord>));
}
