import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';

const SWEEPS = fileURLToPath(new URL('../../sample-sweeps', import.meta.url));
const shapes = ['demo', 'demo-dirs', 'demo-jsonl'].filter((s) => existsSync(join(SWEEPS, s)));
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-samples-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// One sweep written by the simulator in three shapes (one CSV, run folders with config.json,
// JSON Lines per run) must give the same store rows: the shapes differ only in layout.
describe.skipIf(shapes.length < 2)('sample sweeps in every shape', () => {
  it('ingest to identical rows, every row accepted', async () => {
    const signatures: string[][] = [];
    for (const shape of shapes) {
      const r = await ingestSources({ paths: [join(SWEEPS, shape)], store: join(dir, shape) });
      expect(r.read).toBe(r.accepted);
      const { table: t } = await readStore(join(dir, shape));
      const sig: string[] = [];
      for (let i = 0; i < t.length; i++) {
        sig.push([t.run[i], t.seed[i], t.width[i], t.train_size[i], t.label_noise[i], t.epochs[i], t.condition[i], t.test_error[i], t.train_error[i], t.test_loss[i], t.train_loss[i], t.status[i]].join('|'));
      }
      signatures.push(sig.sort());
    }
    for (const s of signatures.slice(1)) expect(s).toEqual(signatures[0]);
  });
});
