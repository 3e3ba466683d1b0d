import type { ReportModel } from './ReportModel.js';

/** Non-finite numbers become null so the JSON stays valid. */
const num = (v: number | null | undefined): number | null => (v === null || v === undefined || !Number.isFinite(v) ? null : v);

/**
 * The report's machine-readable summary (`report.json`, `datlas report --json`): facts, findings,
 * cautions, each map's main variant with its ridge rows (the `ridge --json` row shape), the hurts
 * segments, coverage counts and the plan.
 */
export function reportJson(model: ReportModel) {
  return {
    facts: model.facts,
    findings: model.findings,
    cautions: model.cautions,
    skipped: model.skipped,
    maps: model.maps.map((sec) => {
      const main = sec.variants[sec.main];
      return {
        map: sec.kind,
        x: sec.x,
        y: sec.y,
        fixed: main.map.fixed,
        picked: main.map.picked,
        method: main.map.method,
        loo: { method: main.map.loo.method, rmse: num(main.map.loo.rmse) },
        cells: main.map.cells.length,
        missing: main.map.missing.length,
        variants: sec.variants.map((v) => v.label),
        rows: (main.ridge?.rows ?? []).map((r) => ({
          y: r.y,
          peak: r.peak
            ? {
                x: r.peak.x,
                low: r.peak.low,
                high: r.peak.high,
                error: r.peak.error,
                prominence: r.peak.prominence,
                prominenceSe: num(r.peak.prominenceSe),
                ...(r.peak.p === undefined ? {} : { p: r.peak.p }),
                ...(r.peak.pAdjusted === undefined ? {} : { pAdjusted: r.peak.pAdjusted }),
                ...(r.peak.smoothed ? { smoothed: true } : {}),
              }
            : null,
          threshold: r.threshold,
          noiseFrom: r.noiseFrom,
          ...(r.model ? { model: r.model } : {}),
        })),
        cautions: main.cautions,
      };
    }),
    hurts: model.hurts.map((h) => ({
      fixed: h.fixed,
      slices: h.slices ?? null,
      alpha: h.alpha ?? null,
      correction: h.correction ?? null,
      slicesWithRise: h.slicesWithRise ?? null,
      segments: h.segments.map((s) => ({ fixed: s.fixed, onset: s.onset, peak: s.peak, recovery: s.recovery, rise: s.rise, p: s.p, pSearch: s.pSearch ?? null, pAdjusted: s.pAdjusted ?? null, test: s.test })),
    })),
    coverage: model.coverage ? { counts: model.coverage.counts, gaps: model.coverage.gaps } : null,
    plan: model.plan,
  };
}
