import type { RidgeResult } from '../analysis/Ridge.js';
import { render as msg } from '../messages.js';
import { axisLabel, groupDigits } from './axisText.js';

/** Prominence (in standard errors) below which a peak is flagged: about a 95% one-sided z level (common practice). */
export const SIGNIFICANT_SE = 2;

/**
 * Warnings a figure must carry so it cannot mislead: no ridge, no significant peak, peaks
 * inside seed noise, intervals that came from the curve (one seed) instead of seeds.
 * `label` names the facet panel of each ridge ("" for a single map).
 */
export function figureWarnings(ridges: { ridge: RidgeResult | null; label: string }[]): string[] {
  const out: string[] = [];
  const where = (label: string, rowsText: string) => (label ? `${rowsText} in ${label}` : rowsText);
  if (ridges.every((r) => r.ridge === null)) return [msg.warnNoRidge];
  const withRidge = ridges.filter((r): r is { ridge: RidgeResult; label: string } => r.ridge !== null);
  if (withRidge.every((r) => r.ridge.rows.every((row) => row.peak === null))) {
    out.push(msg.warnNoPeak(withRidge[0].ridge.minProminence));
    return out;
  }
  for (const { ridge, label } of withRidge) {
    const y = axisLabel(ridge.y);
    const weak = ridge.rows.filter((r) => r.peak !== null && !(r.peak.prominenceSe >= SIGNIFICANT_SE));
    if (weak.length) out.push(msg.warnWeakPeaks(where(label, `${y} ${listValues(weak.map((r) => r.y))}`), SIGNIFICANT_SE));
    const smoothed = ridge.rows.filter((r) => r.peak !== null && r.model === 'smoothed-curve');
    if (smoothed.length) out.push(msg.warnSmoothed(where(label, `${y} ${listValues(smoothed.map((r) => r.y))}`)));
    const curve = ridge.rows.filter((r) => r.peak !== null && r.noiseFrom === 'curve' && r.model !== 'smoothed-curve');
    if (curve.length) out.push(msg.warnCurveNoise(where(label, `${y} ${listValues(curve.map((r) => r.y))}`)));
  }
  return out;
}

/** "10, 20, 40" or "10, 20, … 640 (7 rows)" when long. */
export function listValues(vs: number[]): string {
  const s = vs.map(groupDigits);
  return s.length <= 4 ? s.join(', ') : `${s.slice(0, 2).join(', ')}, … ${s[s.length - 1]} (${s.length} rows)`;
}
