/** The axes a spec plans over (epochs is the target, not an axis of the plan). */
export const SPEC_AXES = ['width', 'train_size', 'label_noise'] as const;
export type SpecAxis = (typeof SPEC_AXES)[number];

/** A planned sweep (DESIGN.md §2 "spec"), with every generator expanded to explicit values. */
export interface SweepSpec {
  /** File the spec came from, as given (for messages). */
  file: string;
  name?: string;
  /** Ascending, distinct values per axis. label_noise defaults to [0]. */
  axes: Record<SpecAxis, number[]>;
  /** Condition names; [""] when the spec names none. */
  conditions: string[];
  /** Seed ids every cell should have. */
  seeds: number[];
  /** Target epochs every run should reach. */
  epochs: number;
}

/** One planned run configuration without its seed. */
export interface SpecConfig {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
}

/** One planned run: a configuration and a seed. */
export interface SpecRun extends SpecConfig {
  seed: number;
}

/** Every planned run of a spec, in spec order (condition, noise, train size, width, seed). */
export function specRuns(spec: SweepSpec): SpecRun[] {
  const out: SpecRun[] = [];
  for (const condition of spec.conditions)
    for (const label_noise of spec.axes.label_noise)
      for (const train_size of spec.axes.train_size)
        for (const width of spec.axes.width)
          for (const seed of spec.seeds) out.push({ condition, label_noise, width, train_size, seed });
  return out;
}

/**
 * Whether two axis values are the same planned value. Generated values (log spacing) carry
 * floating-point noise, logged ones are often printed with a few digits: compare relatively.
 */
export function sameValue(a: number, b: number): boolean {
  if (a === b) return true;
  return Math.abs(a - b) <= 1e-6 * Math.max(Math.abs(a), Math.abs(b), 1e-12);
}
