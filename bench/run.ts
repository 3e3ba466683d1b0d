/**
 * npm run bench: speed of the real CLI on a generated sweep (a measurement, not a test).
 * Each step runs the real CLI from a fresh dist/ build (bench/datlas-dist.mjs: what bin/datlas runs
 * when dist/ is fresh) as a child process; quick steps run 3 times and report the median wall time, with peak RSS and CPU time.
 *
 *   npm run bench                        the 1M-row steps, simulate --preset demo, --help
 *   npm run bench -- --big               also ingest the 10M-row sweep (BENCH_BIG=1 works too)
 *   npm run bench -- --only ingest,map   some steps (help, ingest, reingest, map, simulate, hugeline, ingest10m)
 *   npm run bench -- --profile           also profile (--cpu-prof) each step that misses its target
 *   npm run bench -- --label after       tag the results (bench/out/results-after.json as well)
 *   npm run bench -- --reps 5
 *   npm run bench -- --cli-root /tmp/old --label before   the CLI of another checkout (A/B under the same load)
 *   npm run bench -- --against /tmp/old --reps 6   interleaved A/B: each repetition runs the other checkout's
 *                                        CLI and this one back to back (order alternating), medians side by side
 *
 * `--only boundary` times the library's arquero boundary in one process (bench/boundary.mjs).
 *
 * Data goes to bench/work/ (generated, not committed), results to bench/out/results.json.
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync } from 'node:fs';
import { cpus, freemem, loadavg, totalmem, platform, release } from 'node:os';
import { closeSync, existsSync, mkdirSync, openSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeNested } from './makeNested.js';
import { makeSweep, SWEEP_10M, SWEEP_1M } from './makeSweep.js';
import { haveGnuTime, measure } from './measure.js';
import type { Sample } from './measure.js';
import { formatSummary, summarizeProfiles } from './profileSummary.js';
// scripts/ is plain JavaScript without declarations: type the two functions used here.
const freshness = '../scripts/freshness.mjs';
const { builtAt, newestSource } = (await import(freshness)) as { builtAt(root: string): number; newestSource(root: string): number };

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const work = join(root, 'bench/work');
const outDir = join(root, 'bench/out');
const argv = process.argv.slice(2);
const has = (f: string) => argv.includes(f);
const value = (f: string) => {
  const i = argv.indexOf(f);
  return i >= 0 ? argv[i + 1] : undefined;
};
const big = has('--big') || process.env.BENCH_BIG === '1';
const profile = has('--profile');
const reps = Number(value('--reps') ?? 3);
const label = value('--label') ?? '';
const only = value('--only')?.split(',');
/** Checkout whose CLI is measured (its dist/ is built and run); the workload stays under this one. */
const cliRoot = value('--cli-root') ? resolve(value('--cli-root')!) : root;
const entry = join(cliRoot, 'bench/datlas-dist.mjs');
if (!existsSync(entry)) copyFileSync(join(root, 'bench/datlas-dist.mjs'), entry);
/**
 * Another checkout measured interleaved with this one: on a shared machine whose load moves
 * within minutes, back-to-back pairs are the only fair comparison. Both must read the same store
 * format (the workload and stores under bench/work are shared).
 */
const againstRoot = value('--against') ? resolve(value('--against')!) : null;
const againstEntry = againstRoot ? join(againstRoot, 'bench/datlas-dist.mjs') : null;
if (againstRoot && againstEntry && !existsSync(againstEntry)) copyFileSync(join(root, 'bench/datlas-dist.mjs'), againstEntry);

interface Step {
  name: string;
  what: string;
  args: string[];
  /** Rows the step handles (for rows/s). */
  rows: number;
  reps: number;
  target: { wall?: number; rss?: number };
  /** Run before every repetition (not timed). */
  before?: () => void;
  /** The exit code the step must end with (default 0) and what its output must say. */
  expect?: { code: number; output?: RegExp };
}

interface StepResult {
  name: string;
  what: string;
  command: string;
  reps: number;
  wall: number;
  walls: number[];
  rowsPerSecond: number | null;
  rss: number;
  cpu: number;
  load: number;
  target: Step['target'];
  met: boolean;
  failed: string | null;
  profile?: ReturnType<typeof summarizeProfiles>;
  /** With --against: the other checkout's figures from the same interleaved repetitions. */
  against?: { wall: number; walls: number[]; cpu: number; rss: number };
}

const GiB = 1024 ** 3;
const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const load1 = () => loadavg()[0];

/** Rebuilds dist/ when a source is newer (others edit src/ while the bench runs). */
function ensureBuilt(dir = cliRoot): void {
  if (builtAt(dir) >= newestSource(dir)) return;
  execFileSync(process.execPath, [join(dir, 'scripts/build.mjs')], { cwd: dir, stdio: 'inherit' });
}

function fmtBytes(b: number): string {
  return Number.isFinite(b) ? (b >= GiB ? `${(b / GiB).toFixed(2)} GiB` : `${(b / 1024 ** 2).toFixed(0)} MiB`) : 'n/a';
}

async function runStep(step: Step): Promise<StepResult> {
  const samples: Sample[] = [];
  const other: Sample[] = [];
  const loads: number[] = [];
  let failed: string | null = null;
  const once = async (which: string, at: string, dir: string): Promise<Sample | null> => {
    step.before?.();
    ensureBuilt(dir);
    const s = await measure({ cwd: root, args: step.args, entry: at });
    const want = step.expect ?? { code: 0 };
    if (s.code !== want.code || (want.output && !want.output.test(`${s.stdout}\n${s.stderr}`))) {
      failed = `${which}exit ${s.code}: ${s.stderr.trim().split('\n').slice(-3).join(' | ')}`;
      return null;
    }
    process.stderr.write(`  ${step.name}${which ? ` ${which}` : ''} #${loads.length}: ${s.wall.toFixed(3)} s, ${fmtBytes(s.rss)}, cpu ${(s.user + s.sys).toFixed(2)} s, load ${loads[loads.length - 1].toFixed(2)}\n`);
    return s;
  };
  for (let r = 0; r < step.reps && !failed; r++) {
    loads.push(load1());
    if (!againstEntry || !againstRoot) {
      const s = await once('', entry, cliRoot);
      if (s) samples.push(s);
      continue;
    }
    // The order alternates, so neither side always runs on the warmer machine.
    for (const side of r % 2 === 0 ? ['against', 'this'] : ['this', 'against']) {
      const s = side === 'this' ? await once('(this)', entry, cliRoot) : await once('(against)', againstEntry, againstRoot);
      if (!s) break;
      (side === 'this' ? samples : other).push(s);
    }
  }
  const walls = samples.map((s) => s.wall);
  const wall = walls.length ? median(walls) : NaN;
  const rss = samples.length ? Math.max(...samples.map((s) => s.rss)) : NaN;
  const cpu = samples.length ? median(samples.map((s) => s.user + s.sys)) : NaN;
  const met = !failed && (step.target.wall === undefined || wall <= step.target.wall) && (step.target.rss === undefined || rss <= step.target.rss);
  const result: StepResult = {
    name: step.name, what: step.what, command: `datlas ${step.args.join(' ')}`, reps: samples.length, wall, walls,
    rowsPerSecond: step.rows > 0 && wall > 0 ? step.rows / wall : null, rss, cpu, load: loads.length ? median(loads) : load1(),
    target: step.target, met, failed,
  };
  if (other.length) {
    result.against = { wall: median(other.map((s) => s.wall)), walls: other.map((s) => s.wall), cpu: median(other.map((s) => s.user + s.sys)), rss: Math.max(...other.map((s) => s.rss)) };
  }
  if (profile && !met && !failed) {
    const dir = join(outDir, 'profiles', step.name);
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
    step.before?.();
    ensureBuilt();
    await measure({ cwd: root, args: step.args, entry, nodeArgs: ['--cpu-prof', '--cpu-prof-dir', dir] });
    result.profile = summarizeProfiles(dir, 15);
    process.stderr.write(`${step.name} profile:\n${formatSummary(result.profile)}\n`);
  }
  return result;
}

/** Two CSV files holding one line of `bytes` bytes of `0.5,` (written once, kept under bench/work). */
function makeHugeLine(dir: string, bytes: number): { header: string; row: string } {
  mkdirSync(dir, { recursive: true });
  const header = join(dir, 'huge-header.csv');
  const row = join(dir, 'huge-row.csv');
  const block = Buffer.from('0.5,'.repeat(1 << 18)); // 1 MiB
  const write = (path: string, before: string, after: string) => {
    const size = Buffer.byteLength(before) + Math.ceil(bytes / block.length) * block.length + 1 + Buffer.byteLength(after);
    if (existsSync(path) && statSync(path).size === size) return;
    const fd = openSync(path, 'w');
    try {
      writeSync(fd, before);
      for (let n = 0; n < bytes; n += block.length) writeSync(fd, block);
      writeSync(fd, `\n${after}`);
    } finally {
      closeSync(fd);
    }
  };
  write(header, '', '');
  write(row, 'run,width,epoch,n,seed,test_error\na,8,1,1000,1,0.5\n', 'a,8,2,1000,1,0.4\n');
  return { header, row };
}

async function main(): Promise<void> {
  const loadStart = loadavg();
  const machine = {
    cpu: cpus()[0]?.model ?? 'unknown', cores: cpus().length, memory: fmtBytes(totalmem()), free: fmtBytes(freemem()),
    os: `${platform()} ${release()}`, node: process.version, measuredWith: haveGnuTime ? 'GNU time (%e %M %U %S)' : 'process.resourceUsage() wrapper',
  };
  let commit = '';
  try {
    commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: cliRoot, encoding: 'utf8' }).trim();
  } catch {
    // Not a git checkout: the results say so by an empty commit.
  }
  console.log(`descent-atlas bench  ${new Date().toISOString()}  ${machine.cores} × ${machine.cpu}, ${machine.memory}, node ${machine.node}`);
  if (cliRoot !== root) console.log(`CLI measured: ${cliRoot} (commit ${commit || 'unknown'})`);
  let againstCommit = '';
  if (againstRoot) {
    try {
      againstCommit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: againstRoot, encoding: 'utf8' }).trim();
    } catch {
      // Not a git checkout.
    }
    console.log(`interleaved against: ${againstRoot} (commit ${againstCommit || 'unknown'})`);
    ensureBuilt(againstRoot);
  }
  console.log(`load average at start: ${loadStart.map((l) => l.toFixed(2)).join(' ')}`);
  if (loadStart[0] > 1.5) console.log(`warning: load average ${loadStart[0].toFixed(2)} > 1.5 — other work shares the cores; wall times are inflated`);

  mkdirSync(work, { recursive: true });
  mkdirSync(outDir, { recursive: true });
  ensureBuilt();

  const want = (name: string) => !only || only.includes(name);
  const needs1m = ['ingest', 'reingest', 'map', 'boundary'].some(want);
  const sweep1m = join(work, 'sweep-1m');
  if (needs1m) {
    const t0 = performance.now();
    const s = makeSweep(sweep1m, SWEEP_1M, (l) => process.stderr.write(`${l}\n`));
    console.log(`workload: ${s.files} run files (half csv, half jsonl), ${s.rows.toLocaleString('en')} rows, ${(s.bytes / 1e6).toFixed(1)} MB (${((performance.now() - t0) / 1000).toFixed(1)} s to check/generate)`);
  }
  const store = join(work, 'store-1m');
  const fresh = (dir: string) => () => rmSync(dir, { recursive: true, force: true });
  const steps: Step[] = [];
  if (want('help')) steps.push({ name: 'help', what: 'datlas --help', args: ['--help'], rows: 0, reps, target: { wall: 0.5 } });
  if (want('ingest')) {
    steps.push({ name: 'ingest', what: 'ingest 1M rows into a new store', args: ['ingest', sweep1m, '--store', store, '--quiet'], rows: SWEEP_1M.widths * SWEEP_1M.trainSizes * SWEEP_1M.seeds * SWEEP_1M.epochs, reps, target: { wall: 2.0, rss: GiB }, before: fresh(store) });
  }
  if (want('reingest')) {
    steps.push({
      name: 'reingest', what: 're-ingest, nothing changed', args: ['ingest', sweep1m, '--store', store, '--quiet'], rows: 0, reps, target: { wall: 0.3 },
      before: () => {
        if (!existsSync(join(store, 'manifest.json'))) execFileSync(process.execPath, [entry, 'ingest', sweep1m, '--store', store, '--quiet'], { cwd: root });
      },
    });
  }
  if (want('map')) {
    const mapOut = join(work, 'map-out');
    steps.push({
      name: 'map', what: 'map --kind model --method linear + ridge (1,000 bootstrap rounds) + PNG',
      args: ['map', '--kind', 'model', '--method', 'linear', '--format', 'json,png', '--store', store, '--out', mapOut, '--quiet'],
      rows: 1_000_000, reps, target: { wall: 1.5 },
      before: () => {
        fresh(mapOut)();
        if (!existsSync(join(store, 'manifest.json'))) execFileSync(process.execPath, [entry, 'ingest', sweep1m, '--store', store, '--quiet'], { cwd: root });
      },
    });
  }
  if (want('simulate')) {
    const simOut = join(work, 'sim-demo');
    steps.push({ name: 'simulate', what: 'simulate --preset demo', args: ['simulate', '--preset', 'demo', '--out', simOut, '--quiet'], rows: 0, reps: 1, target: { wall: 30 }, before: fresh(simOut) });
  }
  if (only?.includes('nested') || only?.includes('nestedjsonl')) {
    // A nested JSON document (~100 MB) against the same rows as one JSON Lines file.
    const n = makeNested(join(work, 'nested'));
    console.log(`nested workload: ${n.rows.toLocaleString('en')} rows, ${(n.jsonBytes / 1e6).toFixed(0)} MB nested JSON, ${(n.jsonlBytes / 1e6).toFixed(0)} MB JSON Lines`);
    const sn = join(work, 'store-nested');
    if (want('nested')) steps.push({ name: 'nested', what: 'ingest one nested JSON document (per_seed → w=.. keys → history)', args: ['ingest', n.json, '--store', sn, '--quiet', '--keys', 'seed'], rows: n.rows, reps, target: {}, before: fresh(sn) });
    if (want('nestedjsonl')) steps.push({ name: 'nestedjsonl', what: 'ingest the same rows as one JSON Lines file', args: ['ingest', n.jsonl, '--store', sn, '--quiet'], rows: n.rows, reps, target: {}, before: fresh(sn) });
  }
  if (want('hugeline')) {
    // Bad input at scale: one CSV line of 200 MB of `0.5,` fields (50 million fields). As the
    // header it refuses the file at once; as a row between valid rows it is rejected and the
    // rows after it are read. Memory must stay bounded by the limits, not by the file.
    const files = makeHugeLine(join(work, 'hugeline'), 200 * 1000 * 1000);
    const hugeStore = join(work, 'store-hugeline');
    steps.push({
      name: 'hugeline', what: 'ingest a CSV whose header is one 200 MB line of 0.5, fields', args: ['ingest', files.header, '--store', hugeStore, '--json', '--quiet'],
      rows: 0, reps, target: { wall: 2.0, rss: GiB }, before: fresh(hugeStore),
      expect: { code: 1, output: /line 1 \(the header\) has more than 10,000 fields/ },
    });
    steps.push({
      name: 'hugerow', what: 'ingest a CSV with a 200 MB line of 0.5, fields between two valid rows', args: ['ingest', files.row, '--store', hugeStore, '--json', '--quiet'],
      rows: 0, reps, target: { wall: 2.0, rss: GiB }, before: fresh(hugeStore),
      expect: { code: 0, output: /"read":3,"accepted":2,"duplicates":0,"rejected":1/ },
    });
  }
  if (big || only?.includes('ingest10m')) {
    const sweep10m = join(work, 'sweep-10m');
    const t0 = performance.now();
    const s = makeSweep(sweep10m, SWEEP_10M, (l) => process.stderr.write(`${l}\n`));
    console.log(`big workload: ${s.files} run files, ${s.rows.toLocaleString('en')} rows, ${(s.bytes / 1e6).toFixed(0)} MB (${((performance.now() - t0) / 1000).toFixed(1)} s to check/generate)`);
    const store10 = join(work, 'store-10m');
    steps.push({ name: 'ingest10m', what: 'ingest 10M rows into a new store', args: ['ingest', sweep10m, '--store', store10, '--quiet'], rows: s.rows, reps: 1, target: { rss: 4 * GiB }, before: fresh(store10) });
  }

  const results: StepResult[] = [];
  for (const step of steps) {
    process.stderr.write(`${step.name}: ${step.what}\n`);
    results.push(await runStep(step));
  }
  let boundary: Record<string, number> & { filter: string } | null = null;
  if (want('boundary')) {
    // The library's arquero boundary, in one process on the 1M-row store (bench/boundary.mjs).
    process.stderr.write('boundary: store → arquero → typed arrays, in process\n');
    if (!existsSync(join(store, 'manifest.json'))) {
      if (!existsSync(sweep1m)) makeSweep(sweep1m, SWEEP_1M, (l) => process.stderr.write(`${l}\n`));
      execFileSync(process.execPath, [entry, 'ingest', sweep1m, '--store', store, '--quiet'], { cwd: root });
    }
    boundary = JSON.parse(execFileSync(process.execPath, [join(root, 'bench/boundary.mjs'), store, String(Math.max(reps, 5))], { cwd: root, encoding: 'utf8' })) as Record<string, number> & { filter: string };
  }
  const loadEnd = loadavg();

  const head = ['step', 'median wall', 'target', 'rows/s', 'peak RSS', 'cpu s', 'load', 'ok', ...(againstRoot ? ['against: wall', 'cpu s', 'change'] : [])];
  const rows = results.map((r) => [
    r.what,
    Number.isFinite(r.wall) ? `${r.wall.toFixed(3)} s` + (r.reps > 1 ? ` (${r.reps}×)` : '') : 'failed',
    [r.target.wall !== undefined ? `≤ ${r.target.wall} s` : 'completes', r.target.rss !== undefined ? `≤ ${fmtBytes(r.target.rss)}` : ''].filter(Boolean).join(', '),
    r.rowsPerSecond ? `${(r.rowsPerSecond / 1e6).toFixed(2)}M` : '',
    fmtBytes(r.rss),
    Number.isFinite(r.cpu) ? r.cpu.toFixed(2) : '',
    r.load.toFixed(2),
    r.failed ? `FAILED ${r.failed}` : r.met ? 'yes' : 'MISSED',
    ...(againstRoot
      ? r.against
        ? [`${r.against.wall.toFixed(3)} s`, r.against.cpu.toFixed(2), `${(((r.wall - r.against.wall) / r.against.wall) * 100).toFixed(1)} %`]
        : ['', '', '']
      : []),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i])).join('  ');
  console.log('');
  console.log(line(head));
  console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) console.log(line(r));
  console.log(`\nload average at end: ${loadEnd.map((l) => l.toFixed(2)).join(' ')}${loadEnd[0] > 1.5 ? ' (machine busy: figures noisy)' : ''}`);
  console.log('cpu s = user + system seconds of the child (above the wall time: more than one core worked)');
  if (boundary) {
    const b = boundary;
    console.log(`\narquero boundary on ${b.rows.toLocaleString('en')} rows (median of ${b.reps}, in process):`);
    console.log(`  openStore (read rows.arrow, load arquero)         ${b.openStoreFirstMs} ms`);
    console.log(`  store.toArquero()                                  ${b.toArqueroMs} ms (first call ${b.toArqueroFirstMs} ms: decodes the text columns)`);
    console.log(`  arquero table → typed arrays, all rows             ${b.fromArqueroMs} ms (${b.fromArqueroMsPer1M} ms per 1M rows)`);
    console.log(`  filter verb (${b.filter})                 ${b.filterVerbMs} ms → ${b.filteredRows.toLocaleString('en')} rows`);
    console.log(`  filtered arquero table → typed arrays              ${b.fromFilteredMs} ms (${b.fromFilteredMsPer1MActive} ms per 1M active rows)`);
    console.log(`  buildMap (linear, 64×64, no ridge): from the store ${b.buildMapStoreMs} ms, from the arquero table ${b.buildMapArqueroMs} ms`);
  }

  const json = { date: new Date().toISOString(), label, commit, cliRoot, against: againstRoot ? { root: againstRoot, commit: againstCommit } : null, machine, loadStart, loadEnd, steps: results, boundary };
  writeFileSync(join(outDir, 'results.json'), `${JSON.stringify(json, null, 2)}\n`);
  if (label) writeFileSync(join(outDir, `results-${label}.json`), `${JSON.stringify(json, null, 2)}\n`);
  console.log(`wrote ${join('bench/out', 'results.json')}${label ? ` and bench/out/results-${label}.json` : ''}`);
}

await main();
