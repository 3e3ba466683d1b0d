import { formatNumber } from '../formatNumber.js';
import { contiguous } from './gapGroups.js';
import type { GapGroup } from './gapGroups.js';
import type { SweepSpec } from './SweepSpec.js';

const num = (v: number) => formatNumber(v, 4);

/** A stretch of consecutive spec values as "a–b" (or one value). */
function stretch(values: readonly number[]): string {
  return values.length === 1 ? num(values[0]) : `${num(values[0])}–${num(values[values.length - 1])}`;
}

/** Seed ids as "all 3 seeds", "seed 2", "seeds 0–1, 4" (stretches of the spec's seed list). */
export function seedsText(seeds: readonly number[], spec: SweepSpec): string {
  if (seeds.length === spec.seeds.length && spec.seeds.length > 1) return `all ${seeds.length} seeds`;
  if (seeds.length === 1) return `seed ${seeds[0]}`;
  const idx = seeds.map((s) => spec.seeds.indexOf(s)).sort((a, b) => a - b);
  return `seeds ${contiguous(idx)
    .map((st) => stretch(st.map((i) => spec.seeds[i])))
    .join(', ')}`;
}

/** One gap group as a line: "noise 0.2: width 64–256 × n 4,000, seeds 2–3 missing". */
export function formatGap(g: GapGroup, spec: SweepSpec): string {
  const where: string[] = [];
  if (spec.conditions.length > 1) where.push(g.condition === '' ? '(no condition)' : g.condition);
  if (spec.axes.label_noise.length > 1) where.push(`noise ${num(g.label_noise)}`);
  const prefix = where.length ? `${where.join(' · ')}: ` : '';
  let tail = '';
  if (g.epochRange && g.status !== 'missing') {
    const [lo, hi] = g.epochRange;
    const at = lo === hi ? num(lo) : `${num(lo)}–${num(hi)}`;
    tail = g.status === 'partial' ? ` (stopped at epoch ${at} of ${num(spec.epochs)})` : ` (last logged epoch ${at})`;
  }
  return `${prefix}width ${stretch(g.widths)} × n ${stretch(g.trainSizes)}, ${seedsText(g.seeds, spec)} ${g.status}${tail}`;
}
