import type { Manifest } from './Manifest.js';

/**
 * Where each canonical column came from, over all sources of a store: the source column (or
 * dotted path, or `set:` value) when every source agrees, else the distinct ones joined by " | "
 * in first-seen order. Sources are visited in path order so the answer does not depend on ingest order.
 */
export function sourceColumns(manifest: Manifest): Record<string, string> {
  const seen = new Map<string, string[]>();
  for (const key of Object.keys(manifest.sources).sort()) {
    for (const [canonical, from] of Object.entries(manifest.sources[key].mapping ?? {})) {
      const list = seen.get(canonical) ?? [];
      if (!list.includes(from)) list.push(from);
      seen.set(canonical, list);
    }
  }
  return Object.fromEntries([...seen].map(([c, list]) => [c, list.join(' | ')]));
}
