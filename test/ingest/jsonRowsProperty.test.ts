// Property: any document made by nesting blocks of records under random keys is read with every
// record accounted for, and each row keeps the fields of its own branch only (no sibling's).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { jsonRows } from '../../src/ingest/jsonRows.js';
import { cellAt } from '../../src/ingest/RawTable.js';

interface Rec { rid: number; width: number; epoch: number; test_error: number }
type Node = { kind: 'block'; records: Rec[] } | { kind: 'obj'; tag: number | null; summaries: number; children: [string, Node][] };

// Keys of every kind the walk tells apart: names, values, name=value pairs, axis-joined names.
const KEYS = ['alpha', 'beta', 'r1', 'r2', 'results', '0.1', '0.25', '7', '12', 'w=4', 'lr=0.1 (p=1,024)', 'seed_3', 'trial'];

const recordArb = fc.record({ width: fc.integer({ min: 1, max: 512 }), epoch: fc.integer({ min: 0, max: 1000 }), test_error: fc.double({ min: 0, max: 1, noNaN: true }) });
const nodeArb: fc.Arbitrary<Node> = fc.letrec<{ node: Node }>((tie) => ({
  node: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    fc.array(recordArb, { minLength: 1, maxLength: 4 }).map((rs) => ({ kind: 'block' as const, records: rs.map((r) => ({ ...r, rid: 0 })) })),
    fc.record({
      tag: fc.option(fc.integer({ min: 1, max: 1e6 }), { nil: null }),
      summaries: fc.nat(2),
      children: fc.uniqueArray(fc.tuple(fc.constantFrom(...KEYS), tie('node')), { minLength: 1, maxLength: 3, selector: (x) => x[0] }),
    }).map((o) => ({ kind: 'obj' as const, tag: o.tag, summaries: o.summaries, children: o.children })),
  ),
})).node;

/** The document, and per record id the branch tags it must carry (tag name → value). */
function build(root: Node): { doc: unknown; expected: Map<number, Record<string, number>>; records: number; summaries: number } {
  const expected = new Map<number, Record<string, number>>();
  let next = 1;
  let summaries = 0;
  let depthTag = 0;
  const walk = (n: Node, tags: Record<string, number>): unknown => {
    if (n.kind === 'block') {
      return n.records.map((r) => {
        const rid = next++;
        expected.set(rid, tags);
        return { ...r, rid };
      });
    }
    const out: Record<string, unknown> = {};
    const own = { ...tags };
    if (n.tag !== null) {
      const name = `tag${depthTag++}`;
      out[name] = n.tag;
      own[name] = n.tag;
    }
    for (const [k, c] of n.children) out[k] = walk(c, own);
    // Means over seeds beside the runs: counted as skipped, never rows.
    if (n.summaries > 0) {
      out.aggregated = Array.from({ length: n.summaries }, (_, i) => ({ width: i + 1, test_error_mean: 0.1, test_error_std: 0.01 }));
      summaries += n.summaries;
    }
    return out;
  };
  const doc = walk(root, {});
  return { doc, expected, records: next - 1, summaries };
}

describe('jsonRows on random nestings', () => {
  it('accounts for every record and keeps each row\'s own branch fields', () => {
    fc.assert(
      fc.property(nodeArb, (root) => {
        const { doc, expected, records, summaries } = build(root);
        const raw = jsonRows(doc);
        // Every record is one row; every summary is skipped; nothing fails.
        expect(raw.length).toBe(records);
        expect(raw.skipped ?? 0).toBe(summaries);
        expect(raw.rowErrors.size).toBe(0);
        const col = (name: string) => raw.names.indexOf(name);
        const rid = col('rid');
        const seen = new Set<number>();
        for (let i = 0; i < raw.length; i++) {
          const id = Number(cellAt(raw.columns[rid], i));
          seen.add(id);
          const want = expected.get(id)!;
          for (const name of raw.names) {
            if (!/^tag\d+$/.test(name)) continue;
            const v = cellAt(raw.columns[col(name)], i);
            if (name in want) expect(v).toBe(want[name]);
            else expect(v === undefined || v === null).toBe(true); // a sibling's field never leaks in
          }
        }
        expect(seen.size).toBe(records);
      }),
      { numRuns: 300, seed: 16 },
    );
  });
});
