import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCli } from '../helpers/runCli.js';
import { readStore } from '../../src/store/readStore.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

const FIXTURE = fileURLToPath(new URL('../fixtures/ingest/messy', import.meta.url));
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-cli-'));
  cpSync(FIXTURE, join(dir, 'messy'), { recursive: true });
  writeFileSync(join(dir, 'garbage.json'), '{"width": 4, "epoch":');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const noStack = (s: string) => expect(s).not.toMatch(/\n\s+at .*:\d+:\d+/);

// Exit codes and one-line errors: DESIGN.md §6 and issue 2.
describe('datlas ingest', () => {
  it('exits 0 with rejections in the summary; --json has the contract shape and the identity holds', () => {
    const r = runCli(['ingest', 'messy', '--store', 's1', '--json', '--quiet'], { cwd: dir });
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['read', 'accepted', 'duplicates', 'rejected', 'pending', 'conflicts', 'sources']) expect(typeof j[k]).toBe('number');
    expect(j.read).toBe(j.accepted + j.duplicates + j.rejected + j.pending);
    expect(j).toMatchObject({ read: 14, sources: 2, conflicts: 1 });
    expect(r.stderr).toBe('');
  });

  it('prints a human summary naming file, line and field of rejections', () => {
    const r = runCli(['ingest', 'messy', '--store', 's2'], { cwd: dir });
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^read 14 rows = \d+ accepted \+ \d+ duplicates \+ \d+ rejected \+ 1 pending/);
    expect(r.stdout).toContain('line 5 field test_err: not a number');
    const again = runCli(['ingest', 'messy', '--store', 's2'], { cwd: dir });
    expect(again.stdout).toContain('nothing new');
  });

  it('exits 1 with one line when nothing could be read', () => {
    const r = runCli(['ingest', 'garbage.json', '--store', 's3'], { cwd: dir });
    expect(r.code).toBe(1);
    // The reason is in the message itself: under --json or --quiet nothing is printed above it.
    expect(r.stderr.trim().split('\n').at(-1)).toMatch(/^datlas: nothing could be read: 1 source failed: garbage.json: not valid JSON/);
    expect(r.stdout).toContain('garbage.json: not valid JSON');
    noStack(r.stderr);
    const quiet = runCli(['ingest', 'garbage.json', '--store', 's3', '--json', '--quiet'], { cwd: dir });
    expect(quiet.code).toBe(1);
    expect(quiet.stderr).not.toMatch(/above/);
    expect(quiet.stderr).toMatch(/garbage.json: not valid JSON/);
  });

  it('reads stdin as a source named -, alone and beside paths, its rows counted', async () => {
    const csv = 'run,width,epoch,n,seed,test_error\nfromstdin,8,1,100,1,0.5\nfromstdin,8,2,100,1,0.4\n';
    const alone = runCli(['ingest', '-', '--store', 'st1', '--json', '--quiet'], { cwd: dir, input: csv });
    expect(alone.code).toBe(0);
    expect(JSON.parse(alone.stdout)).toMatchObject({ read: 2, accepted: 2, sources: 1 });
    const beside = runCli(['ingest', 'messy', '-', '--store', 'st2', '--json', '--quiet'], { cwd: dir, input: csv });
    expect(beside.code).toBe(0);
    const j = JSON.parse(beside.stdout);
    expect(j).toMatchObject({ read: 16, sources: 3 });
    expect(j.read).toBe(j.accepted + j.duplicates + j.rejected + j.pending + j.skipped);
    const rows = tableToRows((await readStore(join(dir, 'st1'))).table);
    expect(rows.map((x) => [x.run, x.source, x.source_line])).toEqual([['fromstdin', '-', 2], ['fromstdin', '-', 3]]);
  });

  it('escapes control characters of user text it prints (run names, values, paths)', () => {
    const name = 'esc\u001b]0;title\u0007.csv';
    // One good row beside the bad one: an ingest that accepts nothing exits 1 (nothing accepted from any source).
    writeFileSync(join(dir, name), 'run,width,epoch,n,test_error\nr,8,1,100,\u001b[31mbad\nr,8,2,100,0.5\n');
    const r = runCli(['ingest', name, '--store', 'se'], { cwd: dir });
    expect(r.code).toBe(0);
    for (const text of [r.stdout, r.stderr]) expect(text).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/);
    expect(r.stdout).toContain("not a number: '\\u001b[31mbad'");
    expect(r.stdout).toContain('esc\\u001b]0;title\\u0007.csv');
  });

  it('exits 1 for a missing path, and under --strict with any rejection (store untouched)', () => {
    const missing = runCli(['ingest', 'no-such-dir', '--store', 's4'], { cwd: dir });
    expect(missing.code).toBe(1);
    expect(missing.stderr.trim().split('\n').at(-1)).toBe('datlas: cannot open no-such-dir: no such file or folder');
    const strict = runCli(['ingest', 'messy', '--store', 's5', '--strict'], { cwd: dir });
    expect(strict.code).toBe(1);
    expect(strict.stderr).toContain('--strict: 5 rows rejected, store left unchanged');
    expect(existsSync(join(dir, 's5', 'manifest.json'))).toBe(false);
  });

  it('exits 2 on usage errors with one line', () => {
    for (const args of [['ingest', 'messy', '--map', 'widht'], ['ingest', 'messy', '--map', 'depth=x'], ['ingest'], ['ingest', 'messy', '--scale', 'test_error=half']]) {
      const r = runCli([...args, '--store', 's6'], { cwd: dir });
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      noStack(r.stderr);
    }
  });

  it('has --help with an example', () => {
    const r = runCli(['ingest', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('datlas ingest runs/');
  });
});

describe('datlas ingest mapping options', () => {
  it('--mapping FILE with map, set and scale; --set of a non-number axis is a usage error', () => {
    writeFileSync(join(dir, 'pct.csv'), 'size,it,err\n64,1,0.5\n64,2,0.25\n');
    writeFileSync(join(dir, 'map.json'), JSON.stringify({ map: { width: 'size', epochs: 'it', test_error: 'err' }, set: { train_size: 100 }, scale: { test_error: 'percent' } }));
    const r = runCli(['ingest', 'pct.csv', '--mapping', 'map.json', '--store', 's7', '--json', '--quiet'], { cwd: dir });
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toMatchObject({ read: 2, accepted: 2 });
    const bad = runCli(['ingest', 'pct.csv', '--set', 'train_size=lots', '--store', 's8'], { cwd: dir });
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim()).toBe("datlas: --set train_size expects a number, got 'lots'");
  });

  it('exits 1 when no source gave a single row: a folder without logs, a grid spec; later commands say the store is empty', () => {
    const folder = join(dir, 'not-logs');
    mkdirSync(join(folder, 'report'), { recursive: true });
    writeFileSync(join(folder, 'report', 'notes.csv'), 'slide,title\n1,intro\n2,maps\n');
    writeFileSync(join(folder, 'summary.csv'), 'a,b\n1,2\n');
    const r = runCli(['ingest', 'not-logs', '--store', 'empty-store'], { cwd: dir });
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('nothing accepted from any source: 3 of 3 rows rejected');
    noStack(r.stderr);
    // A grid spec is named for what it is, not read as a table.
    writeFileSync(join(dir, 'grid.yaml'), 'axes:\n  width: [4, 8]\n  train_size: [100]\nseeds: 2\nepochs: 100\n');
    const spec = runCli(['ingest', 'grid.yaml', '--store', 'spec-store'], { cwd: dir });
    expect(spec.code).toBe(1);
    expect(spec.stderr.trim()).toBe('datlas: grid.yaml is a grid spec (the planned sweep), not a run log: give it to --spec of coverage, plan or report');
    expect(existsSync(join(dir, 'spec-store'))).toBe(false);
    const withLogs = runCli(['ingest', 'grid.yaml', 'messy', '--store', 'mixed-store', '--quiet'], { cwd: dir });
    expect(withLogs.code, withLogs.stderr).toBe(0);
    // The store written by the failed ingest holds no rows: every command that needs rows says so.
    for (const cmd of [['report', '--out', 'empty-report'], ['map', '--kind', 'model'], ['ridge', '--kind', 'model'], ['hurts']]) {
      const x = runCli([...cmd, '--store', 'empty-store'], { cwd: dir });
      expect(x.code, cmd.join(' ')).toBe(1);
      expect(x.stderr).toContain('the store is empty');
      noStack(x.stderr);
    }
    expect(existsSync(join(dir, 'empty-report'))).toBe(false);
  });
});
