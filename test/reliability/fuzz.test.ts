import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';

// Property-based: random CSV and JSON Lines logs (quotes, commas, line breaks, unicode, garbage
// bytes, cut endings) never make ingest throw, and every run keeps
// read == accepted + duplicates + rejected + pending, with a readable store holding the accepted rows.
const RUNS = 100; // per format: 200 cases in all

// No train-size name: --set train_size=100 supplies it (a column of that name would win).
const NAMES = ['run', 'width', 'k', 'epoch', 'step', 'seed', 'label_noise', 'test_error', 'test_acc', 'train_error', 'train_loss',
  'test_loss', 'optimizer', 'status', 'wall_time'];
const weird = fc.oneof(
  fc.string({ unit: 'grapheme', maxLength: 8 }),
  fc.constantFrom('"', '""', ',', '\n', '\r\n', '"a,b"', '"un', 'é', '𝛼', '\u0000', '\uFFFD', '1,000', '12%', '4000 samples', '0,5', 'NaN', 'inf', '-Infinity', ''),
);
const numberText = fc.oneof(
  fc.integer({ min: -5, max: 5000 }).map(String),
  fc.double({ noNaN: false, min: -2, max: 200 }).map((x) => String(x)),
  fc.constantFrom('0', '1', '0.5', '1e3', '-0', '.5', '5.'),
);
const cell = fc.oneof({ weight: 4, arbitrary: numberText }, { weight: 1, arbitrary: weird });
const header = fc.uniqueArray(fc.oneof({ weight: 5, arbitrary: fc.constantFrom(...NAMES) }, { weight: 1, arbitrary: weird }), { minLength: 1, maxLength: 8 });

function quote(s: string, how: number): string {
  if (how === 0 && !/[",\r\n]/.test(s)) return s;
  if (how === 2) return `"${s}`; // broken on purpose
  return `"${s.replace(/"/g, '""')}"`;
}

/** Present in about a third of the cases. */
const sometimes = <T>(a: fc.Arbitrary<T>) => fc.oneof({ weight: 2, arbitrary: fc.constant(undefined) }, { weight: 1, arbitrary: a });

// Most rows are plausible (width, epoch and test error in range), so acceptance is exercised too.
const CORE = ['width', 'epoch', 'test_error'];
const coreCell = [
  fc.integer({ min: 1, max: 512 }).map(String),
  fc.integer({ min: 0, max: 100 }).map(String),
  fc.double({ min: 0, max: 1, noNaN: true }).map((x) => x.toFixed(4)),
];
const plausibleRow = (extra: number) =>
  fc.tuple(fc.tuple(...coreCell.map((c) => fc.oneof({ weight: 9, arbitrary: c }, { weight: 1, arbitrary: cell }))), fc.array(cell, { minLength: extra, maxLength: extra }))
    .map(([core, rest]): string[] => [...core, ...rest]);
const csvRows = header.chain((extraNames) => {
  const names = [...CORE, ...extraNames.filter((x) => !CORE.includes(x))];
  const row = fc.oneof({ weight: 9, arbitrary: plausibleRow(names.length - 3) }, { weight: 1, arbitrary: fc.array(cell, { maxLength: 9 }) });
  return fc.record({ names: fc.constant(names), rows: fc.array(row, { maxLength: 40, size: 'medium' }) });
});

/** A log cut short at `cut` (a writer still at work) and with `garbage` bytes put in at `at`. */
function damage(text: string, opts: { cut?: number; garbage?: Uint8Array; at: number }): Uint8Array {
  const { cut, garbage, at } = opts;
  const kept = cut === undefined ? text : text.slice(0, cut % (text.length + 1));
  const bytes = Buffer.from(kept, 'utf8');
  if (!garbage) return bytes;
  const p = at % (bytes.length + 1);
  return Buffer.concat([bytes.subarray(0, p), garbage, bytes.subarray(p)]);
}

const csvText = fc
  .record({
    table: csvRows,
    quoting: fc.array(fc.constantFrom(0, 0, 0, 1, 2), { minLength: 1, maxLength: 30 }),
    eol: fc.constantFrom('\n', '\r\n', '\r'),
    cut: sometimes(fc.nat()),
    garbage: sometimes(fc.uint8Array({ minLength: 1, maxLength: 40 })),
    at: fc.nat(),
  })
  .map(({ table: { names, rows }, quoting, eol, cut, garbage, at }) => {
    let q = 0;
    const line = (cells: string[]) => cells.map((c) => quote(c, quoting[q++ % quoting.length])).join(',');
    return damage([line(names), ...rows.map(line)].join(eol) + eol, { cut, garbage, at });
  });

const jsonValue = fc.oneof(numberText.map(Number), numberText, weird, fc.constant(null), fc.boolean(), fc.dictionary(fc.constantFrom('model', 'width', 'lr'), fc.oneof(fc.integer(), weird), { maxKeys: 2 }));
const jsonlText = fc
  .record({
    records: fc.array(
      fc.tuple(
        fc.record({ width: fc.integer({ min: 1, max: 512 }), epoch: fc.integer({ min: 0, max: 100 }), test_error: fc.oneof(fc.double({ min: 0, max: 1, noNaN: true }), fc.constant(NaN)) }),
        fc.dictionary(fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...NAMES, 'config') }, { weight: 1, arbitrary: weird }), jsonValue, { maxKeys: 5 }),
        fc.boolean(),
      ).map(([core, rest, coreFirst]) => (coreFirst ? { ...rest, ...core } : { ...core, ...rest })),
      { maxLength: 40, size: 'medium' },
    ),
    broken: fc.array(fc.nat(), { maxLength: 4 }),
    cut: sometimes(fc.nat()),
    garbage: sometimes(fc.uint8Array({ minLength: 1, maxLength: 40 })),
    at: fc.nat(),
  })
  .map(({ records, broken, cut, garbage, at }) => {
    const lines = records.map((r) => JSON.stringify(r).replace(/"(NaN|Infinity)"/g, '$1'));
    for (const b of broken) if (lines.length) lines[b % lines.length] = lines[b % lines.length].slice(0, (b % 7) + 1);
    return damage(lines.map((l) => `${l}\n`).join(''), { cut, garbage, at });
  });

let dir = '';
let k = 0;
const totals = { read: 0, accepted: 0, duplicates: 0, rejected: 0, pending: 0, failed: 0 };
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-fuzz-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
  console.log(`fuzz: ${k} random logs; rows read ${totals.read} = ${totals.accepted} accepted + ${totals.duplicates} duplicates + ${totals.rejected} rejected + ${totals.pending} pending; ${totals.failed} whole files refused`);
});

async function check(bytes: Uint8Array, name: string): Promise<void> {
  const folder = join(dir, String(k++));
  mkdirSync(folder);
  const path = join(folder, name);
  writeFileSync(path, bytes);
  const store = join(folder, 'store');
  const r = await ingestSources({ paths: [path], store, set: { train_size: '100' } });
  expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
  expect(r.pending).toBeLessThanOrEqual(1);
  for (const x of r.rejects) {
    expect(x.reason).not.toMatch(/[\r\n]/);
    expect(x.reason.length).toBeGreaterThan(0);
    expect(x.line).toBeGreaterThanOrEqual(0);
  }
  for (const key of ['read', 'accepted', 'duplicates', 'rejected', 'pending', 'failed'] as const) totals[key] += r[key];
  const { table, manifest } = await readStore(store);
  // One source, fresh store: the rows stored are this ingest's accepted rows.
  expect(table.length).toBe(r.accepted);
  expect(manifest.counts.read).toBe(manifest.counts.accepted + manifest.counts.duplicates + manifest.counts.rejected + manifest.counts.pending);
}

describe('fuzz: random logs keep the accounting identity and never throw', () => {
  it(`${RUNS} random CSV logs`, async () => {
    await fc.assert(fc.asyncProperty(csvText, (bytes) => check(bytes, 'log.csv')), { numRuns: RUNS, seed: 101 });
  }, 60_000);

  it(`${RUNS} random JSON Lines logs`, async () => {
    await fc.assert(fc.asyncProperty(jsonlText, (bytes) => check(bytes, 'log.jsonl')), { numRuns: RUNS, seed: 202 });
  }, 60_000);

  it('the random logs are not all rejected (the property is not vacuous)', () => {
    expect(totals.accepted).toBeGreaterThan(500);
    expect(totals.rejected).toBeGreaterThan(100);
    expect(totals.pending).toBeGreaterThan(20);
    expect(totals.failed).toBeGreaterThan(5);
  });
});
