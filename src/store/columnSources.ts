import type { Manifest } from './Manifest.js';

/**
 * The source column an axis was read from, when every source agrees and it is not the axis's
 * own name (`p_over_n` for width): charts title the axis `width (p_over_n)`. Undefined otherwise.
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
  const key = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');
  return key(name) === key(axis) || key(name.slice(name.lastIndexOf('.') + 1)) === key(axis) ? undefined : name;
}
