import { render as msg } from '../messages.js';
import { usageError } from '../UserError.js';

/**
 * Parses --slices: "epochs=100,1000,4000" or "100,1000,4000" (values of the map's y axis).
 * Returns null when not given; throws a usage error naming the problem.
 */
export function parseSlices(text: string | undefined, yAxis: string): number[] | null {
  if (text === undefined || String(text).trim() === '') return null;
  let list = String(text).trim();
  const eq = list.indexOf('=');
  if (eq >= 0) {
    const axis = list.slice(0, eq).trim();
    if (axis !== yAxis) throw usageError(msg.badSliceAxis(axis, yAxis));
    list = list.slice(eq + 1);
  }
  const values = list.split(',').map((s) => s.trim()).filter(Boolean).map(Number);
  if (!values.length || values.some((v) => !Number.isFinite(v))) throw usageError(msg.badSlice(String(text)));
  return values;
}
