import type { SourceLayout } from './normalizeRaw.js';

/** Sources read the same way: one mapping, one structure (numbers aside), their conditions' run counts summed. */
export interface LayoutGroup {
  sources: number;
  example: string;
  mapping: Record<string, string>;
  passedOver: Record<string, string[]>;
  structure: string[];
  conditions: Record<string, number>;
}

/** Groups sources by layout, in the order first seen. */
export function groupLayouts(items: { source: string; layout: SourceLayout }[]): LayoutGroup[] {
  const groups = new Map<string, LayoutGroup>();
  for (const { source, layout } of items) {
    const key = JSON.stringify([layout.mapping, layout.passedOver, layout.structure.map((s) => s.replace(/\d[\d,.]*/g, '#'))]);
    let g = groups.get(key);
    if (!g) {
      g = { sources: 0, example: source, mapping: layout.mapping, passedOver: layout.passedOver, structure: layout.structure, conditions: {} };
      groups.set(key, g);
    }
    g.sources++;
    for (const [c, runs] of Object.entries(layout.conditions)) g.conditions[c] = (g.conditions[c] ?? 0) + runs;
  }
  return [...groups.values()];
}

/** canonical → source column over all layouts (several sources joined by ` | `). */
export function mergedMapping(groups: LayoutGroup[]): Record<string, string> {
  const out: Record<string, string[]> = {};
  for (const g of groups) for (const [t, s] of Object.entries(g.mapping)) if (!(out[t] ??= []).includes(s)) out[t].push(s);
  return Object.fromEntries(Object.entries(out).map(([t, s]) => [t, s.join(' | ')]));
}
