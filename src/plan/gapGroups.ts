import type { CoverageResult, CoverageStatus } from './coverage.js';
import type { SweepSpec } from './SweepSpec.js';

/** A rectangle of the width × train-size grid where the same seeds share one gap status. */
export interface GapGroup {
  condition: string;
  label_noise: number;
  status: Exclude<CoverageStatus, 'complete'>;
  /** Spec values covered: every value of the axis between these, in spec order. */
  widths: number[];
  trainSizes: number[];
  /** Affected seed ids. */
  seeds: number[];
  /** Planned runs in the group. */
  count: number;
  /** Lowest and highest last logged epoch (partial and diverged runs). */
  epochRange: [number, number] | null;
}

/** Splits ascending indices into maximal stretches of consecutive indices. */
export function contiguous(indices: readonly number[]): number[][] {
  const out: number[][] = [];
  for (const i of indices) {
    const last = out[out.length - 1];
    if (last && last[last.length - 1] === i - 1) last.push(i);
    else out.push([i]);
  }
  return out;
}

/**
 * Groups the gaps of a coverage compactly: per condition, noise level and status, cells with
 * the same set of affected seeds are merged into rectangles of consecutive widths × consecutive
 * train sizes (first along width, then stacking equal width stretches along train size).
 */
export function gapGroups(cov: CoverageResult, spec: SweepSpec): GapGroup[] {
  const { width: W, train_size: N } = spec.axes;
  const wIndex = new Map(W.map((v, i) => [v, i]));
  const nIndex = new Map(N.map((v, i) => [v, i]));
  // (condition, noise, status, seed set) → cell (n, w) → epochs reached
  const buckets = new Map<string, { condition: string; label_noise: number; status: GapGroup['status']; seeds: number[]; cells: Map<number, number[]> }>();
  const perCell = new Map<string, { condition: string; label_noise: number; status: GapGroup['status']; n: number; w: number; seeds: number[]; epochs: number[] }>();
  for (const r of cov.runs) {
    if (r.status === 'complete') continue;
    const n = nIndex.get(r.train_size)!, w = wIndex.get(r.width)!;
    const key = `${r.condition}\u0000${r.label_noise}\u0000${r.status}\u0000${n}\u0000${w}`;
    let c = perCell.get(key);
    if (!c) perCell.set(key, (c = { condition: r.condition, label_noise: r.label_noise, status: r.status, n, w, seeds: [], epochs: [] }));
    c.seeds.push(r.seed);
    if (r.epoch !== null) c.epochs.push(r.epoch);
  }
  for (const c of perCell.values()) {
    const key = `${c.condition}\u0000${c.label_noise}\u0000${c.status}\u0000${c.seeds.join(',')}`;
    let b = buckets.get(key);
    if (!b) buckets.set(key, (b = { condition: c.condition, label_noise: c.label_noise, status: c.status, seeds: c.seeds, cells: new Map() }));
    b.cells.set(c.n * W.length + c.w, c.epochs);
  }
  const out: GapGroup[] = [];
  for (const b of buckets.values()) {
    // Width stretches per train size, then train-size stretches sharing one width stretch.
    const byStretch = new Map<string, number[]>();
    for (let n = 0; n < N.length; n++) {
      const ws: number[] = [];
      for (let w = 0; w < W.length; w++) if (b.cells.has(n * W.length + w)) ws.push(w);
      for (const s of contiguous(ws)) {
        const k = `${s[0]}-${s[s.length - 1]}`;
        const list = byStretch.get(k) ?? [];
        list.push(n);
        byStretch.set(k, list);
      }
    }
    for (const [k, ns] of byStretch) {
      const [w0, w1] = k.split('-').map(Number);
      for (const nStretch of contiguous(ns)) {
        const epochs: number[] = [];
        for (const n of nStretch) for (let w = w0; w <= w1; w++) epochs.push(...(b.cells.get(n * W.length + w) ?? []));
        out.push({
          condition: b.condition,
          label_noise: b.label_noise,
          status: b.status,
          widths: W.slice(w0, w1 + 1),
          trainSizes: nStretch.map((n) => N[n]),
          seeds: b.seeds,
          count: (w1 - w0 + 1) * nStretch.length * b.seeds.length,
          epochRange: epochs.length ? [Math.min(...epochs), Math.max(...epochs)] : null,
        });
      }
    }
  }
  const statusOrder = { missing: 0, partial: 1, diverged: 2 };
  const ci = (c: string) => spec.conditions.indexOf(c);
  out.sort(
    (a, b) =>
      ci(a.condition) - ci(b.condition) ||
      a.label_noise - b.label_noise ||
      statusOrder[a.status] - statusOrder[b.status] ||
      a.trainSizes[0] - b.trainSizes[0] ||
      a.widths[0] - b.widths[0],
  );
  return out;
}
