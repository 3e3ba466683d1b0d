import { describe, expect, it } from 'vitest';
import { isDerived, isOutcome, isSummaryName, outcomeMetric } from '../../src/ingest/fieldKinds.js';
import { matchTarget } from '../../src/ingest/synonyms.js';

describe('run-level outcomes never split conditions', () => {
  it('final_, best_, last_, min_, max_ prefixes, timings, ranks, metric names', () => {
    for (const n of ['final_test_acc', 'best_epoch', 'last_train_loss', 'min_val_loss', 'max_test_acc', 'wallclock_sec', 'train_time', 'effective_rank', 'test_acc', 'config.runtime_seconds']) {
      expect(isOutcome(n), n).toBe(true);
    }
  });
  it('settings are not outcomes', () => {
    for (const n of ['lr', 'optimizer', 'weight_decay', 'config.batch_size', 'depth']) expect(isOutcome(n), n).toBe(false);
  });
  it('final_/last_ name the metric they hold', () => {
    expect(outcomeMetric('final_test_acc')).toEqual({ prefix: 'final', target: 'test_accuracy' });
    expect(outcomeMetric('last_train_loss')).toEqual({ prefix: 'last', target: 'train_loss' });
    expect(outcomeMetric('best_test_err')).toEqual({ prefix: 'best', target: 'test_error' });
    expect(outcomeMetric('final_lr')).toBeNull();
  });
  it('summaries over seeds and derived values', () => {
    expect(isSummaryName('test_acc_mean')).toBe(true);
    expect(isSummaryName('test_err_std')).toBe(true);
    expect(isSummaryName('mean')).toBe(false);
    expect(isDerived('p_over_n')).toBe(true);
    expect(isDerived('p/n')).toBe(true);
    expect(isDerived('lr')).toBe(false);
  });
});

describe('column names matched by words', () => {
  it('hidden-layer words are width; parameter counts are params, never width', () => {
    for (const n of ['Hidden Neurons', 'num hidden units', 'n_hidden', 'hidden_layer_size', 'Number of hidden units', 'numHiddenUnits']) expect(matchTarget(n)?.target, n).toBe('width');
    for (const n of ['Parameters', 'n_params', 'num_params', 'param_count', 'Number of Parameters', 'trainable params']) expect(matchTarget(n)?.target, n).toBe('params');
  });
});

describe('identifiers and places never split conditions', () => {
  it('directories, paths, ids, checkpoints; path-like values', async () => {
    const { isNotCondition } = await import('../../src/ingest/fieldKinds.js');
    for (const n of ['save_dir', 'data_path', 'output_dir', 'run_id', 'checkpoint', 'args.log_dir', 'timestamp', 'git_sha', 'slurm_job_id']) expect(isNotCondition(n), n).toBe(true);
    expect(isNotCondition('out', './runs/w8_s0')).toBe(true);
    for (const n of ['optimizer', 'dataset_name', 'model_name', 'lr', 'schedule']) expect(isNotCondition(n, 'adam'), n).toBe(false);
  });
});

describe('plurals of synonyms', () => {
  it('lists named for what they hold', () => {
    expect(matchTarget('widths')?.target).toBe('width');
    expect(matchTarget('test_errors')?.target).toBe('test_error');
    expect(matchTarget('test_losses')?.target).toBe('test_loss');
    expect(matchTarget('seeds')?.target).toBe('seed');
    expect(matchTarget('train_accs')?.target).toBe('train_accuracy');
    expect(matchTarget('epochs')?.target).toBe('epochs');
  });
});
