import { existsSync, readFileSync, statSync } from 'node:fs';
import type { Argv } from 'yargs';
import type { CommandSpec } from './CommandSpec.js';
import { progressBar } from './progress.js';
import { UserError, usageError } from '../UserError.js';
import { ingestText, layoutText } from '../messages.js';
import type { Target } from '../ingest/synonyms.js';
import { TARGETS } from '../ingest/synonyms.js';
import type { Scale } from '../ingest/normalizeRaw.js';
import { DEFAULT_LIMITS } from '../ingest/ReadLimits.js';
import type { ReadLimits } from '../ingest/ReadLimits.js';

interface IngestArgs {
  paths: string[];
  store: string;
  map?: string[];
  mapping?: string;
  set?: string[];
  seedFrom?: string;
  scale?: string[];
  strict: boolean;
  wait: number;
  keys?: string;
  condition?: string[];
  maxLine?: number;
  maxFields?: number;
  maxText?: number;
}

/** Targets --map may name (the canonical columns plus accuracies, converted to error). */
const MAP_TARGETS = ['run', 'seed', 'width', 'epochs', 'train_size', 'label_noise', 'test_error', 'train_error', 'test_loss',
  'train_loss', 'test_accuracy', 'train_accuracy', 'wall_seconds', 'status', 'condition', 'params'];
const NUMERIC_SET = ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'wall_seconds', 'params'];
const SCALE_TARGETS = ['test_error', 'train_error', 'test_accuracy', 'train_accuracy', 'label_noise'];

/** The named YAML/JSON files that are grid specs, not logs (read only when the name could be one). */
async function specFiles(paths: string[]): Promise<string[]> {
  const named = paths.filter((p) => p !== '-' && /\.(ya?ml|json)$/i.test(p));
  if (named.length === 0) return [];
  const { isGridSpec } = await import('../plan/isGridSpec.js');
  return named.filter((p) => {
    try {
      const st = statSync(p);
      return st.isFile() && st.size < 1 << 20 && isGridSpec(readFileSync(p, 'utf8'));
    } catch {
      return false;
    }
  });
}

function pairs(values: string[] | undefined, bad: (t: string) => string): [string, string][] {
  return (values ?? []).flatMap((v) => String(v).split(/,(?=[^,=]+=)/)).map((text) => {
    const eq = text.indexOf('=');
    if (eq <= 0 || eq === text.length - 1) throw usageError(bad(text));
    return [text.slice(0, eq).trim(), text.slice(eq + 1).trim()] as [string, string];
  });
}

function readMappingFile(path: string): { map: Record<string, string>; set: Record<string, string>; scale: Record<string, string>; seedFrom?: string } {
  let value: unknown;
  try {
    value = JSON.parse(readFileSync(path, 'utf8'));
  } catch (err) {
    throw usageError(ingestText.badMappingFile(path, (err as Error).message.split('\n')[0]));
  }
  if (!value || typeof value !== 'object' || Array.isArray(value)) throw usageError(ingestText.badMappingFile(path, 'expected a JSON object'));
  const v = value as Record<string, unknown>;
  const strings = (o: unknown) => Object.fromEntries(Object.entries((o ?? {}) as Record<string, unknown>).map(([k, x]) => [k, String(x)]));
  // Either {"width": "config.model.width", ...} or {"map": {...}, "set": {...}, "scale": {...}, "seedFrom": "..."}.
  if ('map' in v || 'set' in v || 'scale' in v || 'seedFrom' in v) {
    return { map: strings(v.map), set: strings(v.set), scale: strings(v.scale), seedFrom: typeof v.seedFrom === 'string' ? v.seedFrom : undefined };
  }
  return { map: strings(v), set: {}, scale: {} };
}

export const command: CommandSpec<IngestArgs> = {
  usage: 'ingest [paths..]',
  describe: 'merge run logs (csv, tsv, text, jsonl, json, run folders, arrow) into the store',
  example: ['ingest runs/ --set label_noise=0.2 --map width=config.model.width', 'merge every log under runs/ into ./atlas-store'],
  builder: (y: Argv) =>
    y
      .positional('paths', { type: 'string', array: true, describe: 'files or folders (walked recursively); - reads stdin' })
      .option('store', { type: 'string', default: 'atlas-store', describe: 'store directory' })
      .option('map', { type: 'string', array: true, describe: 'canonical=source column or dotted JSON path (e.g. width=config.model.width)' })
      .option('mapping', { type: 'string', describe: 'JSON file of canonical: source (or {map, set, scale, seedFrom})' })
      .option('set', { type: 'string', array: true, describe: 'axis=value for logs that lack it; other keys join the condition' })
      .option('seed-from', { type: 'string', describe: 'regular expression taking the seed from the file path (first group)' })
      .option('scale', { type: 'string', array: true, describe: 'column=percent|fraction, overriding the per-column detection' })
      .option('keys', { type: 'string', describe: 'names of the value-key levels of nested JSON, outermost first (e.g. seed,label_noise)' })
      .option('condition', { type: 'string', array: true, describe: 'column that splits the sweep into conditions (repeatable)' })
      .option('strict', { type: 'boolean', default: false, describe: 'fail (exit 1, store unchanged) on any rejected row' })
      .option('wait', { type: 'number', default: 30, describe: 'seconds to wait for another ingest holding the store lock' })
      .option('max-line', { type: 'number', describe: `characters one line may hold; a longer line is rejected (default ${DEFAULT_LIMITS.maxLine})` })
      .option('max-fields', { type: 'number', describe: `fields (JSON keys) one line may hold (default ${DEFAULT_LIMITS.maxFields})` })
      .option('max-text', { type: 'number', describe: `characters one text field (run name, condition value, column name) may hold (default ${DEFAULT_LIMITS.maxText})` }),
  async run(args) {
    // yargs array options swallow the words after them (`--set n=4000 runs/`): give paths back.
    const stray: string[] = [];
    if (args.condition) {
      // Like --map, the array option swallows paths after it: an existing path is given back.
      args.condition = args.condition.flatMap((v) => String(v).split(',')).filter((v) => {
        if (v !== '-' && existsSync(v) && /[/.]/.test(v)) {
          stray.push(v);
          return false;
        }
        return v.trim() !== '';
      });
    }
    for (const key of ['map', 'set', 'scale'] as const) {
      const vals = args[key];
      if (!vals) continue;
      args[key] = vals.filter((v) => {
        const text = String(v);
        if (text.includes('=')) return true;
        const bad = key === 'map' ? ingestText.badMap : key === 'set' ? ingestText.badSet : ingestText.badScale;
        if (text !== '-' && !existsSync(text)) throw usageError(bad(text));
        stray.push(text);
        return false;
      });
    }
    const file = args.mapping ? readMappingFile(args.mapping) : { map: {}, set: {}, scale: {}, seedFrom: undefined };
    const map: Record<string, string> = { ...file.map, ...Object.fromEntries(pairs(args.map, ingestText.badMap)) };
    for (const t of Object.keys(map)) if (!MAP_TARGETS.includes(t)) throw usageError(ingestText.badMapTarget(t, MAP_TARGETS.join(', ')));
    const set: Record<string, string> = { ...file.set, ...Object.fromEntries(pairs(args.set, ingestText.badSet)) };
    for (const [k, v] of Object.entries(set)) {
      if (NUMERIC_SET.includes(k) && !Number.isFinite(Number(v))) throw usageError(ingestText.badSetValue(k, v));
    }
    const scale: Record<string, string> = { ...file.scale, ...Object.fromEntries(pairs(args.scale, ingestText.badScale)) };
    for (const [k, v] of Object.entries(scale)) if (!SCALE_TARGETS.includes(k) || (v !== 'percent' && v !== 'fraction')) throw usageError(ingestText.badScale(`${k}=${v}`));
    const seedText = args.seedFrom ?? file.seedFrom;
    let seedFrom: RegExp | undefined;
    if (seedText !== undefined) {
      try {
        seedFrom = new RegExp(seedText);
      } catch (err) {
        throw usageError(ingestText.badSeedFrom(seedText, (err as Error).message));
      }
    }
    if (!Number.isFinite(args.wait) || args.wait < 0) throw usageError(`--wait expects seconds >= 0, got '${args.wait}'`);
    const limits: Partial<ReadLimits> = {};
    for (const [flag, key, v] of [['--max-line', 'maxLine', args.maxLine], ['--max-fields', 'maxFields', args.maxFields], ['--max-text', 'maxText', args.maxText]] as const) {
      if (v === undefined) continue;
      if (!Number.isInteger(v) || v < 1) throw usageError(ingestText.badLimit(flag, String(v)));
      limits[key] = v;
    }
    let keys: string[] | undefined;
    if (args.keys !== undefined) {
      keys = String(args.keys).split(',').map((k) => k.trim());
      if (keys.some((k) => k === '' || /[=\s]/.test(k))) throw usageError(layoutText.badKeys(String(args.keys)));
    }
    const given = [...(args.paths ?? []).map(String), ...stray];
    if (given.length === 0) throw usageError(ingestText.noPaths);
    // A grid spec named as a log would be read as a table of odd lines: say what it is instead.
    const specs = await specFiles(given);
    if (specs.length === given.length) throw new UserError(ingestText.gridSpecGiven(specs[0]));
    for (const s of specs) if (!args.quiet) process.stderr.write(`note: ${ingestText.gridSpecSkipped(s)}\n`);
    const paths = given.filter((p) => !specs.includes(p));

    // Never a silent wait: `-` with nothing piped in reads what is typed.
    if (paths.includes('-') && process.stdin.isTTY && !args.quiet) process.stderr.write(`${ingestText.stdinTerminal}\n`);
    const { ingestSources } = await import('../ingest/ingestSources.js');
    const r = await ingestSources({
      paths,
      store: args.store,
      map: map as Partial<Record<Target, string>>,
      set,
      seedFrom,
      scale: scale as Partial<Record<Target, Scale>>,
      strict: args.strict,
      wait: args.wait,
      keys,
      condition: args.condition,
      limits,
      progress: (total) => progressBar({ label: 'ingest', total, quiet: args.quiet, minTotal: 300, stage: 'reading logs' }),
    });
    const err = (line: string) => {
      if (!args.quiet) process.stderr.write(`${line}\n`);
    };
    for (const note of r.notes) err(`note: ${note}`);
    if (r.sources === 0) {
      const first = r.skippedSources[0];
      if (r.missing.length) throw new UserError(ingestText.cannotOpen(first.path, first.reason));
      throw new UserError(ingestText.nothingFound(paths.join(' ')) + (first ? ` (${ingestText.skippedSource(first.path, first.reason)}${r.skippedSources.length > 1 ? `, and ${r.skippedSources.length - 1} more` : ''})` : ''));
    }

    if (args.json) {
      const { ingestSummary } = await import('../api/ingest.js');
      process.stdout.write(`${JSON.stringify(ingestSummary(r, args.store))}\n`);
    } else {
      const out: string[] = [];
      out.push(r.read === 0 && r.unchanged === r.sources ? ingestText.noChange : ingestText.summary(r));
      out.push(ingestText.sourcesLine(r.sources, r.unchanged, r.failed));
      if (r.conflicts) out.push(ingestText.conflictsLine(r.conflicts, r.displaced));
      const shown = r.rejects.slice(0, 5);
      for (const x of shown) out.push(ingestText.rejectedLine(x));
      if (r.rejects.length > shown.length) out.push(ingestText.moreRejected(r.rejects.length - shown.length, `${args.store}/rejected.csv`));
      out.push(ingestText.storeLine(args.store, r.storeRows, r.storeSources));
      out.push(...layoutLines(r.layouts));
      process.stdout.write(`${out.join('\n')}\n`);
    }
    if (r.strictFailed) throw new UserError(ingestText.strictFailed(r.rejected));
    if (r.failed > 0 && r.failed === r.sources - r.unchanged && r.accepted === 0 && r.duplicates === 0) {
      // Self-contained: under --json or --quiet no reason was printed above it.
      const first = r.rejects.find((x) => x.line === 0) ?? r.rejects[0];
      throw new UserError(ingestText.nothingReadWhy(r.failed, first ? `${first.source === '-' ? 'stdin' : first.source}: ${first.reason}` : ''));
    }
    // Sources were read but not one row was taken: the work failed (a folder of reports, a spec).
    if (r.unchanged < r.sources && r.accepted === 0 && r.duplicates === 0 && r.displaced === 0)
      throw new UserError(ingestText.nothingAccepted(r.read, r.rejected, args.store));
    return 0;
  },
};

/** Per distinct layout: canonical ← source (alternatives passed over), structure, conditions with run counts. */
function layoutLines(groups: import('../ingest/groupLayouts.js').LayoutGroup[]): string[] {
  const out: string[] = [];
  for (const g of groups.slice(0, 8)) {
    out.push(layoutText.layoutHead(g.sources, g.example));
    const order = (t: string) => { const i = (TARGETS as readonly string[]).indexOf(t); return i < 0 ? 99 : i; };
    const targets = Object.keys(g.mapping).sort((a, b) => order(a) - order(b));
    for (const t of targets) out.push(layoutText.mappingLine(t, g.mapping[t], g.passedOver[t] ?? []));
    for (const s of g.structure) out.push(`  ${s}`);
    const conds = Object.entries(g.conditions);
    const shown = conds.slice(0, 6).map(([c, n]) => layoutText.conditionRuns(c, n)).join('; ');
    out.push(layoutText.conditionsLine(conds.length, conds.length > 6 ? `${shown}; …` : shown));
  }
  if (groups.length > 8) out.push(layoutText.moreLayouts(groups.length - 8));
  return out;
}
