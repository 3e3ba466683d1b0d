/**
 * Every user-facing message in one place, so wording stays consistent and translatable.
 * Each stage has its own section; add entries at the end of your section.
 * Messages are functions of the facts they report, and name file, line and field where they apply.
 */

import { formatNumber } from './formatNumber.js';

const fmtPath = (p: string) => (p === '-' ? 'stdin' : p);
/** Counts and limits with thousands separators (8,388,608). */
const big = (n: number) => n.toLocaleString('en-US');
/** A number of any size in few characters: 1e15, 5e-324, 0.5. */
const sci = (x: number) => (x !== 0 && (Math.abs(x) >= 1e6 || Math.abs(x) < 1e-3) ? x.toExponential().replace('e+', 'e') : String(x));
/** User text quoted inside a message, clipped (a 1 MB name must not become a 1 MB message). */
const clipText = (t: string) => (t.length > 80 ? `${t.slice(0, 80)}…` : t);

/** Why the tool chose a fixed value: most data, or (levels tied on data) the largest of them. */
export const pickWhy = (tied: number | undefined): string => (tied && tied > 1 ? ` (largest of ${tied} levels with equal data)` : ' (most data)');

/** "chosen by most data: epochs, label_noise (largest of 2 levels with equal data)". */
export const pickedList = (names: string[], ties: Record<string, number> = {}): string =>
  `chosen by most data: ${names.map((n) => (ties[n] && ties[n] > 1 ? `${n}${pickWhy(ties[n])}` : n)).join(', ')}`;

// ── general / CLI ────────────────────────────────────────────────────────────
export const general = {
  unknownCommand: (name: string, nearest: string | null = null) =>
    `unknown command '${name}'${nearest ? ` (did you mean ${nearest}?)` : ''}; run 'datlas --help' for the list`,
  unknownFlag: (flag: string, nearest: string) => `${flag} (did you mean --${nearest}?)`,
  unexpectedWords: (words: string[]) => `unexpected argument${words.length === 1 ? '' : 's'}: ${words.map((w) => `'${w}'`).join(', ')} (this command takes options only)`,
  unknownFlags: (parts: string[]) => `unknown option${parts.length === 1 ? '' : 's'}: ${parts.join(', ')}`,
  internal: (what: string) => `internal error: ${what} (run again with --debug for details and report it)`,
  badAt: (text: string) => `--at expects axis=value (e.g. --at width=64), got '${text}'`,
  badList: (flag: string, text: string) => `${flag} expects a comma-separated list of numbers, got '${text}'`,
  wroteFile: (path: string) => `wrote ${fmtPath(path)}`,
  // A path of the wrong kind or state (a file where a folder is needed, ...): what and where.
  notAFolder: (file: string, wanted: string) => `${file} is a file, not a folder${wanted !== file ? ` (needed as a folder for ${wanted})` : ''}; give a folder path`,
  existsAsFile: (path: string) => `${path} exists and is a file, not a folder; give a folder path (or remove the file)`,
  isAFolder: (path: string) => `${path} is a folder, not a file; give a file path`,
  folderGiven: () => 'a folder was given where a file is needed; give a file path',
  noAccess: (path: string) => `permission denied: ${path}`,
  noSuchPath: (path: string) => `no such file or folder: ${path}`,
  noSpace: (path: string) => `no space left on the device while writing ${path}`,
  atTwice: (name: string, a: string, b: string) => `--at ${name} given twice (${a} and ${b}); give one value per axis`,
  version: (name: string, version: string) => `${name} ${version}`,
  commandList: 'name a command; the commands are:',
};

// ── ingest ───────────────────────────────────────────────────────────────────

export const ingestText = {
  fieldCount: (want: number, got: number) => `expected ${want} fields (as in the header), got ${got}`,
  badJsonLine: 'not valid JSON',
  notARecord: 'not a JSON object (expected one record of key: value pairs)',
  badJson: (why: string) => `not valid JSON: ${why}`,
  badConfig: (why: string) => `run directory config is not readable: ${why}`,
  skippedColumn: (source: string, column: string) =>
    `${fmtPath(source)}: text column '${column}' has too many distinct values to be a condition; left out`,
  percentColumn: (source: string, column: string, target: string) =>
    `${fmtPath(source)}: column '${column}' read as percent (values above 1), divided by 100 for ${target} (override with --scale ${target}=fraction)`,
  missingAxis: (source: string, axis: string) =>
    `${fmtPath(source)}: no ${axis} column; add --map ${axis}=COLUMN or --set ${axis}=VALUE`,
  missingMetric: (source: string) => `${fmtPath(source)}: no test error, accuracy or loss column; add --map test_error=COLUMN`,
  notANumber: (text: string) => `not a number: '${text.length > 40 ? `${text.slice(0, 40)}…` : text}'`,
  missing: (axis: string) => `missing ${axis} (add --map ${axis}=COLUMN or --set ${axis}=VALUE)`,
  badAxis: (axis: string, v: number) =>
    axis === 'train_size' ? `train_size must be a whole number > 0, got ${v}` : axis === 'epochs' ? `epochs must be >= 0, got ${v}` : `${axis} must be > 0, got ${v}`,
  outOfRange: (field: string, v: number) =>
    field.endsWith('loss') ? `${field} must be >= 0, got ${v}` : `${field} must be between 0 and 1 (or a percent), got ${v}`,
  badSeed: (v: number) => `seed must be a whole number, got ${v}`,
  noMetric: 'no test_error, test accuracy or test_loss value',
  conflict: (run: string, epochs: number, winner: string, line: number) =>
    `conflict: run '${run}' epoch ${epochs} has different values in ${fmtPath(winner)} line ${line}, which is newer and was kept`,
  cannotOpen: (path: string, why: string) => `cannot open ${fmtPath(path)}: ${why === 'ENOENT' ? 'no such file or folder' : why}`,
  unreadable: (why: string) => `file not readable: ${why}`,
  badMap: (text: string) => `--map expects canonical=source (e.g. --map width=config.model.width), got '${text}'`,
  badMapTarget: (target: string, known: string) => `--map: unknown column '${target}'; known: ${known}`,
  badSet: (text: string) => `--set expects key=value (e.g. --set train_size=4000), got '${text}'`,
  badSetValue: (key: string, value: string) => `--set ${key} expects a number, got '${value}'`,
  badScale: (text: string) => `--scale expects column=percent or column=fraction (e.g. --scale test_error=percent), got '${text}'`,
  badSeedFrom: (text: string, why: string) => `--seed-from is not a valid regular expression '${text}': ${why}`,
  badMappingFile: (path: string, why: string) => `--mapping ${path}: ${why}`,
  nothingFound: (paths: string) => `no readable logs found in ${paths}`,
  nothingAccepted: (read: number, rejected: number, store: string) =>
    read === 0
      ? 'nothing to ingest: no rows in any source (see the notes above)'
      : `nothing accepted from any source: ${rejected} of ${read} rows rejected (reasons above and in ${store}/rejected.csv)${rejected < read ? ', the rest pending or skipped' : ''}`,
  gridSpecGiven: (path: string) =>
    `${fmtPath(path)} is a grid spec (the planned sweep), not a run log: give it to --spec of coverage, plan or report`,
  gridSpecSkipped: (path: string) => `${fmtPath(path)} is a grid spec, not a run log: left out (give it to --spec)`,
  strictFailed: (n: number) => `--strict: ${n} row${n === 1 ? '' : 's'} rejected, store left unchanged`,
  summary: (r: { read: number; accepted: number; duplicates: number; rejected: number; pending: number; skipped: number }) =>
    `read ${r.read} rows = ${r.accepted} accepted + ${r.duplicates} duplicates + ${r.rejected} rejected + ${r.pending} pending` +
    (r.skipped ? ` + ${r.skipped} skipped (not runs: summaries over seeds)` : ''),
  sourcesLine: (sources: number, unchanged: number, failed: number) =>
    `${sources} source${sources === 1 ? '' : 's'}: ${sources - unchanged - failed} read, ${unchanged} unchanged (skipped), ${failed} unreadable`,
  conflictsLine: (conflicts: number, displaced: number) =>
    `${conflicts} conflict${conflicts === 1 ? '' : 's'} (same run and epoch, different values): the newest source kept${displaced ? `, ${displaced} stored row${displaced === 1 ? '' : 's'} replaced` : ''}`,
  rejectedLine: (r: { source: string; line: number; field: string; reason: string }) =>
    `  ${fmtPath(r.source)}${r.line ? ` line ${r.line}` : ''}${r.field ? ` field ${r.field}` : ''}: ${r.reason}`,
  moreRejected: (n: number, path: string) => `  … ${n} more in ${path}`,
  storeLine: (dir: string, rows: number, sources: number) => `store ${dir}: ${rows} rows from ${sources} sources`,
  noChange: 'nothing new: every source is already in the store',
  noPaths: 'name at least one log file or folder (or - for stdin), e.g. datlas ingest runs/',
  // Bad input (issue 10): every outcome names file, line and field where they apply.
  compressed: (kind: string) => `${kind}-compressed file, not a text log; decompress it first (e.g. gunzip)`,
  binary: (control: number, bytes: number) => `not a text log: ${control} of its first ${bytes} bytes are control bytes (a binary file?)`,
  encodingNote: (source: string, encoding: string) =>
    `${fmtPath(source)}: not UTF-8; read as ${encoding === 'latin1' ? 'Latin-1 (Windows-1252)' : `${encoding.toUpperCase()} (no byte-order mark)`}`,
  noRows: (source: string, header: boolean) =>
    header ? `${fmtPath(source)}: header only, no rows yet` : `${fmtPath(source)}: nothing to read (empty file, or its first line is not complete yet)`,
  unbalancedQuote: (line: number) => `unbalanced quote: the quoted field opened on line ${line} is never closed; reading resumes on the next line`,
  headerQuote: 'unbalanced quote in the header line; fix the header',
  headerRepeated: (source: string, line: number, count: number) =>
    `${fmtPath(source)}: line ${line} repeats the header (logs joined end to end?); ${count} such line${count === 1 ? '' : 's'} skipped`,
  otherHeader: 'a header with different columns (logs joined end to end?); rows below it are not read until the first header returns: split the file',
  underOtherHeader: (line: number) => `below a different header (line ${line}); split the joined logs into one file each`,
  thousandsColumn: (source: string, column: string, example: string) =>
    `${fmtPath(source)}: column '${column}' has thousands separators ('${example}' read as ${example.replace(/,/g, '')})`,
  withUnit: (text: string, unit: string) => `not a number: '${text.length > 40 ? `${text.slice(0, 40)}…` : text}' (a unit '${unit}'? write the bare number)`,
  decimalComma: (text: string) => `not a number: '${text}' (a decimal comma? write ${text.replace(',', '.')})`,
  fractionColumn: (source: string, column: string, target: string, above: number, total: number) =>
    `${fmtPath(source)}: column '${column}' read as fractions; ${above} of ${total} values above 1 are rejected (if the column is in percent, add --scale ${target}=percent)`,
  risingError: (source: string, column: string, target: string, rising: number, runs: number, other: string) =>
    `${fmtPath(source)}: column '${column}' (read as ${target}) rises by more than 0.3 over training in ${rising} of ${runs} runs; if it is ${other.endsWith('accuracy') ? 'an accuracy' : 'an error'}, map it with --map ${other}=${column}`,
  restarted: (source: string, run: string, from: number, to: number, line: number, count: number) =>
    `${fmtPath(source)}: run '${run}' goes back from epoch ${from} to ${to} at line ${line} (a restarted job?)${count > 1 ? ` and ${count - 1} more time${count > 2 ? 's' : ''}` : ''}; for an epoch logged twice the later line is kept`,
  noMetricRow: 'no metric in this row (test and train error, accuracy and loss all empty)',
  badArrow: (why: string) => `not a readable Arrow IPC file: ${why}`,
  badJsonAt: (why: string, line: number) => `not valid JSON at line ${line}: ${why}`,
  badJsonLineWhy: (why: string) => `not valid JSON: ${why}`,
  mergedRows: (n: number) =>
    `${n} row${n === 1 ? '' : 's'} completed a row of the same run and epoch (metrics logged on separate lines or files); counted as duplicates`,
  // Limits and odd inputs: each names the line (or file), the limit and the flag that raises it.
  lineTooLong: (limit: number) => `line longer than the limit of ${big(limit)} characters (raise it with --max-line); rejected, reading resumes on the next line`,
  tooManyFields: (limit: number) => `more than ${big(limit)} fields, the limit (raise it with --max-fields); rejected, reading resumes on the next line`,
  headerTooLong: (limit: number) => `line 1 (the header) is longer than the limit of ${big(limit)} characters (raise it with --max-line)`,
  headerTooManyFields: (limit: number) => `line 1 (the header) has more than ${big(limit)} fields, the limit (raise it with --max-fields)`,
  textTooLong: (length: number, limit: number) => `text of ${big(length)} characters, over the limit of ${big(limit)} (raise it with --max-text)`,
  longColumnName: (source: string, column: number, length: number, limit: number) =>
    `${fmtPath(source)}: the name of column ${column} is ${big(length)} characters, over the limit of ${big(limit)} (--max-text); column left out`,
  longConstant: (source: string, key: string, length: number, limit: number) =>
    `${fmtPath(source)}: the value of '${clipText(key)}' is ${big(length)} characters, over the limit of ${big(limit)} (--max-text); left out`,
  tooDeep: (limit: number) => `nested more than ${limit} levels deep (objects or arrays inside one another), the limit`,
  skippedSource: (path: string, why: string) => `skipped ${fmtPath(path)}: ${why}`,
  widthText: (source: string, column: string, example: string, value: number, cells: number) =>
    `${source}: width in '${column}' written with letters ('${example}' read as ${value}; ${cells} cell${cells === 1 ? '' : 's'})`,
  planFile: (runs: number) => `this is a plan file (${runs} proposed run${runs === 1 ? '' : 's'}, columns 'why'/'sharpens', no metric), not a log: not read`,
  linkLoop: 'a symbolic link loop (the link leads back to itself)',
  danglingLink: (target: string) => `a symbolic link to '${clipText(target)}', which does not exist`,
  specialFile: (kind: string) => `a ${kind}, not a regular file`,
  namedPipe: (path: string) => `a named pipe (FIFO): reading it could wait forever; pipe it in instead: datlas ingest - < ${path}`,
  compressedName: (ext: string) => `a ${ext} file (compressed or binary), not a log ingest reads; decompress or convert it first`,
  notLogName: 'not a log format ingest reads (by its extension)',
  storeFolder: 'a datlas store (manifest.json and rows.arrow), not logs',
  folderAgain: (real: string) => `a link to a folder read already (${clipText(real)})`,
  otherFiles: (n: number, examples: string[]) =>
    `${n} file${n === 1 ? '' : 's'} of other types passed over (not csv, tsv, txt, log, jsonl, json or arrow), e.g. ${examples.map(fmtPath).join(', ')}; --json lists them under skippedSources`,
  nothingReadWhy: (failed: number, first: string) =>
    `nothing could be read: ${failed} source${failed === 1 ? '' : 's'} failed${failed > 1 ? ', the first' : ''}: ${first}`,
  stdinTerminal: 'reading a log from stdin, which is this terminal: type or paste it, then press Ctrl-D (or pipe a file in: datlas ingest - < FILE)',
  implausibleAxis: (axis: string, v: number, range: readonly [number, number]) =>
    `${axis} ${sci(v)} is outside the plausible range ${sci(range[0])} to ${sci(range[1])} (a unit mix-up or a corrupt log?)`,
  badLimit: (flag: string, text: string) => `${flag} expects a whole number >= 1, got '${text}'`,
};

// ── store ────────────────────────────────────────────────────────────────────
export const storeText = {
  noStore: (dir: string) => `no store at ${dir} (run datlas ingest first)`,
  empty: (dir: string) => `the store is empty: ${dir} holds no accepted rows (ingest run logs first; rejected rows are listed in ${dir}/rejected.csv)`,
  notAStore: (dir: string) => `${dir} holds a manifest.json that is not a datlas store`,
  badManifest: (dir: string, why: string) => `store ${dir}: manifest.json is not readable: ${why}`,
  badRows: (dir: string, why: string) => `store ${dir}: rows.arrow is not readable: ${why}`,
  inconsistent: (dir: string, want: number, got: number) =>
    `store ${dir}: manifest says ${want} rows but rows.arrow holds ${got} (files changed by hand, or by an older datlas killed mid-write); move the store aside and ingest the logs again`,
  locked: (dir: string, pid: number, seconds: number) =>
    `store ${dir} is locked by another ingest${pid ? ` (pid ${pid})` : ''}; waited ${seconds} s. Try again when it finishes, or raise --wait`,
  cannotLock: (dir: string, why: string) => `cannot lock store ${dir}: ${why}`,
  cannotRecover: (dir: string, why: string) => `store ${dir}: cannot finish the write an interrupted ingest left: ${why}`,
  mixedWrites: (dir: string) =>
    `store ${dir}: rows.arrow and manifest.json come from different writes (a file copied in by hand?); move the store aside and ingest the logs again`,
};

// ── library (src/api) ────────────────────────────────────────────────────────
/** Messages for scripts that call the library. */
export const apiText = {
  notRows: (what: string) => `expected rows: a store (openStore), an arquero table (store.toArquero()) or a RowTable, got ${what}`,
  arqueroColumns: (missing: string[]) =>
    `the arquero table lacks the column${missing.length === 1 ? '' : 's'} ${missing.join(', ')} (start from store.toArquero() and keep the canonical columns)`,
  notAMap: (what: string) => `expected a map (from buildMap, or a map file read with JSON.parse), got ${what}`,
};

// ── simulate ─────────────────────────────────────────────────────────────────
export const simulateMessages = {
  badPreset: (name: string, names: readonly string[]) => `--preset must be one of ${names.join(', ')}, got '${name}'`,
  badShape: (name: string, names: readonly string[]) => `--shape must be one of ${names.join(', ')}, got '${name}'`,
  badCount: (flag: string, text: string) => `${flag} expects a whole number >= 1, got '${text}'`,
  badRidge: (text: string) => `--ridge expects a number >= 0 or 'optimal', got '${text}'`,
  ridgeNeedsLinear: (preset: string) => `--ridge applies to --preset linear only (preset is ${preset})`,
  noiseNeedsFeatures: '--label-noise applies to the random-features presets, not --preset linear (its noise is sigma2)',
  epochsNeedFeatures: '--epochs applies to the random-features presets; --preset linear logs one closed-form fit per run',
  evalNoiseNeedsFeatures: '--eval-noise applies to the random-features presets, which log a curve over epochs; --preset linear logs one fit per run',
  badEvalNoise: (text: string) => `--eval-noise expects a standard deviation of test error in [0, 1), e.g. 0.01, got '${text}'`,
  badValues: (flag: string, what: string) => `${flag}: ${what}`,
  outNotEmpty: (dir: string) => `${dir} is not empty; choose another --out or pass --force (files of the same name are overwritten, nothing is deleted)`,
  wrote: (runs: number, rows: number, files: number, dir: string, seconds: number, shape: string) =>
    `wrote ${runs} runs (${rows} rows) as ${shape} to ${dir} (${files} files) in ${seconds.toFixed(1)} s`,
  nextStep: (dir: string) => `next: datlas ingest ${dir}`,
  linearNote: 'linear-Gaussian mode: test_loss is the risk on a fresh test set (σ² included); column risk is its exact expected value for the fit; compare their seed means with Belkin, Hsu & Xu (2019) Thm 1',
  peakNote: 'test_loss is heavy-tailed near the interpolation threshold; prefer test_error or a median across seeds there',
};


// ── plan CSV read back (simulate --plan) ─────────────────────────────────────
export const planCsvText = {
  syntax: (file: string, line: number, what: string) => `${fmtPath(file)} line ${line}: not valid CSV: ${what}`,
  empty: (file: string) => `${fmtPath(file)}: empty plan (no header line)`,
  missingColumn: (file: string, col: string, head: string[]) =>
    `${fmtPath(file)} line 1: no '${col}' column (the header has: ${head.join(', ')}); write plans with datlas plan --emit csv`,
  badCell: (file: string, line: number, col: string, value: string, what: string) =>
    `${fmtPath(file)} line ${line}, column ${col}: '${value}' is not ${what}`,
  duplicate: (file: string, line: number, first: number, what: string) =>
    `${fmtPath(file)} line ${line}: the run ${what} is already listed on line ${first}`,
  noFile: (file: string) => `no plan file at ${fmtPath(file)} (write one with: datlas plan --spec FILE --emit csv --out ${file})`,
  noRuns: (file: string) => `${fmtPath(file)}: the plan lists no runs (nothing to simulate)`,
  linearPreset: '--plan runs the random-features presets (quick, demo, epochs); --preset linear has no epochs to plan',
  planFlagsClash: (flags: string) => `--plan lists the runs itself; drop ${flags}`,
  conditionIgnored: (n: number) => `${n} planned run${n === 1 ? '' : 's'} name a condition; the simulator has none, so it is only copied into the logs`,
  wrotePlan: (runs: number, resumed: number, rows: number, files: number, dir: string, seconds: number, shape: string) =>
    `simulated ${runs} planned run${runs === 1 ? '' : 's'}${resumed ? ` (${resumed} resumed)` : ''}: ${rows} rows as ${shape} to ${dir} (${files} files) in ${seconds.toFixed(1)} s`,
};


// ── cells / grid / map ───────────────────────────────────────────────────────
export const mapMessages = {
  unknownAxis: (name: string, allowed: readonly string[]) => `unknown axis '${name}'; map axes are ${allowed.join(', ')}`,
  sameAxes: (name: string) => `--x and --y are both '${name}'; a map needs two different axes`,
  atOnMapAxis: (name: string) => `--at fixes '${name}', but '${name}' is an axis of this map; drop it or choose other axes`,
  atUnknown: (name: string, allowed: readonly string[]) => `--at names '${name}', which is not one of ${allowed.join(', ')}`,
  atNotNumber: (name: string, value: string) => `--at ${name}=${value}: ${name} takes a number`,
  atValueAbsent: (name: string, value: number | string, available: readonly (number | string)[]) => {
    if (available.length === 0) return `no rows with ${name}=${value}: no row has any ${name} value`;
    if (available.every((v) => v === '')) return `no rows with ${name}=${value}: this sweep has no ${name}s (every run's ${name} is empty); drop --at ${name}`;
    const sorted = [...available].sort((a, b) => (typeof a === 'number' && typeof b === 'number' ? a - b : String(a) < String(b) ? -1 : 1));
    const shown = sorted.slice(0, 20).map((v) => (typeof v === 'number' ? formatNumber(v, 6) : v === '' ? '"" (none)' : JSON.stringify(v)));
    return `no rows with ${name}=${value}; values present: ${shown.join(', ')}${available.length > 20 ? `, … (${available.length} values)` : ''}`;
  },
  noMetric: (metric: string) => `no row has a finite ${metric}${metric === 'test_error' ? ' (try --metric test_loss)' : ''}`,
  noCells: (fixed: string) => `no measured cells at ${fixed} (runs may end before that epoch; they are never extrapolated)`,
  tooFewCells: (n: number, x: string, y: string) => `only ${n} measured cell(s) over ${x} × ${y}: a map needs at least 2 (3 not on one line for a 2-D field)`,
  methodFailed: (method: string, why: string) => `method ${method} failed on this map: ${why}`,
  noMethodWorked: (why: string) => `no interpolation method worked on this map: ${why}`,
  badRaster: (text: string) => `--raster expects NXxNY (e.g. 256x256) with sizes 2..2048, got '${text}'`,
  badFormat: (text: string, allowed: readonly string[]) => `--format '${text}' is not available; choose from ${allowed.join(', ')}`,
  badScale: (text: string) => `--axis-scale expects axis=log2|linear (e.g. --axis-scale width=linear), got '${text}'`,
  droppedNonPositive: (axis: string, n: number) => `${n} cell(s) at ${axis} <= 0 left out of the log2 ${axis} axis`,
  epochsThinned: (logged: number, used: number) => `runs logged ${logged} distinct epochs; the map uses ${used} of them (every run aligned to them along its own curve)`,
  oneSeedCells: (n: number) => `${n} cell(s) have one seed: no interval there`,
  heavyTails: (n: number) => `${n} cell(s) have mean and median more than a factor 2 apart (heavy tails across seeds); the map shows means`,
  gpSkipped: (n: number, max: number) => `gp not tried: ${n} cells (auto tries gp up to ${max}; ask for --method gp to force it)`,
  triedFailed: (method: string, why: string) => `${method} not usable here: ${why}`,
  wroteMap: (path: string) => `wrote ${path}`,
  runsEndBefore: (n: number, epochs: number) => `${n} run(s) end before epoch ${epochs} and are left out there (runs are never extrapolated)`,
};


// ── analysis (ridge, threshold, hurts) ───────────────────────────────────────
/** Numbers as everywhere else in the tool (src/formatNumber.ts). */
const fmtNum = (v: number): string => formatNumber(v);
/** An interpolated size: two significant digits, because that is all the grid supports. */
const fmtApprox = (v: number): string => fmtNum(Number(v.toPrecision(2)));
const fmtP = (p: number): string => (p < 0.001 ? 'p < 0.001' : `p = ${Number(p.toPrecision(2))}`);
const fmtFixed = (fixed: Record<string, number | string>): string =>
  Object.entries(fixed)
    .filter(([k, v]) => !(k === 'condition' && v === ''))
    .map(([k, v]) => `${k.replace('_', ' ')} ${typeof v === 'number' ? fmtNum(v) : v}`)
    .join(', ');
const metricName = (m: string): string => m.replace('_', ' ');

export const analysisText = {
  fmtNum,
  fmtFixed,
  badHurtsAt: (key: string) =>
    `--at ${key}=...: hurts runs along train_size at fixed width, epochs, label_noise or condition; '${key}' cannot be fixed here`,
  badCorrection: (text: string) => `--correction expects benjamini-hochberg (bh for short) or none, got '${text}'`,
  badKind: (kind: string) => `--kind expects model, sample or epoch, got '${kind}'`,
  badNumber: (flag: string, text: string, what: string) => `${flag} expects ${what}, got '${text}'`,
  noCells: (fixed: Record<string, number | string>) =>
    `no cells with a finite metric at ${fmtFixed(fixed) || 'the chosen values'}; check --at against the sweep's values`,
  ridgeHeader: (kind: string, metric: string, x: string, y: string, fixed: Record<string, number | string>) =>
    `ridge of the ${kind} map: ${metricName(metric)} peak along ${x}, per ${y}` + (Object.keys(fixed).length ? ` (${fmtFixed(fixed)})` : ''),
  picked: (names: string[], fixed: Record<string, number | string>, ties: Record<string, number> = {}) =>
    `picked ${names.map((n) => `${n}=${typeof fixed[n] === 'number' ? fmtNum(fixed[n] as number) : fixed[n]}${pickWhy(ties[n])}`).join(', ')}; set --at to choose`,
  ridgePeak: (o: { y: string; yv: number; x: string; px: number; low: number; high: number; level: number; metric: string; error: number; prominence: number; z: number }) =>
    `${o.y} ${fmtNum(o.yv)}: peak at ${o.x} ≈ ${fmtApprox(o.px)} (${Math.round(o.level * 100)}% interval ${fmtApprox(o.low)}–${fmtApprox(o.high)}), ` +
    `${metricName(o.metric)} ${fmtNum(o.error)}, ${fmtNum(o.prominence)} above the dip (${fmtNum(o.z)} SE)`,
  ridgeOther: (x: string, px: number, prominence: number, z: number) =>
    `    also a smaller peak at ${x} ≈ ${fmtApprox(px)} (${fmtNum(prominence)} above the dip, ${fmtNum(z)} SE)`,
  ridgeNone: (y: string, yv: number) => `${y} ${fmtNum(yv)}: no significant peak`,
  ridgeInsideNoise: (x: string, cx: number, prominence: number, z: number, min: number, p?: number, alpha?: number) =>
    z < min
      ? ` (a bump of ${fmtNum(prominence)} at ${x} ${fmtNum(cx)} sits inside the noise: ${fmtNum(z)} SE < ${min})`
      : ` (a bump of ${fmtNum(prominence)} at ${x} ${fmtNum(cx)}, ${fmtNum(z)} SE, is no taller than noise makes somewhere along the row: search-wide ${fmtP(p ?? 1)} >= ${alpha})`,
  ridgeCurveNoise: (rows: number, total: number) =>
    `one seed per cell in ${rows} of ${total} rows (marked *): there, significance and intervals come from the curve's own noise, not from seeds`,
  ridgeThreshold: (x: string, t: number | null, epsilon: number, ratio: number | null, atEdge = false) =>
    t === null
      ? `    train error never reaches ${epsilon}: no interpolation threshold in this row`
      : atEdge
        ? `    train error is already <= ${epsilon} at the sweep's edge (${x} ${fmtNum(t)}): the threshold lies at or beyond it`
        : `    interpolation threshold (train error <= ${epsilon}) at ${x} ≈ ${fmtApprox(t)}` + (ratio === null ? '' : `; peak/threshold ${fmtNum(ratio)}`),
  ridgeSummary: (withPeak: number, rows: number) => `${withPeak} of ${rows} rows have a significant peak`,
  ridgeSummaryCorrected: (withPeak: number, rows: number, alpha: number) =>
    `${withPeak} of ${rows} rows have a significant peak, after Benjamini–Hochberg correction across the ${rows} rows scanned (false discovery rate ${alpha})`,
  ridgeP: (p: number | undefined, pAdjusted: number | undefined) =>
    p === undefined ? '' : `    search-wide ${fmtP(p)}` + (pAdjusted === undefined ? '' : `, adjusted for the rows scanned ${fmtP(pAdjusted).replace('p ', 'p_adj ')}`),
  ridgeSmoothed: (bandwidth: number, rise: number, fall: number) =>
    `    one value per point: peak of the curve smoothed on the log axis (bandwidth ${fmtNum(bandwidth)} octave, cross-validated), ` +
    `rising over ${fmtNum(rise)} and falling over ${fmtNum(fall)} octaves at half height; interval from a bootstrap along the curve`,
  ridgeCorrectedAway: (x: string, cx: number, z: number, p: number, pAdjusted: number, alpha: number) =>
    ` (a bump at ${x} ${fmtNum(cx)}, ${fmtNum(z)} SE, search-wide ${fmtP(p)}, is not significant after correction for the rows scanned: ${fmtP(pAdjusted).replace('p ', 'p_adj ')} >= ${alpha})`,
  ridgeCurveModel: (rows: number, minExtent: number) =>
    `${rows} row${rows === 1 ? ' holds' : 's hold'} one value per point (one seed, or means without seed spread): their peaks are found on the smoothed curve, ` +
    `and a peak must rise and fall over at least ${fmtNum(minExtent)} octave each (--min-extent), so a one-epoch spike is never a peak`,
  hurtsSegment: (o: { onset: number; peak: number; recovery: number | null; rise: number; p: number; metric: string; last: number; pSearch?: number }) =>
    `from n = ${fmtNum(o.onset)} to n = ${fmtNum(o.peak)} extra data raises ${metricName(o.metric)} by ${fmtNum(o.rise)} ` +
    `(${fmtP(o.p)}${o.pSearch === undefined ? '' : `, search-wide ${fmtP(o.pSearch)}`}); ` +
    (o.recovery === null
      ? `it does not fall back below the n = ${fmtNum(o.onset)} level inside the sweep (largest n = ${fmtNum(o.last)})`
      : `it falls back below the n = ${fmtNum(o.onset)} level at n ≈ ${fmtApprox(o.recovery)}`),
  hurtsSlice: (fixed: Record<string, number | string>) => `${fmtFixed(fixed)}:`,
  hurtsBootstrap: (noiseFrom: 'seeds' | 'curve') =>
    noiseFrom === 'curve'
      ? '    (one seed per cell: p from a bootstrap with the curve\'s own noise, not from seeds)'
      : '    (a compared cell has one seed: p from a bootstrap with the pooled seed noise)',
  hurtsNone: (metric: string, slices: number, alpha: number) =>
    `no significant rise of ${metricName(metric)} with more data in ${slices} slice${slices === 1 ? '' : 's'} scanned (alpha ${alpha})`,
  hurtsOneSize: (slices: number) =>
    `each of the ${slices} width/epochs/label-noise slice${slices === 1 ? '' : 's'} holds a single train size: hurts needs runs over two or more train sizes`,
  hurtsMore: (n: number) => `... and ${n} more segment${n === 1 ? '' : 's'} (all in --json)`,
  hurtsAdjusted: (pAdjusted: number) => `    adjusted for the slices scanned (Benjamini–Hochberg): ${fmtP(pAdjusted).replace('p ', 'p_adj ')}`,
  hurtsSummary: (withRise: number, slices: number, alpha: number) =>
    `${withRise} of ${slices} slices show a significant rise, after Benjamini–Hochberg correction across the ${slices} slices scanned (false discovery rate ${alpha})`,
};

// ── render ───────────────────────────────────────────────────────────────────
export const render = {
  title: (metric: string, kind: string, x: string, y: string) => `${metric}: ${kind} map over ${x} × ${y}`,
  slicesTitle: (metric: string, x: string, y: string) => `${metric} vs ${x} at chosen ${y}`,
  keyCells: (n: number) => `colour: mean over seeds in a measured cell (${n} cells)`,
  keyRaster: (method: string, rmse: string) =>
    `solid: measured cell · hatched: interpolated by ${method} (leave-one-out rmse ${rmse}), no run there`,
  keyMissing: (n: number, raster: boolean) =>
    raster ? `×: missing cell, no finished run; its colour is interpolated (${n})` : `grey ×: missing cell, no finished run (${n})`,
  keyDiverged: (n: number) => `triangle: cell with diverged run(s), left out of the mean (${n})`,
  keyRidge: (from: string) => `ridge: error peak in each row; whiskers: its location interval (${from}); gap: no significant peak`,
  keyThreshold: (x: string, eps: string, dots: boolean, largest = false, atEdge = 0, edge = '') =>
    `dashed: interpolation threshold, ${largest ? 'largest' : 'smallest'} ${x} with mean train error ≤ ${eps}${dots ? ' (square: a row whose neighbours have none)' : ''}` +
    (atEdge ? `; in ${atEdge} row${atEdge === 1 ? '' : 's'} it lies at or beyond the sweep's edge (${largest ? '≥' : '≤'} ${edge}): not drawn` : ''),
  keyThresholdEdgeOnly: (x: string, eps: string, largest: boolean, rows: number, edge: string) =>
    `interpolation threshold (${largest ? 'largest' : 'smallest'} ${x} with mean train error ≤ ${eps}): at or beyond the sweep's edge in ${rows} row${rows === 1 ? '' : 's'} (${largest ? '≥' : '≤'} ${edge}), not drawn`,
  keySlicesBand: (diverged: boolean, peaks: boolean) =>
    `band: 95% Student-t interval of the mean over seeds${peaks ? ' · ◆ ridge peak with its location interval' : ''}${diverged ? ' · △ cell with diverged run(s)' : ''}`,
  warnNoRidge: 'ridge not computed: no peak or threshold drawn',
  warnNoPeak: (k: number) => `no significant peak in any row (prominence ≥ ${k} standard errors): no ridge drawn`,
  warnPeaksNotShown: (y: string, ys: string) => `no significant peak in the rows shown; the peaks are at ${y} ${ys}`,
  warnWeakPeaks: (where: string, k: number) => `not significant (prominence < ${k} standard errors): peak at ${where}`,
  keySmoothed: 'thick pale line: the curve smoothed on the log axis, on which the peak was found (points: logged values)',
  warnSmoothed: (where: string) =>
    `peak rests on one seed and a smoothed curve (${where}): its interval is a bootstrap along the curve; run more seeds before trusting it`,
  warnCurveNoise: (where: string) =>
    `one seed per cell: peak interval from curve noise, not seeds (${where}); run more seeds before trusting it`,
  badColors: (name: string, allowed: readonly string[]) =>
    `--colors '${name}' is not a perceptually uniform scheme; use one of ${allowed.join(', ')}`,
  badSlice: (text: string) => `--slices expects axis=v1,v2,... or v1,v2,... (values of the map's y axis), got '${text}'`,
  badSliceAxis: (axis: string, y: string) => `--slices names '${axis}' but this map's rows are ${y}`,
  badFacet: (name: string) => `--facet expects label_noise or condition, got '${name}'`,
  noCells: (kind: string) => `the ${kind} map has no measured cells: nothing to draw`,
  badPngScale: (text: string) => `--png-scale expects a pixel ratio between 0 and 8 (e.g. 2), got '${text}'`,
};


// ── plan / coverage ──────────────────────────────────────────────────────────
export const planText = {
  specSyntax: (file: string, line: number, what: string) => `${fmtPath(file)} line ${line}: not valid YAML or JSON: ${what}`,
  specInvalid: (file: string, line: number | null, key: string, problem: string) =>
    `${fmtPath(file)}${line === null ? '' : ` line ${line}`}: ${key}: ${problem}`,
  specRequired: () => 'is required',
  specUnknownKey: (key: string, parent: string, nearest: string | null, known: string[]) =>
    `unknown key '${key}'${parent ? ` in ${parent}` : ''} ${nearest ? `(did you mean ${nearest}?)` : `(expected one of: ${known.join(', ')})`}`,
  specUnknown: (file: string, line: number | null, problem: string) => `${fmtPath(file)}${line === null ? '' : ` line ${line}`}: ${problem}`,
  specLogNonPositive: () => 'log spacing needs values > 0 (use spacing: linear)',
  specMissing: (file: string) => `no spec file at ${fmtPath(file)} (write an example with: datlas plan --init ${file})`,
  specFlagNeeded: () => '--spec FILE is required (write an example with: datlas plan --init grid.yaml)',
  badPlaceholder: (name: string, known: string[]) => `--command: unknown placeholder {${name}} (known: ${known.map((k) => `{${k}}`).join(' ')})`,
  slurmEmpty: () => 'the plan is empty: nothing to put in a Slurm array',
  slurmLineBreak: (value: string) => `value ${JSON.stringify(value)} contains a line break; the Slurm array reads one CSV line per run`,
  whyGap: (status: string, epochAt: number | null, targetEpochs: number, resumed: boolean) => {
    const epoch = epochAt === null ? '?' : formatNumber(epochAt);
    const target = formatNumber(targetEpochs);
    return status === 'missing'
      ? 'not in the store'
      : status === 'diverged'
        ? `diverged at epoch ${epoch}; re-launched`
        : resumed
          ? `stopped at epoch ${epoch} of ${target}; resumes`
          : `stopped at epoch ${epoch} of ${target}; restarts (the command cannot resume)`;
  },
  whyRefine: (where: string, x: string, low: string, high: string, a: string, b: string) =>
    `ridge at width ${x} (${where}), interval ${low}–${high}, lies between measured widths ${a} and ${b}: bisects that bracket`,
  whyRefineSize: (where: string, x: string, low: string, high: string, a: string, b: string) =>
    `sample-wise peak at n ${x} (${where}), interval ${low}–${high}: bisects the step between measured train sizes ${a} and ${b}`,
  whyTopUp: (where: string, x: string, n: number, spec: number) =>
    `peak at ${x} (${where}) rests on a cell with ${n} of the spec's ${spec} seeds: tops it up`,
  whyIntervalSeeds: (where: string, x: string, low: string, high: string, resolution: number) =>
    `peak at ${x} (${where}) has interval ${low}–${high}, wider than ±${resolution} octave: one more seed where it rests`,
  whyHurtsStep: (where: string, what: string, a: string, b: string) =>
    `more data hurts (${where}): its ${what} lies between train sizes ${a} and ${b}: bisects that step`,
  whyEpochResume: (where: string, z: number, epochs: string, target: string) =>
    `test error still rising at epoch ${epochs} (${where}; ${z.toFixed(1)} SE over the last decade): an epoch-wise peak may not have appeared yet; resumes to ${target}`,
  stopLocated: (located: number, slices: number, resolution: number, noPeak: number) =>
    `stop: every ridge point is located within ${resolution} octave (${located} of ${slices} slice${slices === 1 ? '' : 's'}${noPeak ? `; ${noPeak} with no peak to locate` : ''}); nothing more proposed (a smaller --resolution asks for more)`,
  refineStatus: (located: number, refining: number, noPeak: number, resolution: number) =>
    `ridge slices at ${resolution} octave: ${located} located, ${refining} still refining${noPeak ? `, ${noPeak} with no peak` : ''}`,
  badMaxRuns: (text: string) => `--max-runs expects a whole number >= 1, got '${text}'`,
  planCapped: (n: number, max: number) => `${n} more run${n === 1 ? '' : 's'} left out by --max-runs ${max}`,
  whyThreshold: (where: string, threshold: string, a: string, b: string) =>
    `no peak resolved (${where}); the interpolation threshold (width ${threshold}) lies between measured widths ${a} and ${b}: bisects that step`,
  whyPeakSeeds: (where: string, x: string, se: number, min: number, p: number | null = null, alpha = 0.05) =>
    `peak at ${x} (${where}) is borderline: prominence ${se.toFixed(1)} SE, minimum ${min}${p === null ? '' : `; search-wide p = ${p.toPrecision(2)}, alpha ${alpha}`}`,
  whyHurtsSeeds: (where: string, onset: string, peak: string, p: number, alpha: number) =>
    `more data hurts from n ${onset} to ${peak} (${where}) is borderline: p = ${formatNumber(p, 2)}, alpha ${alpha}`,
  noteNoRidge: () => 'no ridge point along width resolved at the target epoch in any slice',
  noteDivergedRerun: (n: number) => `${n} diverged run${n === 1 ? '' : 's'} re-launched with the same seed (a deterministic run may diverge again: check the learning rate; --skip-diverged leaves them out)`,
  noteDivergedSkipped: (n: number) => `${n} diverged run${n === 1 ? '' : 's'} left out (--skip-diverged)`,
  noteNoResume: (n: number) => `${n} partial run${n === 1 ? '' : 's'} restart from epoch 0: the --command template has no {resume_from}`,
  coverageHead: (file: string, runs: number, shape: string, epochs: string) => `${fmtPath(file)}: ${runs} planned runs (${shape}; target ${epochs} epochs)`,
  coverageCounts: (c: Record<string, number>, pct: string) =>
    `complete ${c.complete} · partial ${c.partial} · missing ${c.missing} · diverged ${c.diverged}  (${pct} complete)`,
  coverageAllDone: () => 'every planned run is complete',
  gapsHead: () => 'gaps:',
  gapsMore: (n: number) => `  … and ${n} more group${n === 1 ? '' : 's'} (--limit 0 lists all, --json gives every run)`,
  extraRuns: (n: number, what: string) => `extra: ${n} store run${n === 1 ? '' : 's'} outside the spec (${what})`,
  supersededRuns: (n: number) => `${n} store run${n === 1 ? '' : 's'} re-launched a planned run already covered; the better one counts`,
  emptyStore: (dir: string) => `no store at ${dir}: every planned run counts as missing`,
  badImageExt: (path: string) => `--out ${path}: the coverage image must end in .png, .svg or .pdf`,
  initExists: (path: string) => `${path} exists; remove it or name another file (datlas plan --init FILE)`,
  wroteInit: (path: string) => `wrote ${path}: edit the axes, seeds and epochs, then run datlas coverage --spec ${path}`,
  needCommand: (emit: string) => `--emit ${emit} needs --command TEMPLATE (e.g. --command "python train.py --width {width} --seed {seed}")`,
  stdoutClash: () => '--emit without --out writes to stdout, and so does --json: add --out FILE',
  badBudget: (text: string) => `--budget expects a number (cost units) or a time such as 90m, 48h, 2d, got '${text}'`,
  budgetNeedsSeconds: (text: string) => `--budget ${text} is a time, but the store logs no wall_seconds: costs are relative (give a plain number)`,
  planHead: (n: number, cost: string, units: string) => `${n} run${n === 1 ? '' : 's'} planned, total cost ${cost}${units ? ` ${units}` : ''}`,
  planDropped: (n: number, cost: string, budget: string) => `${n} more run${n === 1 ? '' : 's'} (cost ${cost}) left out by --budget ${budget}`,
  planEmpty: () => 'nothing to run: every planned run is complete and no refinement is proposed',
  planNoneFits: (budget: string) => `no run fits --budget ${budget}: the cheapest proposed run costs more (see below)`,
  modelFitted: (a: string, aSe: string | null, runs: number, c: string, spread: string | null) =>
    `cost model: seconds = c · width^a · train_size · epochs, a = ${a}${aSe ? ` ± ${aSe}` : ''}, c = ${c} (least squares in log space over ${runs} runs' wall time${spread ? `; a run's cost is typically off by ×${spread}` : ''})`,
  modelWidthOnly: (runs: number, c: string) =>
    `cost model: a = 2 assumed (all ${runs} timed runs share one width), c = ${c} s fitted from their wall time`,
  modelRelative: (ref: string) =>
    `cost model: a = 2 assumed (common practice for convolutional width; the store logs no wall_seconds); costs relative, 1 = one run at ${ref}`,
  badResolution: (text: string) => `--resolution expects a positive number of octaves, got '${text}'`,
  badParallel: (text: string) => `--max-parallel expects a whole number >= 1, got '${text}'`,
  slurmBigArray: (n: number) =>
    `the Slurm array has ${n} tasks; clusters often cap arrays at MaxArraySize (1001 by default, common practice): split with --budget or ask your admins`,
  extraWidthsHint: (n: number) => `${n} of the extra runs sit at widths outside the spec (e.g. from refinement): add those widths to the spec to track them`,
  extraSeedsHint: (n: number, store: string, spec: string) =>
    `${n} of the extra runs differ from the spec only in their seed id (store seeds ${store}; spec seeds ${spec}): list the ids in the spec, e.g. seeds: [${store}]`,
  templateDropsSettings: (missing: { name: string; values: string[] }[], duplicates: number, runs: number) => {
    const what = missing
      .map((m) => `{${m.name}} (${m.values.slice(0, 4).join(', ')}${m.values.length > 4 ? `, … ${m.values.length} values` : ''})`)
      .join(', ');
    return (
      `--command leaves out ${what}, which ${missing.length === 1 ? 'varies' : 'vary'} among the ${runs} planned runs` +
      `${duplicates ? `: ${duplicates} command${duplicates === 1 ? ' repeats' : 's repeat'} an earlier one (the same job launched twice)` : ': the jobs could not tell those runs apart'}. ` +
      `Add ${missing.map((m) => `{${m.name}}`).join(' ')} to the template, or pass --allow-collapse to launch each distinct command once`
    );
  },
  collapsedRuns: (n: number) => `--allow-collapse: ${n} run${n === 1 ? '' : 's'} left out of the export (same command as an earlier run)`,
  refinePeaks: (n: number, sig: number) => `analyses at the target epoch: ${n} ridge point${n === 1 ? '' : 's'} along width (${sig} significant)`,
};

// ── report / demo ────────────────────────────────────────────────────────────
export const report = {
  // Headline findings (plain sentences; numbers already formatted).
  modelPeak: (m: string, y: string, yv: string, fixed: string, x: string, xv: string, low: string, high: string, ratio: string | null, thr: string | null) =>
    `Model-wise: at ${y} ${yv}${fixed ? ` (${fixed})` : ''} ${m} peaks at ${x} ${xv} (interval ${low}–${high})` +
    `${ratio ? `, ${ratio} × the train size` : ''}${thr ? `; train error first reaches ε at ${x} ${thr} (the interpolation threshold)` : ''}.`,
  modelPeakMoves: (y: string, firstY: string, x: string, fromX: string, toX: string, lastY: string, noneBefore: boolean) =>
    `The peak ${noneBefore ? `appears at ${y} ${firstY} (no significant peak earlier) and ` : ''}` +
    (fromX === toX ? `stays at ${x} ${toX} through ${y} ${lastY}.` : `moves from ${x} ${fromX} at ${y} ${firstY} to ${x} ${toX} at ${y} ${lastY}.`),
  thresholdMoves: (y: string, fromY: string, toY: string, x: string, fromX: string, toX: string, n: string | null, shrinks: boolean) =>
    `The interpolation threshold moves from ${x} ${fromX} at ${y} ${fromY} to ${x} ${toX} at ${y} ${toY}` +
    `${shrinks ? ': the longer the training, the smaller the model that fits the training set' : ''}${n ? ` (train size ${n})` : ''}.`,
  modelNoPeak: (fixed: string) => `Model-wise: no significant double-descent peak at any epoch${fixed ? ` (${fixed})` : ''}.`,
  peakBySize: (parts: string, tracks: boolean) =>
    `Across train sizes the model-wise peak ${tracks ? 'sits at width ≈ n' : 'moves with n'} (each at its latest epoch with a peak): ${parts}.`,
  noiseEffect: (parts: string, trend: 'grows' | 'shrinks' | 'mixed') =>
    `Label noise: the peak's height over its flanks ${trend === 'grows' ? 'grows with noise' : trend === 'shrinks' ? 'shrinks with noise' : 'varies with noise'} (${parts}).`,
  conditionEffect: (parts: string) => `By condition, the model-wise peak (latest epoch with one): ${parts}.`,
  samplePeaks: (m: string, parts: string, fixed: string) => `Sample-wise: ${m} peaks at ${parts}${fixed ? ` (${fixed})` : ''}.`,
  sampleNoPeak: (fixed: string) => `Sample-wise: no significant peak along train size${fixed ? ` (${fixed})` : ''}.`,
  hurts: (m: string, fixed: string, onset: string, peak: string, rise: string, p: string, ratio: string | null, recovery: string | null, others: number) =>
    `More data hurts at ${fixed}: ${m} rises by ${rise} from train size ${onset} to ${peak}${ratio ? ` (${ratio} × the width)` : ''} (p ${p}), ` +
    `${recovery ? `and falls back to the onset level at ${recovery}` : 'and does not fall back to the onset level inside the sweep'}` +
    `${others ? `; ${others} more slice${others === 1 ? ' shows' : 's show'} a significant rise` : ''}.`,
  hurtsOf: (m: string, fixed: string, onset: string, peak: string, rise: string, p: string, ratio: string | null, recovery: string | null, withRise: number, slices: number) =>
    `More data hurts in ${withRise} of ${slices} train-size slices, after Benjamini–Hochberg correction. Worst at ${fixed}: ${m} rises by ${rise} from train size ${onset} to ${peak}` +
    `${ratio ? ` (${ratio} × the width)` : ''} (adjusted p ${p}), ` +
    `${recovery ? `and falls back to the onset level at ${recovery}` : 'and does not fall back to the onset level inside the sweep'}.`,
  smoothedPeaks: (kind: string, label: string, y: string, ys: string) =>
    `${kind}-wise map (${label}): the peak at ${y} ${ys} rests on one value per point (one seed, or a mean without seed spread) and a smoothed curve; its interval is a bootstrap along the curve, not over seeds.`,
  hurtsNone: (slices: number, epochs: string) => `More data never significantly hurts at ${epochs} (${slices} train-size slices scanned).`,
  epochPeak: (m: string, parts: string, fixed: string) =>
    `Epoch-wise: ${m} rises and falls again with training time at ${parts}${fixed ? ` (${fixed})` : ''}.`,
  epochNoPeak: (m: string, fixed: string) =>
    `Epoch-wise: no significant peak along training time${fixed ? ` (${fixed})` : ''}: no rise of ${m} with epochs is followed by a significant fall within the logged epochs.`,
  coverage: (missing: number, partial: number, diverged: number, complete: number, total: number) =>
    `Still missing against the spec: ${missing} of ${total} planned runs have no data, ${partial} stopped before the target epochs, ${diverged} diverged (${complete} complete).`,
  coverageComplete: (total: number) => `Every one of the ${total} planned runs in the spec is complete.`,
  unevenSeeds: (min: number, max: number) =>
    `Seeds per configuration range from ${min} to ${max}: configurations with fewer seeds have wider intervals and weaker tests.`,
  divergedRuns: (n: number, runs: number) =>
    `${n} of ${runs} runs diverged somewhere along their curve; their values are left out of the means (marked on the maps).`,
  mapGaps: (kind: string, n: number, total: number) => `${n} of ${total} grid points of the ${kind}-wise map have no data (crossed on the map).`,
  plan: (runs: number, cost: string, reasons: string) => `Next: the plan proposes ${runs} runs costing ${cost}: ${reasons}.`,
  // Cautions: what a figure could make a reader believe wrongly.
  weakPeaks: (kind: string, label: string, y: string, ys: string) =>
    `${kind}-wise map (${label}): the peak at ${y} ${ys} is inside seed noise (prominence under 2 standard errors); do not read it as a peak.`,
  curveNoise: (kind: string, label: string, y: string, ys: string) =>
    `${kind}-wise map (${label}): one seed per cell, so the peak interval at ${y} ${ys} comes from the curve's own noise, not from seeds.`,
  oneSeed: 'Some cells have one seed: they have no interval, and their peaks cannot be tested against seed noise.',
  interpolated: (method: string, rmse: string) =>
    `The static map images colour the plane between measured cells by ${method} interpolation (leave-one-out rmse ${rmse}); hatched areas were not measured. The interactive maps show measured cells only.`,
  hurtsMultiple: (slices: number, alpha: string) =>
    `${slices} train-size slices were each tested at α = ${alpha}: about ${alpha} × ${slices} rises could be significant by chance alone.`,
  hurtsCorrected: (slices: number, alpha: string) =>
    `${slices} train-size slices were scanned; rises are listed when significant after Benjamini–Hochberg correction across them (false discovery rate ${alpha}), so about ${alpha} of the listed rises may still be chance.`,
  /** Subtitle of the hurts page (deck) and line above its table (HTML): how many slices hold a rise, and under which correction. */
  hurtsSubtitle: (o: { withRise: number; slices: number; fixed: string; alpha: string; correction: 'benjamini-hochberg' | 'none' }) =>
    (o.correction === 'benjamini-hochberg'
      ? `${o.withRise} of ${o.slices} train-size slices show a rise, after correction (Benjamini–Hochberg across the ${o.slices} slices scanned, FDR ${o.alpha})`
      : `${o.withRise} of ${o.slices} train-size slices show a rise, each tested alone at α = ${o.alpha} (no correction across slices)`) +
    ` at ${o.fixed || 'every epoch'}; worst rise first`,
  interpolatedPage:
    'Colours between measured cells are interpolated, not measured: a feature that lies between cells (a narrow peak, an edge) can be missed or invented. Check the measured-cells page and the hatching before quoting a value from here.',
  skipAxis: (axis: string, n: number, need: number) => `the sweep has ${n} value${n === 1 ? '' : 's'} of ${axis}; this map needs at least ${need}`,
  skipNoCells: 'no cell of the sweep has data on this map',
  // Files and CLI.
  wrote: (what: string, path: string) => `${what}: ${path}`,
  demoSweepMissing: (dir: string) => `no committed demo sweep at ${dir} (run with --fresh to simulate it)`,
  findingsHead: 'Headline findings:',
  heavyTail: (m: string) =>
    `The ${m} is a mean of squared errors, heavy-tailed near the interpolation threshold: one seed can dominate a cell's mean there, so check the seeds in the read-outs before trusting a peak's height.`,
  coverageFigure: 'The planned grid: each cell coloured by the share of its planned seeds complete, labelled done/planned (p: partial, d: diverged).',
  badScale: (text: string) => `--png-scale expects a pixel ratio between 0 and 8 (e.g. 1 or 2), got '${text}'`,
  chosenPeaks: 'of the fixed values offered, the ones whose map has the most significant peaks',
  hurtsFigure:
    'Test error along train size at the widths where more data hurts most (mean over seeds, band: 95% interval; dashed: train error).',
  cautionsHead: 'Read with care:',
  skippedKind: (kind: string, reason: string) => `${kind}-wise map not drawn: ${reason}`,
  defaultTitle: (store: string) => `Sweep report: ${store}`,
  demoTitle: 'Demo sweep: random features, width × train size × noise × epochs',
  demoSimulating: (dir: string) => `simulating the demo sweep into ${dir} (600 runs; about a minute on 2 cores)`,
  demoIngestFailed: (dir: string) => `the demo sweep at ${dir} could not be ingested (run datlas ingest ${dir} to see why)`,
  demoHead: (logs: string, rows: number, seconds: number) => `demo: ${rows} logged rows from ${logs}, report and plan in ${seconds.toFixed(1)} s`,
  demoNext: (html: string, store: string, spec: string) =>
    `next: open ${html} in a browser; try datlas map --store ${store} --kind model --at label_noise=0.1, or datlas plan --store ${store} --spec ${spec} --budget 100`,
};

// ── reading result files: layouts, key levels, curves, describe ─────────────
const at = (source: string) => (source === '' ? '' : `${fmtPath(source)}: `);
const list = (values: string[], more: number) => `${values.join(', ')}${more > 0 ? `, … (${more} more)` : ''}`;
export const layoutText = {
  notEvaluated: 'curve point with every metric NaN or empty (not evaluated at this epoch)',
  valuesWithoutNames: "a list of values without column names: write records (pandas orient='records' or 'split')",
  levelNamed: (source: string, path: string, column: string, parent: string) =>
    `${at(source)}keys under '${path}' read as ${column} (named by '${parent}'; rename with --keys)`,
  levelUnnamed: (source: string, path: string, column: string, values: string[], more: number) =>
    `${at(source)}keys under '${path}' are values (${list(values, more)}), kept as column ${column}; name them with --keys NAME[,NAME...] (outermost first)`,
  levelKeys: (source: string, path: string, column: string) => `${at(source)}keys under '${path}' read as ${column} (--keys)`,
  levelPairs: (source: string, path: string, column: string) => `${at(source)}'${column}' read from the name=value keys under '${path}'`,
  levelRuns: (source: string, path: string, n: number, values: string[]) =>
    `${at(source)}${n} keys under '${path}' name runs (${list(values.slice(0, 4), n - Math.min(4, values.length))})`,
  curves: (source: string, path: string, key: string, records: number, rows: number) =>
    `${at(source)}curve '${key}' at ${(path || '(top)').replace(/\*/g, '<key>')} expanded: ${records} record${records === 1 ? '' : 's'} → ${rows} rows`,
  unread: (source: string, path: string, length: number, what: string, times: number) =>
    `${at(source)}array '${path}' (${times > 1 ? `in ${times} records, up to ` : ''}${length} ${what === 'lists' ? 'lists' : 'values'}) not read: not records and not a column of a block of equal-length arrays`,
  summaries: (source: string, path: string, rows: number, reason: string) =>
    `${at(source)}${rows} record${rows === 1 ? '' : 's'} under '${path}' skipped: ${reason === 'key' ? 'a block of summaries' : 'metrics are all means or spreads over seeds'}, not runs`,
  joinedSplits: (source: string, path: string, keys: string[], records: number) =>
    `${at(source)}curves ${keys.map((k) => `'${k}'`).join(', ')} at ${(path || '(top)').replace(/\*/g, '<key>')} joined per epoch into one run${records === 1 ? '' : ` (in ${records} records)`}: their metrics read as ${keys.map((k) => `${k}_*`).join(', ')}`,
  settingBlock: (source: string, path: string, keys: string[], times: number) =>
    `${at(source)}'${path}' (${keys.join(', ')}${keys.length >= 8 ? ', ...' : ''}) is a setting keyed by number or a list of settings, not rows: not read${times > 1 ? ` (in ${times} records)` : ''}`,
  valueByFileName: (source: string, column: string, stem: string, target: string) =>
    `${at(source)}column '${column}' read as ${target}, named by the file '${stem}' (one metric per file)`,
  axisFromFolder: (source: string, axis: string, value: string, folder: string) =>
    `${at(source)}no ${axis} column; ${axis} ${value} read from the folder name '${folder}'`,
  longSplit: (source: string, column: string, splits: string[], metrics: string[]) =>
    `${at(source)}rows of ${splits.join(', ')} told apart by column '${column}': ${metrics.map((m) => `'${m}'`).join(', ')} read as ${splits.map((s) => `${s}_*`).join(', ')} (the splits of one run and epoch joined)`,
  heldOutTwin: (source: string, column: string, target: string, heldOut: string) =>
    `${at(source)}'${column}' read as ${target} (beside it '${heldOut}' is the held-out metric, taken as test)`,
  paramsAsWidth: (source: string, column: string) =>
    `${at(source)}no width column; parameter count '${column}' serves as the model-size axis (width)`,
  outcomeMetric: (source: string, column: string, target: string) =>
    `${at(source)}no ${target} curve; run-level '${column}' read as ${target} at the run's epochs`,
  bestCaution: (source: string, column: string) =>
    `${at(source)}'${column}' is a best-over-training value: an early-stopped minimum hides epoch-wise double descent; read its maps with care`,
  mappingLine: (target: string, from: string, passed: string[]) => `  ${target} ← ${from}${passed.length ? ` (passed over: ${passed.join(', ')})` : ''}`,
  layoutHead: (sources: number, example: string) => `layout of ${sources} source${sources === 1 ? '' : 's'} (e.g. ${fmtPath(example)}):`,
  conditionsLine: (n: number, shown: string) => `  conditions: ${n} (${shown})`,
  conditionRuns: (condition: string, runs: number) => `${condition === '' ? '(none)' : condition}: ${runs} run${runs === 1 ? '' : 's'}`,
  numbered: (source: string, path: string, curves: number) =>
    `${at(source)}${curves} curve${curves === 1 ? '' : 's'} at ${path} without an epoch or step key: points numbered 1, 2, … as epochs (one per epoch); map another column with --map epochs=COLUMN`,
  unusedKeys: (source: string, names: string[]) =>
    `${at(source)}--keys ${names.join(',')}: no level of value keys left to name (the document has fewer levels)`,
  moreLayouts: (n: number) => `… ${n} more layout${n === 1 ? '' : 's'} (ingest --json lists them all)`,
  badKeys: (text: string) => `--keys expects NAME[,NAME...] (outermost level first, e.g. --keys seed,label_noise), got '${text}'`,
  describeHead: (store: string, rows: number, runs: number) => `store ${store}: ${rows} rows, ${runs} runs`,
  describeColumn: (canonical: string, source: string) => `  ${canonical} ← ${source}`,
  describeAxis: (axis: string, values: string) => `  ${axis}: ${values}`,
};
