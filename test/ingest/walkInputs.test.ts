import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { walkInputs } from '../../src/ingest/walkInputs.js';

// The walk decides what an ingest reads and the manifest keys its sources by: paths as the user
// gave them (joined below a folder), keys absolute, folders in name order (common practice: `ls`).
const root = mkdtempSync(join(tmpdir(), 'datlas-walk-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function tree(): string {
  const top = join(root, 'sweep');
  mkdirSync(join(top, 'b'), { recursive: true });
  mkdirSync(join(top, 'a', 'run-1'), { recursive: true });
  mkdirSync(join(top, '.cache'), { recursive: true });
  mkdirSync(join(top, 'old-store'), { recursive: true });
  writeFileSync(join(top, 'b', 'w8.csv'), 'width,epoch,test_error\n8,1,0.5\n');
  writeFileSync(join(top, 'b', 'w16.jsonl'), '{"width":16}\n');
  writeFileSync(join(top, 'b', 'notes.md'), 'not a log\n');
  writeFileSync(join(top, 'b', '.w4.csv'), 'hidden\n');
  writeFileSync(join(top, '.cache', 'x.csv'), 'hidden folder\n');
  writeFileSync(join(top, 'a', 'run-1', 'config.json'), '{"width": 32}');
  writeFileSync(join(top, 'a', 'run-1', 'metrics.csv'), 'epoch,test_error\n1,0.4\n');
  writeFileSync(join(top, 'top.csv'), 'width,epoch,test_error\n1,1,1\n');
  writeFileSync(join(top, 'old-store', 'manifest.json'), '{}');
  writeFileSync(join(top, 'old-store', 'rows.arrow'), '');
  symlinkSync(join(top, 'b'), join(top, 'b', 'loop')); // a link back up must not loop
  return top;
}

describe('walkInputs', () => {
  const top = tree();

  it('finds logs and run folders in name order (a folder\'s files before its subfolders), skipping hidden entries, stores, unknown formats and link loops', () => {
    const { sources, missing } = walkInputs([top]);
    expect(missing).toEqual([]);
    // A folder's own files first, then its subfolders.
    expect(sources.map((s) => [s.kind, s.given])).toEqual([
      ['file', join(top, 'top.csv')],
      ['rundir', join(top, 'a', 'run-1', 'metrics.csv')],
      ['file', join(top, 'b', 'w16.jsonl')],
      ['file', join(top, 'b', 'w8.csv')],
    ]);
    expect(sources[1].config).toBe(join(top, 'a', 'run-1', 'config.json'));
    for (const s of sources) {
      expect(s.key).toBe(resolve(s.given));
      expect(s.size).toBeGreaterThan(0);
      expect(s.mtime).toBeGreaterThan(0);
    }
  });

  it('keeps the path as given: relative, with ./ or a trailing slash', () => {
    const cwd = process.cwd();
    process.chdir(root);
    try {
      for (const given of ['sweep/b', './sweep/b', 'sweep/b/', './sweep//b/']) {
        const { sources } = walkInputs([given]);
        expect(sources.map((s) => s.given)).toEqual([join('sweep', 'b', 'w16.jsonl'), join('sweep', 'b', 'w8.csv')]);
        expect(sources.map((s) => s.key)).toEqual([join(top, 'b', 'w16.jsonl'), join(top, 'b', 'w8.csv')]);
      }
    } finally {
      process.chdir(cwd);
    }
  });

  it('reports missing paths, skips the store it writes to and names a file once', () => {
    const f = join(top, 'top.csv');
    const { sources, missing } = walkInputs([join(top, 'nope'), f, f, top], { skip: [join(top, 'a')] });
    expect(missing).toEqual([{ path: join(top, 'nope'), reason: 'ENOENT' }]);
    expect(sources.map((s) => s.given)).toEqual([f, join(top, 'b', 'w16.jsonl'), join(top, 'b', 'w8.csv')]);
  });

  it('says what it passed over and why: another store, a link back to a folder read, other file types; hidden entries silently', () => {
    const { skipped } = walkInputs([top]);
    expect(skipped).toEqual([
      { path: join(top, 'b', 'notes.md'), reason: 'not a log format ingest reads (by its extension)', other: true },
      { path: join(top, 'b', 'loop'), reason: `a link to a folder read already (${join(top, 'b')})` },
      { path: join(top, 'old-store'), reason: 'a datlas store (manifest.json and rows.arrow), not logs' },
    ]);
  });

  it('reads stdin for -, beside paths too', () => {
    expect(walkInputs(['-', join(top, 'top.csv')]).sources.map((s) => s.kind)).toEqual(['stdin', 'file']);
  });

  it('reads stdin for -', () => {
    expect(walkInputs(['-']).sources).toEqual([{ key: '-', given: '-', kind: 'stdin' }]);
  });
});
