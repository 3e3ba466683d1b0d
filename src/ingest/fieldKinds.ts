/**
 * What a field of a log is, beyond the canonical columns: a setting of the run (a condition
 * candidate) or an outcome of it (measured once per run: final or best values, timings, ranks).
 * Outcomes never split a sweep into conditions; they are kept as extra per-run columns.
 */
import { matchTarget, METRIC_TARGETS, nameKey, nameWords } from './synonyms.js';
import type { Target } from './synonyms.js';

/** Config prefixes whose keys describe the run (condition), not a per-row measurement. */
export const CONFIG_PREFIXES = new Set(['config', 'cfg', 'hparams', 'hyperparameters', 'args', 'params', 'settings', 'conf']);

/** Keys that identify or time-stamp a run; they never split the sweep into conditions. */
export const NOT_CONDITION = new Set(['name', 'id', 'runname', 'experiment', 'exp', 'expname', 'path', 'dir', 'outdir', 'outputdir',
  'logdir', 'output', 'date', 'timestamp', 'datetime', 'host', 'hostname', 'node', 'commit', 'gitcommit', 'githash', 'git', 'user',
  'created', 'createdat', 'started', 'startedat', 'finished', 'finishedat', 'device', 'gpu', 'version', 'pid', 'jobname', 'slurmjobid',
  'index', 'runkey']);

/** Last words of keys that name where a run lives or who it is (`save_dir`, `data_path`, `run_name`). */
const PLACE_WORDS = new Set(['dir', 'directory', 'path', 'file', 'filename', 'folder', 'id', 'root', 'url', 'uri',
  'checkpoint', 'ckpt', 'log', 'logs', 'host', 'hostname', 'date', 'time', 'timestamp', 'uuid', 'hash', 'sha', 'commit', 'user', 'started',
  'finished', 'created', 'pid']);

/** Whether a key identifies or places a run rather than configuring it: never a condition. */
export function isNotCondition(name: string, value?: unknown): boolean {
  if (NOT_CONDITION.has(nameKey(name))) return true;
  const words = nameWords(name.slice(name.lastIndexOf('.') + 1));
  if (words.length > 0 && PLACE_WORDS.has(words[words.length - 1])) return true;
  // A file path as a value (`./runs/w8_s0`, `C:\\data`) differs per run: a place, not a setting.
  return typeof value === 'string' && /[/\\]/.test(value) && !/^\s*[-+]?\d/.test(value);
}

/** Prefixes of run-level outcomes (`final_test_acc`, `best_epoch`, `min_val_loss`). */
export const OUTCOME_PREFIXES = ['final', 'best', 'last', 'min', 'max', 'peak', 'top', 'end'] as const;
/** Words of timings and ranks measured once per run (`wallclock_sec`, `train_time`, `effective_rank`). */
const OUTCOME_WORDS = new Set(['time', 'sec', 'secs', 'seconds', 'wallclock', 'walltime', 'duration', 'runtime', 'elapsed', 'rank',
  'hours', 'minutes', 'mins', 'throughput', 'memory', 'mem', 'flops', 'norm', 'converged', 'diverged', 'stopped']);
/** Suffixes of statistics over seeds (a block of summaries, not runs). */
export const SUMMARY_SUFFIXES = ['mean', 'std', 'sem', 'ci', 'stderr', 'se', 'var', 'median', 'ci95', 'low', 'high', 'lo', 'hi', 'sd'];

/** The last part of a dotted path, without config prefixes. */
export function conditionKey(name: string): string {
  const parts = name.split('.');
  while (parts.length > 1 && CONFIG_PREFIXES.has(nameKey(parts[0]))) parts.shift();
  return parts.join('.');
}

export const hasConfigPrefix = (name: string): boolean => name.includes('.') && CONFIG_PREFIXES.has(nameKey(name.split('.')[0]));

/** The metric a `final_*` / `last_*` / `best_*` name stands for, with its prefix, or null. */
export function outcomeMetric(name: string): { prefix: string; target: Target } | null {
  const last = name.slice(name.lastIndexOf('.') + 1);
  const m = /^(final|last|best|end)[_\- ]?(.+)$/i.exec(last);
  if (!m) return null;
  const t = matchTarget(m[2]);
  return t && METRIC_TARGETS.includes(t.target) ? { prefix: m[1].toLowerCase(), target: t.target } : null;
}

/** Whether a field is a run-level outcome (never a condition). */
export function isOutcome(name: string): boolean {
  const last = conditionKey(name);
  const words = nameWords(last);
  if (words.length === 0) return false;
  if ((OUTCOME_PREFIXES as readonly string[]).includes(words[0]) && words.length > 1) return true;
  if (words.some((w) => OUTCOME_WORDS.has(w))) return true;
  if (SUMMARY_SUFFIXES.includes(words[words.length - 1]) && words.length > 1) return true;
  const t = matchTarget(last);
  return t !== null && (METRIC_TARGETS.includes(t.target) || t.target === 'wall_seconds');
}

/** Whether a field is a statistic over seeds (`test_acc_mean`, `err_std`). */
export function isSummaryName(name: string): boolean {
  const words = nameWords(name.slice(name.lastIndexOf('.') + 1));
  return words.length > 1 && SUMMARY_SUFFIXES.includes(words[words.length - 1]);
}

/** Whether a field is computed from the axes (`p_over_n`, `params_per_sample`, `p/n`): never a condition. */
export function isDerived(name: string): boolean {
  if (name.includes('/')) return true;
  const words = nameWords(name);
  return words.includes('over') || words.includes('ratio') || words.includes('per');
}
