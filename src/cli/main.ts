import yargs from 'yargs';
import type { Argv } from 'yargs';
import { UserError, usageError } from '../UserError.js';
import { general } from '../messages.js';
import type { CommandSpec } from './CommandSpec.js';
import { fsErrorText } from './fsErrorText.js';
import { nearestName } from '../nearestName.js';
import { guardOutput } from './terminalSafe.js';

/**
 * Command registry. Each entry loads its module only when that command runs (or its --help is
 * asked for), so `datlas --help` never pays for heavy imports. Keep one line per command.
 * `CommandSpec<any>`: each command types its own arguments; the registry only passes yargs'
 * parsed object through, so it erases them on purpose.
 */
const COMMANDS: Record<string, { describe: string; load: () => Promise<{ command: CommandSpec<any> }> }> = {
  // registry:start (one line per command, keep alphabetical)
  coverage: { describe: 'which planned runs are complete, partial, missing or diverged', load: () => import('./coverage.js') },
  describe: { describe: 'what the store holds: axes, seeds, conditions, metrics, column sources', load: () => import('./describe.js') },
  demo: { describe: 'the whole pipeline on the built-in demo sweep: ingest, spec with gaps, report, plan', load: () => import('./demo.js') },
  hurts: { describe: 'train-size ranges where more data raises test error', load: () => import('./hurts.js') },
  ingest: { describe: 'merge run logs into the store', load: () => import('./ingest.js') },
  map: { describe: 'a map of test error over two axes, interpolated, with leave-one-out error', load: () => import('./map.js') },
  plan: { describe: 'rank the next runs (gaps, new widths, extra seeds) within a budget; export csv/json/shell/slurm', load: () => import('./plan.js') },
  report: { describe: 'group-meeting report: PDF deck, self-contained HTML page and PNGs', load: () => import('./report.js') },
  ridge: { describe: 'the double-descent peak per map row, with interval and threshold', load: () => import('./ridge.js') },
  simulate: { describe: 'simulate a double-descent sweep and write its run logs', load: () => import('./simulate.js') },
  // registry:end
};

function globalOptions(y: Argv): Argv {
  return y
    .option('json', { type: 'boolean', default: false, describe: 'machine-readable JSON on stdout' })
    .option('quiet', { type: 'boolean', default: false, describe: 'no progress or notes on stderr' })
    .option('debug', { type: 'boolean', default: false, describe: 'show stack traces of internal errors' });
}

/** The part of yargs' internal API that lays out the help text ahead of need. */
interface HelpCache {
  getInternalMethods?: () => { getUsageInstance?: () => { cacheHelpMessage?: () => void } };
}

function base(args: string[]): Argv {
  // yargs lays out the help text on every command run (to have it ready should the handler
  // fail); wrapping that text to the terminal costs ~30 ms of start-up, so wrap only when help is
  // asked for. Usage errors print one line of ours, never the help.
  const wantsHelp = args.includes('--help') || args.includes('-h') || args.length === 0 || args.every((a) => a.startsWith('-'));
  const y = yargs(args);
  if (!wantsHelp) {
    // Even unwrapped, that layout costs ~17 ms of every run (a fifth of a re-ingest of unchanged
    // files); a run that did not ask for help never shows it, so it is not made.
    const usage = (y as unknown as HelpCache).getInternalMethods?.().getUsageInstance?.();
    if (usage?.cacheHelpMessage) usage.cacheHelpMessage = () => undefined;
  }
  return globalOptions(y)
    .scriptName('datlas')
    .usage('$0 <command> [options]\n\nMaps of test error over capacity sweeps: double-descent peaks, missing runs, next runs.')
    .strict()
    .help()
    .alias('h', 'help')
    .version(false)
    .wrap(wantsHelp ? Math.min(100, process.stdout.columns || 100) : null);
}

/** The option names a parsed command knows (yargs' own list, kebab-case spellings and aliases). */
function knownFlags(y: unknown): string[] {
  // yargs' instance method (not in its type declarations): the options of the command being parsed.
  const o = (y as { getOptions?: () => { key?: Record<string, unknown>; alias?: Record<string, string[]>; hiddenOptions?: string[] } }).getOptions?.();
  if (!o?.key) return [];
  // Hidden options and aliases (old spellings) are never suggested: the canonical name is.
  const skip = new Set([...(o.hiddenOptions ?? []), ...Object.values(o.alias ?? {}).flat(), 'version', '$0']);
  return Object.keys(o.key).filter((k) => !skip.has(k) && !/[A-Z]/.test(k));
}

/** yargs' "Unknown argument(s): a, b" with the nearest known flag for each, when one is near. */
function suggestFlags(msg: string, y: unknown, args: string[]): string {
  const m = /^Unknown arguments?: (.+)$/.exec(msg.trim());
  if (!m) return msg;
  const known = knownFlags(y);
  const names = m[1].split(', ');
  // A stray word (not an option) is named as typed, with nothing to suggest.
  const words = names.filter((a) => args.includes(a));
  const parts = names
    .filter((a) => !words.includes(a))
    .map((a) => {
      const dash = args.includes(`-${a}`) ? '-' : '--';
      const near = nearestName(a, known);
      return near ? general.unknownFlag(`${dash}${a}`, near) : `${dash}${a}`;
    });
  return [parts.length ? general.unknownFlags(parts) : '', words.length ? general.unexpectedWords(words) : ''].filter(Boolean).join('; ');
}

/**
 * `-` (stdin, DESIGN.md §6) as yargs would drop it: its parser reads a lone `-` as an empty group
 * of short flags, so `ingest -` got no path and `--spec -` an unknown argument. It crosses the
 * parser as this token (no argument from a shell can hold a NUL) and is given back before the
 * command runs.
 */
const DASH = '\u0000-';
const restoreDash = (v: unknown): unknown => (v === DASH ? '-' : Array.isArray(v) ? v.map(restoreDash) : v);
function withDash(argv: Record<string, unknown>): Record<string, unknown> {
  for (const k of Object.keys(argv)) argv[k] = restoreDash(argv[k]);
  return argv;
}

/** Runs the CLI and returns the exit code. Never throws. Text it prints has control characters escaped (terminalSafe). */
export async function main(argsGiven: string[]): Promise<number> {
  const unguard = guardOutput();
  try {
    return await runMain(argsGiven);
  } finally {
    unguard();
  }
}

async function runMain(argsGiven: string[]): Promise<number> {
  const end = argsGiven.indexOf('--');
  let args = argsGiven.map((a, i) => (a === '-' && (end < 0 || i < end) ? DASH : a));
  const debug = args.includes('--debug');
  const name = args.find((a) => !a.startsWith('-'));
  // `datlas` alone: the command list (the help), not an error.
  if (args.length === 0) args = ['--help'];
  if (!name && (args.includes('--version') || args.includes('-v'))) {
    const { packageVersion } = await import('./packageInfo.js');
    process.stdout.write(`${general.version('datlas', packageVersion())}\n`);
    return 0;
  }
  let failure: { message: string; code: number } | null = null;
  let code = 0;
  try {
    // A usage error must stop yargs before any handler runs: returning from fail() lets it go on.
    let y: Argv = base(args).fail((msg, err) => {
      if (err) throw err;
      const text = suggestFlags(String(msg).split(DASH).join('-').replace(/\s*\n\s*/g, ' '), y, args);
      failure = { message: text, code: 2 };
      throw usageError(text);
    });
    if (name && COMMANDS[name]) {
      const { command } = await COMMANDS[name].load();
      y = y.command(
        command.usage,
        command.describe,
        (b) => command.builder(b).example(`$0 ${command.example[0]}`, command.example[1]),
        async (argv) => {
          code = await command.run(withDash(argv) as never);
        },
      );
    } else {
      for (const [cmd, { describe }] of Object.entries(COMMANDS)) y = y.command(cmd, describe);
      y = y.demandCommand(1, `${general.commandList} ${Object.keys(COMMANDS).join(', ')}`);
      if (name) {
        process.stderr.write(`datlas: ${general.unknownCommand(name, nearestName(name, Object.keys(COMMANDS)))}\n`);
        return 2;
      }
    }
    await y.parseAsync();
    if (failure) {
      const f = failure as { message: string; code: number };
      process.stderr.write(`datlas: ${f.message}\n`);
      return f.code;
    }
    return code;
  } catch (err) {
    if (err instanceof UserError) {
      process.stderr.write(`datlas: ${err.message}\n`);
      return err.exitCode;
    }
    const e = err as Error;
    const fsText = fsErrorText(err);
    if (fsText) {
      process.stderr.write(`datlas: ${fsText}\n`);
      if (debug && e?.stack) process.stderr.write(`${e.stack}\n`);
      return 1;
    }
    process.stderr.write(`datlas: ${general.internal(e?.message ?? String(err))}\n`);
    if (debug && e?.stack) process.stderr.write(`${e.stack}\n`);
    return 1;
  }
}
