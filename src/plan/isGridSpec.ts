import { parse } from 'yaml';

/**
 * Whether a text is a grid spec (the planned sweep: `axes`, `seeds`, `epochs`) rather than a run
 * log, so ingest can say so instead of reading its lines as a table. YAML or JSON (JSON is YAML 1.2).
 */
export function isGridSpec(text: string): boolean {
  let data: unknown;
  try {
    data = parse(text, { uniqueKeys: false, prettyErrors: false });
  } catch {
    return false;
  }
  if (data === null || typeof data !== 'object' || Array.isArray(data)) return false;
  const o = data as Record<string, unknown>;
  const axes = o.axes;
  return axes !== null && typeof axes === 'object' && !Array.isArray(axes) && ('seeds' in o || 'epochs' in o || 'width' in axes || 'train_size' in axes);
}
