import type { Argv } from 'yargs';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { MapKind } from '../grid/SweepMap.js';
import { analysisText as t } from '../messages.js';
import type { Metric } from '../store/RowTable.js';
import { usageError } from '../UserError.js';
import { correctionName } from '../analysis/correctionName.js';
import type { CommandSpec } from './CommandSpec.js';
import { parseAt } from './parseAt.js';
// The --json object is the library's (findRidge in src/api), so the two cannot drift.
import { ridgeJson } from '../api/ridgeJson.js';

interface RidgeArgs {
  kind: MapKind;
  at?: string[];
  metric?: Metric;
  minProminence: number;
  boot: number;
  epsilon: number;
  alpha: number;
  seed: number;
  store: string;
  minExtent: number;
  correction: string;
}

/** Rejects non-finite or out-of-range numbers with a usage error naming the flag. */
export function checkNumber(flag: string, v: number, ok: (v: number) => boolean, what: string): void {
  if (!Number.isFinite(v) || !ok(v)) throw usageError(t.badNumber(flag, String(v), what));
}

function ridgeText(r: RidgeResult): string {
  const lines = [t.ridgeHeader(r.map, r.metric, r.x, r.y, r.fixed)];
  const curveRows = r.rows.filter((row) => row.noiseFrom === 'curve').length;
  if (curveRows > 0) lines.push(t.ridgeCurveNoise(curveRows, r.rows.length));
  const smoothRows = r.rows.filter((row) => row.model === 'smoothed-curve').length;
  if (smoothRows > 0) lines.push(t.ridgeCurveModel(smoothRows, r.minExtent ?? 0.25));
  for (const row of r.rows) {
    const mark = row.noiseFrom === 'curve' ? '* ' : '';
    if (row.peak) {
      const p = row.peak;
      lines.push(mark + t.ridgePeak({ y: r.y, yv: row.y, x: r.x, px: p.x, low: p.low, high: p.high, level: r.level ?? 0.95, metric: r.metric, error: p.error, prominence: p.prominence, z: p.prominenceSe }));
      const pLine = t.ridgeP(p.p, r.correction === 'benjamini-hochberg' ? p.pAdjusted : undefined);
      if (pLine) lines.push(pLine);
      if (p.smoothed) lines.push(t.ridgeSmoothed(row.bandwidth ?? NaN, p.rise ?? NaN, p.fall ?? NaN));
      for (const o of row.others) lines.push(t.ridgeOther(r.x, o.x, o.prominence, o.prominenceSe));
    } else {
      const bump = row.insideNoise;
      const alpha = r.alpha ?? 0.05;
      const correctedAway = bump && bump.p !== undefined && bump.pAdjusted !== undefined && bump.prominenceSe >= r.minProminence && bump.p < alpha && !(bump.pAdjusted < alpha);
      lines.push(
        mark +
          t.ridgeNone(r.y, row.y) +
          (correctedAway
            ? t.ridgeCorrectedAway(r.x, bump.cellX, bump.prominenceSe, bump.p!, bump.pAdjusted!, alpha)
            : bump
              ? t.ridgeInsideNoise(r.x, bump.cellX, bump.prominence, bump.prominenceSe, r.minProminence, bump.p, r.alpha)
              : ''),
      );
    }
    lines.push(t.ridgeThreshold(r.x, row.threshold, r.epsilon, row.ratio, row.thresholdAtEdge));
  }
  const withPeak = r.rows.filter((x) => x.peak).length;
  lines.push(
    r.correction === 'benjamini-hochberg' && (r.rowsScanned ?? 0) > 1
      ? t.ridgeSummaryCorrected(withPeak, r.rowsScanned ?? r.rows.length, r.alpha ?? 0.05)
      : t.ridgeSummary(withPeak, r.rows.length),
  );
  return lines.join('\n');
}

export const command: CommandSpec<RidgeArgs> = {
  usage: 'ridge',
  describe: 'locate the double-descent peak per map row, with interval, prominence and interpolation threshold',
  example: ['ridge --kind model --at label_noise=0.2', 'per epoch budget, the width where test error peaks (with a bootstrap interval over seeds)'],
  builder: (y: Argv) =>
    y
      .option('kind', { type: 'string', choices: ['model', 'sample', 'epoch'], default: 'model', describe: 'model: x width, y epochs; sample: x train_size, y width; epoch: x epochs, y train_size' })
      .option('at', { type: 'string', array: true, describe: 'fix an axis: axis=value (repeat, or comma-separate); unset axes take the value with most data' })
      .option('metric', { type: 'string', choices: ['test_error', 'test_loss', 'train_error', 'train_loss'], describe: 'metric to find the peak of (default test_error, else test_loss)' })
      .option('min-prominence', { type: 'number', default: 2, describe: 'peak height over the higher flanking dip, in pooled standard errors' })
      .option('alpha', { type: 'number', default: 0.05, describe: 'search-wide level: a peak must beat the tallest bump pure noise makes along the row (1 = off)' })
      .option('boot', { type: 'number', default: 1000, describe: 'bootstrap rounds for the location interval (resampling seeds per cell)' })
      .option('seed', { type: 'number', default: 1, describe: 'random seed of the bootstrap' })
      .option('min-extent', { type: 'number', default: 0.25, describe: 'one value per point (one seed, or means): smallest rise and fall of a peak along the smoothed curve, in octaves at half height' })
      .option('correction', { type: 'string', default: 'benjamini-hochberg', describe: 'across rows: benjamini-hochberg (bh for short; false discovery rate at --alpha) or none (each row alone)' })
      .option('epsilon', { type: 'number', default: 0.01, describe: 'train error at or below which the interpolation threshold is reached' })
      .option('store', { type: 'string', default: 'atlas-store', describe: 'store directory' }),
  async run(args) {
    if (!(['model', 'sample', 'epoch'] as string[]).includes(args.kind)) throw usageError(t.badKind(String(args.kind)));
    checkNumber('--min-prominence', args.minProminence, (v) => v >= 0, 'a number >= 0');
    checkNumber('--alpha', args.alpha, (v) => v > 0 && v <= 1, 'a level in (0, 1]');
    checkNumber('--boot', args.boot, (v) => v >= 0 && v <= 1e6 && Number.isInteger(v), 'a whole number of rounds (0 to 1,000,000)');
    checkNumber('--epsilon', args.epsilon, (v) => v >= 0, 'a train error >= 0');
    checkNumber('--seed', args.seed, Number.isInteger, 'a whole number');
    checkNumber('--min-extent', args.minExtent, (v) => v > 0 && v <= 8, 'octaves, a number in (0, 8]');
    const correction = correctionName(args.correction);
    const at = parseAt(args.at);
    const { readStore } = await import('../store/readStore.js');
    const { buildMap } = await import('../grid/buildMap.js');
    const { findRidge } = await import('../analysis/findRidge.js');
    const { axisSource } = await import('../ingest/axisSource.js');
    const { table, manifest } = await readStore(args.store);
    (await import('../store/assertRows.js')).assertRows(table, args.store);
    // The ridge reads the measured cells only: the cheapest interpolator on a small raster suffices.
    // Every logged epoch up to 10,000 (the map's default keeps 100): a single-seed epoch-wise log is
    // a curve of thousands of points, and the curve model smooths and tests on all of them.
    const map = buildMap(table, { kind: args.kind, at, metric: args.metric, method: 'linear', raster: { nx: 16, ny: 16 }, maxEpochs: 10_000 });
    const ridge = findRidge(map, { minProminence: args.minProminence, boot: args.boot, seed: args.seed, epsilon: args.epsilon, alpha: args.alpha, minExtent: args.minExtent, correction });
    if (!args.quiet) {
      if (map.picked.length) process.stderr.write(`${t.picked(map.picked, map.fixed, map.pickedTies)}\n`);
      for (const note of map.notes ?? []) process.stderr.write(`${note}\n`);
    }
    if (args.json) process.stdout.write(`${JSON.stringify(ridgeJson(ridge, map))}\n`);
    else {
      // Axes read from another column say so: `width (p_over_n) ≈ 1.02`.
      const label = (name: string) => {
        const from = axisSource(manifest, name);
        return from === undefined ? name : `${name} (${from})`;
      };
      process.stdout.write(`${ridgeText({ ...ridge, x: label(ridge.x), y: label(ridge.y) })}\n`);
    }
    return 0;
  },
};
