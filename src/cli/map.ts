import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Argv } from 'yargs';
import { formatNumber } from '../formatNumber.js';
import type { CommandSpec } from './CommandSpec.js';
import { parseAt } from './parseAt.js';
import { mapMessages as msg, pickWhy, render as renderMsg } from '../messages.js';
import { usageError } from '../UserError.js';
import type { Metric } from '../store/RowTable.js';
import type { AxisScale, MapKind, MethodName, SweepMap } from '../grid/SweepMap.js';
import { COLOR_SCHEMES, DEFAULT_COLOR_SCHEME, isColorScheme } from '../render/colorSchemes.js';
import type { ColorScheme } from '../render/colorSchemes.js';

interface MapArgs {
  kind: MapKind;
  x?: string;
  y?: string;
  at?: string[];
  metric?: Metric;
  method: MethodName | 'auto';
  raster?: string;
  slices?: string;
  facet?: 'label_noise' | 'condition';
  colors: ColorScheme;
  'png-scale': number;
  'axis-scale'?: string[];
  /** Old spelling of --axis-scale (hidden). */
  scale?: string[];
  store: string;
  out: string;
  format: string;
  ridge: boolean;
}

/** Output formats this command writes: the map as JSON, and images (each with its vega-lite spec beside it). */
const FORMATS = ['json', 'png', 'svg', 'pdf'] as const;
type Format = (typeof FORMATS)[number];

function parseFormats(text: string): Format[] {
  const list = String(text).split(',').map((s) => s.trim()).filter(Boolean);
  for (const f of list) if (!(FORMATS as readonly string[]).includes(f)) throw usageError(msg.badFormat(f, FORMATS));
  if (list.length === 0) throw usageError(msg.badFormat(String(text), FORMATS));
  return [...new Set(list)] as Format[];
}

function parseRaster(text: string): { nx: number; ny: number } {
  const m = /^(\d+)(?:[x×](\d+))?$/.exec(String(text).trim());
  const nx = m ? Number(m[1]) : NaN;
  const ny = m ? Number(m[2] ?? m[1]) : NaN;
  if (!(nx >= 2 && nx <= 2048 && ny >= 2 && ny <= 2048)) throw usageError(msg.badRaster(String(text)));
  return { nx, ny };
}

function parseScales(values: string[] | undefined): Record<string, AxisScale> {
  const out: Record<string, AxisScale> = {};
  for (const raw of values ?? []) {
    for (const text of String(raw).split(',')) {
      const [name, scale] = text.split('=').map((s) => s.trim());
      if (!name || (scale !== 'log2' && scale !== 'linear')) throw usageError(msg.badScale(text));
      out[name] = scale;
    }
  }
  return out;
}

const fmt = (v: number) => formatNumber(v);

/** Human summary of a map: axes, fixed values (and which were picked), method and LOO error, cell counts. */
function summary(map: SweepMap, ridgeRows: { total: number; withPeak: number } | null, files: string[]): string[] {
  const axis = (a: SweepMap['x']) => `${a.name} (${a.scale}, ${a.values.length} value${a.values.length === 1 ? '' : 's'} ${fmt(a.values[0])}..${fmt(a.values[a.values.length - 1])})`;
  const lines = [`map ${map.kind}: ${map.metric} over ${axis(map.x)} × ${axis(map.y)}`];
  const fixed = Object.entries(map.fixed).map(([k, v]) => `${k}=${v === '' ? '""' : typeof v === 'number' ? fmt(v) : v}${map.picked.includes(k) ? ` (picked: ${pickWhy(map.pickedTies?.[k]).slice(2)}` : ''}`);
  lines.push(`fixed: ${fixed.join(', ') || 'nothing'}`);
  const tried = Object.entries(map.loo.tried).map(([m, r]) => `${m} ${fmt(r)}`).join(', ');
  lines.push(`method: ${map.method}, leave-one-out RMSE ${fmt(map.loo.rmse)} over ${map.loo.points ?? 0} cells (tried: ${tried})`);
  for (const why of Object.values(map.loo.skipped ?? {})) lines.push(`  ${why}`);
  const measured = map.cells.filter((c) => c.cell.stats.n > 0);
  const seeds = measured.map((c) => c.cell.stats.n).sort((a, b) => a - b);
  const grid = map.x.values.length * map.y.values.length;
  lines.push(`cells: ${measured.length} measured, ${map.missing.length} missing, ${map.diverged.length} with diverged runs (grid ${map.x.values.length}×${map.y.values.length} = ${grid})`);
  if (seeds.length) lines.push(`seeds per cell: ${seeds[0]}..${seeds[seeds.length - 1]} (median ${seeds[Math.floor(seeds.length / 2)]})`);
  const interp = map.raster.origin.reduce((s, o) => s + (o === 1 ? 1 : 0), 0);
  if (interp > 0) lines.push(`raster: ${map.raster.nx}×${map.raster.ny}, ${((100 * interp) / map.raster.origin.length).toFixed(1)}% of it interpolated over missing cells (origin codes in the file)`);
  if (ridgeRows) lines.push(`ridge: a peak in ${ridgeRows.withPeak} of ${ridgeRows.total} ${map.y.name} rows (datlas ridge for details)`);
  for (const note of map.notes ?? []) lines.push(`note: ${note}`);
  for (const f of files) lines.push(msg.wroteMap(f));
  return lines;
}

export const command: CommandSpec<MapArgs> = {
  usage: 'map',
  describe: 'a map of test error over two axes (others fixed), interpolated, with leave-one-out error',
  example: ['map --kind model --at label_noise=0.2 --out maps', 'width × epochs map at 20% label noise, written to maps/map-model.json'],
  builder: (y: Argv) =>
    y
      .option('kind', { choices: ['model', 'sample', 'epoch'], default: 'model', describe: 'model: width × epochs; sample: train_size × width; epoch: epochs × train_size' })
      .option('x', { type: 'string', describe: 'x axis instead of the kind\'s: width, epochs, train_size, label_noise or a numeric condition key (weight_decay)' })
      .option('y', { type: 'string', describe: 'y axis instead of the kind\'s' })
      .option('at', { type: 'string', array: true, describe: 'fix an axis or the condition: axis=value (repeat, or comma-separate); unset ones take the value with most data' })
      .option('metric', { choices: ['test_error', 'test_loss', 'train_error', 'train_loss'], describe: 'value mapped (default test_error, or test_loss when the store has no error)' })
      .option('method', { choices: ['auto', 'linear', 'thin-plate', 'gp'], default: 'auto', describe: 'interpolation; auto = lowest leave-one-out error' })
      .option('raster', { type: 'string', describe: 'images show the interpolated raster (measured cells solid, interpolated hatched) instead of cells; optional size NXxNY over the transformed plane (default 256x256)' })
      .option('slices', { type: 'string', describe: 'rows of the slices chart: y values, e.g. epochs=100,1000,4000 (default: 4 spread rows)' })
      .option('facet', { choices: ['label_noise', 'condition'], describe: 'images: one panel per label noise level or condition, sharing scales and colours' })
      .option('colors', { choices: [...COLOR_SCHEMES], default: DEFAULT_COLOR_SCHEME, describe: 'perceptually uniform colour scheme of the images' })
      .option('png-scale', { type: 'number', default: 2, describe: 'pixel ratio of PNG images (2 = crisp on slides)' })
      .option('axis-scale', { type: 'string', array: true, describe: 'axis=log2|linear, overriding the detected axis scale' })
      .option('scale', { type: 'string', array: true, hidden: true, describe: 'old spelling of --axis-scale' })
      .option('ridge', { type: 'boolean', default: true, describe: 'also locate the double-descent ridge and put it in the file (--no-ridge skips)' })
      .option('store', { type: 'string', default: 'atlas-store', describe: 'store directory' })
      .option('out', { type: 'string', default: '.', describe: 'directory the map files go to' })
      .option('format', { type: 'string', default: 'json', describe: `comma-separated output formats: ${FORMATS.join(', ')} (images come with their vega-lite spec, .vl.json)` }),
  async run(args) {
    const formats = parseFormats(args.format);
    const raster = parseRaster(args.raster || '256x256');
    // Checked here too: yargs reports bad choices only after the handler ran.
    if (!isColorScheme(String(args.colors))) throw usageError(renderMsg.badColors(String(args.colors), COLOR_SCHEMES));
    if (!(args['png-scale'] > 0 && args['png-scale'] <= 8)) throw usageError(renderMsg.badPngScale(String(args['png-scale'])));
    const at = parseAt(args.at);
    const scales = parseScales([...(args['axis-scale'] ?? []), ...(args.scale ?? [])]);
    const { readStore } = await import('../store/readStore.js');
    const { buildMap } = await import('../grid/buildMap.js');
    const { mapToJson } = await import('../grid/mapJson.js');
    const { axisSource } = await import('../ingest/axisSource.js');
    const { table, manifest } = await readStore(args.store);
    (await import('../store/assertRows.js')).assertRows(table, args.store);
    const named = <M extends { x: { name: string; source?: string }; y: { name: string; source?: string } }>(m: M): M => {
      m.x.source = axisSource(manifest, m.x.name);
      m.y.source = axisSource(manifest, m.y.name);
      return m;
    };
    const map = named(buildMap(table, { kind: args.kind, x: args.x, y: args.y, at, metric: args.metric, method: args.method, raster, scales }));

    let ridge = null;
    if (args.ridge) {
      const { findRidge } = await import('../analysis/findRidge.js');
      ridge = findRidge(map);
    }

    mkdirSync(args.out, { recursive: true });
    const base = map.kind === 'custom' ? `map-${map.x.name}-${map.y.name}` : `map-${map.kind}`;
    const files: string[] = [];
    if (formats.includes('json')) {
      const path = join(args.out, `${base}.json`);
      writeFileSync(path, `${mapToJson(map, { ridge, store: args.store })}\n`);
      files.push(path);
    }
    const imageFormats = formats.filter((f): f is 'png' | 'svg' | 'pdf' => f !== 'json');
    if (imageFormats.length) {
      const { writeMapImages } = await import('../render/writeMapImages.js');
      const { parseSlices } = await import('../render/parseSlices.js');
      const { fixedValueText } = await import('../render/axisText.js');
      const slices = parseSlices(args.slices, map.y.name) ?? undefined;
      let facets;
      if (args.facet) {
        const { findRidge } = await import('../analysis/findRidge.js');
        const col = args.facet === 'condition' ? table.condition : Array.from(table.label_noise);
        const levels = [...new Set<number | string>(col)].filter((v) => v === v).sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
        const panels = levels.map((v) => {
          const m = v === map.fixed[args.facet!] ? map : named(buildMap(table, { kind: args.kind, x: args.x, y: args.y, at: { ...at, [args.facet!]: v }, metric: args.metric, method: args.method, raster, scales }));
          return { map: m, ridge: m === map ? ridge : args.ridge ? findRidge(m) : null, label: fixedValueText(args.facet!, v) };
        });
        facets = { panels };
      }
      const written = await writeMapImages({
        map, ridge, outDir: args.out, formats: imageFormats, scale: args['png-scale'], slices, name: base,
        raster: args.raster !== undefined, colors: args.colors, facets,
      });
      files.push(...written);
    }

    const ridgeRows = ridge ? { total: ridge.rows.length, withPeak: ridge.rows.filter((r) => r.peak).length } : null;
    if (args.json) {
      const { mapSummary } = await import('../api/mapSummary.js');
      const out = mapSummary(map, ridgeRows, files);
      process.stdout.write(`${JSON.stringify(out, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))}\n`);
    } else {
      process.stdout.write(`${summary(map, ridgeRows, files).join('\n')}\n`);
    }
    return 0;
  },
};
