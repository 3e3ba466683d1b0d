import type { TopLevelSpec } from 'vega-lite';
import type { HurtsResult } from '../analysis/Hurts.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { MapKind, SweepMap } from '../grid/SweepMap.js';
import type { Metric } from '../store/RowTable.js';

/** The sweep's facts for the title page. */
export interface ReportFacts {
  title: string;
  /** Distinct run ids in the store. */
  runs: number;
  /** Rows (run × logged epoch). */
  rows: number;
  /** Distinct seeds and the seeds-per-cell range at the runs' last epochs. */
  seeds: { distinct: number; perCellMin: number; perCellMax: number };
  /** Each sweep axis: distinct values, ascending. */
  axes: { name: string; values: number[] }[];
  conditions: string[];
  metric: Metric;
  /** Newest source modification time in the store (ISO), null when unknown. */
  dataDate: string | null;
  /** Content hash of the store's sources, null when unknown. */
  storeHash: string | null;
  /** When the report was made (ISO). */
  generatedAt: string;
  /** Rows marked diverged, and the distinct runs they belong to. */
  diverged: number;
  divergedRuns?: number;
}

/** One map of a kind at one choice of the fixed values. */
export interface MapVariant {
  /** Human label of the fixed values, e.g. "label_noise 0.2 · train_size 1024". */
  label: string;
  map: SweepMap;
  ridge: RidgeResult | null;
  /** Warnings that belong beside this figure (peak inside seed noise, interpolated colours, ...). */
  cautions: string[];
}

export interface MapSection {
  kind: MapKind;
  x: string;
  y: string;
  /** The fixed axes whose values the selector switches between. */
  selector: string[];
  variants: MapVariant[];
  /** Index of the variant shown first (and in the PDF). */
  main: number;
  /** Why that one: the tool's pick of fixed values (most data), or the variant with the most significant peaks. */
  chosen?: 'data' | 'peaks';
}

/** A row of the coverage summary (from the plan stage, when a spec is given). */
export interface CoverageSummary {
  counts: { complete: number; partial: number; missing: number; diverged: number };
  /** The render stage's coverage chart (vega-lite), when the spec was at hand. */
  figure?: TopLevelSpec;
  /** Runs that are not complete: axes, seed and status. */
  gaps: { config: Record<string, number | string>; seed: number; status: string }[];
}

export interface PlannedRun {
  config: Record<string, number | string>;
  seed: number;
  epochs: number;
  reason: string;
  cost: number;
  /** One line on why the run is proposed (the gap, or the ridge point / hurts segment it sharpens). */
  why: string;
}

export interface PlanSummary {
  budget: number | null;
  cost: number;
  /** Units of the costs: seconds when fitted from logged wall time, else relative to one reference run. */
  units: 'seconds' | 'relative';
  runs: PlannedRun[];
}

export interface ReportModel {
  facts: ReportFacts;
  /** Headline findings in plain sentences. */
  findings: string[];
  /** Report-wide warnings about what a figure could make a reader believe wrongly. */
  cautions: string[];
  maps: MapSection[];
  /** Map kinds the sweep cannot support, with the reason. */
  skipped: { kind: MapKind; reason: string }[];
  hurts: HurtsResult[];
  coverage: CoverageSummary | null;
  plan: PlanSummary | null;
}
