import type { Manifest } from '../store/Manifest.js';
import { matchTarget } from './synonyms.js';

/**
 * The source column an axis was read from, when every source agrees and it is not one of the
 * axis's own names (`p_over_n` or `D` mapped to width, not `epoch` for epochs): charts and text
 * title the axis `width (p_over_n)`. Undefined otherwise.
 */
export function axisSource(manifest: Pick<Manifest, 'sources'>, axis: string): string | undefined {
  const names = new Set<string>();
  for (const e of Object.values(manifest.sources)) {
    const from = e.mapping?.[axis];
    if (from === undefined || from === '--set') continue;
    names.add(from.replace(/^config /, '').replace(/ \(keys under .*\)$/, ''));
  }
  if (names.size !== 1) return undefined;
  const [name] = names;
  return matchTarget(name)?.target === axis ? undefined : name;
}
