/**
 * Column names ingest recognises, per canonical target. Matching ignores case, spaces and
 * punctuation (`Test Err`, `test-err` and `test_err` are one name). Earlier entries win when a
 * log carries several synonyms of one target (`test_error` beats `val_error`).
 */
export const TARGETS = [
  'run',
  'seed',
  'width',
  'epochs',
  'train_size',
  'label_noise',
  'test_error',
  'train_error',
  'test_loss',
  'train_loss',
  'test_accuracy',
  'train_accuracy',
  'wall_seconds',
  'status',
  'condition',
  'params',
] as const;
export type Target = (typeof TARGETS)[number];

export const SYNONYMS: Record<Target, readonly string[]> = {
  run: ['run', 'run_id', 'run_name', 'job_id', 'trial', 'trial_id'],
  seed: ['seed', 'random_seed', 'rng_seed', 'replicate', 'repeat'],
  width: ['width', 'k', 'hidden', 'hidden_size', 'hidden_dim', 'hidden_units', 'hidden_neurons', 'num_hidden_units', 'n_hidden',
    'num_hidden', 'hidden_layer_size', 'hidden_width', 'n_units', 'num_units', 'channels', 'n_features', 'num_features',
    'features', 'model_width', 'units', 'neurons', 'd_model', 'w', 'p'],
  epochs: ['epochs', 'epoch', 'step', 'steps', 'iteration', 'iterations', 'iter', 't'],
  train_size: ['train_size', 'n', 'n_train', 'num_samples', 'n_samples', 'num_train', 'train_samples', 'samples', 'dataset_size', 'ntrain'],
  label_noise: ['label_noise', 'noise', 'noise_level', 'label_corruption', 'corruption', 'noise_rate', 'flip_prob'],
  test_error: ['test_error', 'test_err', 'err_test', 'test_error_rate', 'error', 'top1_error', 'val_error', 'val_err', 'valid_error'],
  train_error: ['train_error', 'train_err', 'err_train', 'training_error', 'train_error_rate'],
  test_loss: ['test_loss', 'loss_test', 'test_mse', 'test_risk', 'risk', 'mse', 'val_loss', 'valid_loss'],
  train_loss: ['train_loss', 'loss_train', 'training_loss', 'train_mse', 'train_risk'],
  test_accuracy: ['test_accuracy', 'test_acc', 'acc_test', 'accuracy', 'acc', 'top1', 'top1_acc', 'val_accuracy', 'val_acc'],
  train_accuracy: ['train_accuracy', 'train_acc', 'acc_train', 'training_accuracy'],
  wall_seconds: ['wall_seconds', 'wall_time', 'wall', 'elapsed', 'elapsed_seconds', 'seconds', 'time', 'runtime', 'time_s'],
  status: ['status', 'state'],
  condition: ['condition'],
  // A parameter count is its own column: it never stands in for width unless a sweep has no width.
  params: ['params', 'n_params', 'num_params', 'param_count', 'parameters', 'num_parameters', 'n_parameters', 'parameter_count',
    'model_size', 'nparams'],
};

/** The matching key of a name: lower case, letters and digits only. */
export function nameKey(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

const LOOKUP = new Map<string, { target: Target; rank: number }>();
for (const t of TARGETS) {
  SYNONYMS[t].forEach((s, rank) => {
    const k = nameKey(s);
    if (!LOOKUP.has(k)) LOOKUP.set(k, { target: t, rank });
  });
}

/**
 * The canonical target a source column name stands for, with its rank (lower = better), or
 * null. Dotted paths (`metrics.test_acc`) match on the whole path first, then on the last part.
 */
export function matchTarget(name: string): { target: Target; rank: number } | null {
  const whole = LOOKUP.get(nameKey(name));
  if (whole) return whole;
  const dot = name.lastIndexOf('.');
  if (dot >= 0) {
    // The split one level up (`metrics.train.acc`, `test.loss`): the last two parts as one name, before the last alone.
    const dot2 = name.lastIndexOf('.', dot - 1);
    const two = LOOKUP.get(nameKey(name.slice(dot2 + 1)));
    if (two) return { target: two.target, rank: two.rank + 100 };
    const last = LOOKUP.get(nameKey(name.slice(dot + 1)));
    if (last) return { target: last.target, rank: last.rank + 100 };
  }
  // A plural of a synonym (`widths`, `test_errors`, `test_losses`, `seeds`): lists named for what they hold.
  const k = nameKey(dot >= 0 ? name.slice(dot + 1) : name);
  const plural = k.length > 3 && k.endsWith('s') ? LOOKUP.get(k.slice(0, -1)) ?? (k.endsWith('es') ? LOOKUP.get(k.slice(0, -2)) : undefined) : undefined;
  if (plural) return { target: plural.target, rank: plural.rank + 150 };
  return matchWords(dot >= 0 ? name.slice(dot + 1) : name);
}

/** The words of a column name: `Hidden Neurons`, `numHiddenUnits`, `n-hidden` → hidden, neurons... */
export function nameWords(name: string): string[] {
  return name.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase().split(/[^a-z0-9]+/).filter((w) => w !== '');
}

const SIZE_WORDS = new Set(['units', 'unit', 'neurons', 'neuron', 'size', 'dim', 'width', 'nodes', 'layer']);
const PARAM_WORDS = new Set(['params', 'param', 'parameters', 'parameter', 'weights']);
const COUNT_WORDS = new Set(['n', 'num', 'number', 'count', 'total', 'of', 'model', 'trainable', 'nb']);

/**
 * Matching by words when no synonym matched: a name of hidden-layer words (`Hidden Neurons`,
 * `number of hidden units`) is width, a name of count and parameter words (`Number of Parameters`)
 * is params. Ranked after every synonym.
 */
function matchWords(name: string): { target: Target; rank: number } | null {
  const words = nameWords(name);
  if (words.length === 0) return null;
  if (words.includes('hidden') && words.every((w) => w === 'hidden' || SIZE_WORDS.has(w) || COUNT_WORDS.has(w))) return { target: 'width', rank: 200 };
  if (words.some((w) => PARAM_WORDS.has(w)) && words.every((w) => PARAM_WORDS.has(w) || COUNT_WORDS.has(w))) return { target: 'params', rank: 200 };
  return null;
}

/** Metric targets (what a run measures, as opposed to its settings). */
export const METRIC_TARGETS: readonly Target[] = ['test_error', 'train_error', 'test_loss', 'train_loss', 'test_accuracy', 'train_accuracy'];

/** Whether a canonical target is an error or accuracy (a fraction that logs may write in percent). */
export function isFractionTarget(t: Target): boolean {
  return t === 'test_error' || t === 'train_error' || t === 'test_accuracy' || t === 'train_accuracy' || t === 'label_noise';
}
