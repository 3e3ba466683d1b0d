import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC, Type } from 'apache-arrow';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readStore } from '../../src/store/readStore.js';
import { demoStore } from './demoStore.js';
import { readmeBlock } from './readmeBlocks.js';

// README "Read the store from Python": rows.arrow is a plain Arrow IPC file. The Arrow reference
// reader for JavaScript (apache-arrow, the Apache Arrow project's own) reads it with the types the
// README promises; the Python snippet itself runs where pyarrow is installed.
let dir = '';
let store = '';
beforeAll(() => {
  ({ dir, store } = demoStore('datlas-python-'));
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A Python interpreter that can import pyarrow (Debian's python3 first: STACK.md), or null. */
function pythonWithPyarrow(): string | null {
  for (const py of ['/usr/bin/python3', 'python3']) {
    const r = spawnSync(py, ['-c', 'import pyarrow, pandas'], { encoding: 'utf8' });
    if (r.status === 0) return py;
  }
  return null;
}

describe('rows.arrow for other tools', () => {
  it('reads with the Arrow reference reader: 15,000 rows, float64 numbers, dictionary-encoded text, int32 source_line', async () => {
    const t = tableFromIPC(readFileSync(join(store, 'rows.arrow')));
    expect(t.numRows).toBe(15_000);
    const type = (name: string) => t.schema.fields.find((f) => f.name === name)!.type;
    for (const c of ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'test_error', 'train_error', 'test_loss', 'train_loss', 'wall_seconds']) {
      expect(type(c).typeId, c).toBe(Type.Float);
      expect((type(c) as { precision: number }).precision, c).toBe(2); // Arrow Precision.DOUBLE
    }
    for (const c of ['run', 'condition', 'status', 'source']) {
      expect(type(c).typeId, c).toBe(Type.Dictionary);
      expect((type(c) as { dictionary: { typeId: number } }).dictionary.typeId, c).toBe(Type.Utf8);
    }
    expect(type('source_line').typeId).toBe(Type.Int);
    // The values are the store's, row for row.
    const { table } = await readStore(store);
    const width = t.getChild('width')!.toArray() as Float64Array;
    const run = t.getChild('run')!;
    for (const i of [0, 1, 7_777, 14_999]) {
      expect(width[i]).toBe(table.width[i]);
      expect(run.get(i)).toBe(table.run[i]);
    }
  });

  const py = pythonWithPyarrow();
  // Skipped, with the reason, where pyarrow is not installed (the Arrow check above still runs).
  it.skipIf(!py)(`runs the README's Python snippet with pyarrow${py ? '' : ' (skipped: no Python with pyarrow and pandas on this machine)'}`, () => {
    const { lang, code } = readmeBlock('python-example');
    expect(lang).toBe('python');
    const work = join(dir, 'py');
    mkdirSync(work);
    symlinkSync(store, join(work, 'atlas-store'));
    writeFileSync(join(work, 'snippet.py'), code);
    const r = spawnSync(py!, ['snippet.py'], { cwd: work, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^15000 rows$/m);
  });
});
