import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pickedList, report as msg } from '../messages.js';
import { renderSpec } from '../render/renderSpec.js';
import { slicesSpec } from '../render/slicesSpec.js';
import { writeMapImages } from '../render/writeMapImages.js';
import { composeDeck } from './composeDeck.js';
import type { DeckBlock, DeckPage } from './composeDeck.js';
import { formatCost, formatFixed, formatNumber } from '../formatNumber.js';
import { htmlPage } from './htmlPage.js';
import type { PageFigure } from './htmlPage.js';
import { readRuntime } from './readRuntime.js';
import type { MapSection, ReportModel } from './ReportModel.js';
import { reportJson } from './reportJson.js';
import {
  COVERAGE_COLUMNS,
  COVERAGE_GROUP_COLUMNS,
  coverageGroups,
  coverageRows,
  factRows,
  hurtsSubtitle,
  hurtsTable,
  PLAN_COLUMNS,
  PLAN_GROUP_COLUMNS,
  planGroups,
  planRows,
  RIDGE_COLUMNS,
  ridgeRows,
} from './reportTables.js';

export interface ReportFiles {
  pdf: string;
  html: string;
  json: string;
  /** Every chart as a PNG, for slides. */
  png: string[];
}

export interface WriteReportOptions {
  model: ReportModel;
  outDir: string;
  /** Pixel ratio of the PNGs (default 2). */
  scale?: number;
  /** Called as each stage starts (progress): "drawing the model-wise figures", "writing the PDF deck". */
  onStage?: (stage: string) => void;
}

/** Writes beside, then renames: a reader never sees half a file. */
function writeAtomic(path: string, data: string | Buffer): void {
  const tmp = `${path}.${process.pid}.tmp`;
  writeFileSync(tmp, data);
  renameSync(tmp, path);
}

/** Variants of a section that differ from the main one only in label noise (for the small multiples). */
function noiseVariants(sec: MapSection) {
  const main = sec.variants[sec.main];
  const others = Object.entries(main.map.fixed).filter(([k]) => k !== 'label_noise');
  return sec.variants.filter((v) => others.every(([k, val]) => v.map.fixed[k] === val));
}

/**
 * Test error along train size at the widths where more data hurts most (the worst segments'
 * slice: same label noise and epoch), from the matching sample-wise map variant. Null when the
 * report has no such map or no segment.
 */
async function writeHurtsSlices(model: ReportModel, pngDir: string, scale: number): Promise<Buffer | null> {
  const seg = model.hurts[0]?.segments[0];
  const sample = model.maps.find((m) => m.kind === 'sample');
  if (!seg || !sample) return null;
  const v = sample.variants.find((x) => x.map.fixed.label_noise === seg.fixed.label_noise && x.map.fixed.epochs === seg.fixed.epochs);
  if (!v) return null;
  const widths = [...new Set(model.hurts[0].segments.filter((x) => x.fixed.label_noise === seg.fixed.label_noise && x.fixed.epochs === seg.fixed.epochs).map((x) => x.fixed.width as number))].slice(0, 4);
  // Wide and low: it shares a slide with the segments' table.
  const spec = slicesSpec(v.map, v.ridge, { rows: widths, width: 760, height: 250 });
  const png = (await renderSpec(spec, { format: 'png', scale })) as Buffer;
  writeAtomic(join(pngDir, 'hurts-slices.vl.json'), `${JSON.stringify(spec, null, 1)}\n`);
  writeAtomic(join(pngDir, 'hurts-slices.png'), png);
  return png;
}

/** The PDF deck, the self-contained HTML page, the PNG set and a JSON summary of the report. */
export async function writeReport(opts: WriteReportOptions): Promise<ReportFiles> {
  const { model, outDir, scale = 2 } = opts;
  const pngDir = join(outDir, 'png');
  mkdirSync(pngDir, { recursive: true });
  // Charts of an earlier report in the same folder (a map kind this sweep skips) would mislead: drop ours.
  for (const f of readdirSync(pngDir)) if (/^(map-|hurts-slices|coverage)[^/]*\.(png|vl\.json)$/.test(f)) rmSync(join(pngDir, f), { force: true });
  const pngs: string[] = [];

  const pages: DeckPage[] = [];
  const f = model.facts;
  const subtitle = `${f.runs} runs · ${f.seeds.distinct} seeds · metric ${f.metric} · data of ${f.dataDate ?? 'unknown date'} · store ${f.storeHash ?? 'unknown'}`;
  const findings: DeckBlock[] = [{ kind: 'heading', text: 'Headline findings' }, { kind: 'bullets', items: model.findings, size: 11.5 }];
  pages.push({ title: f.title, subtitle, columns: [findings, [{ kind: 'heading', text: 'The sweep' }, { kind: 'table', columns: ['fact', 'value'], rows: factRows(f), size: 10 }]], widths: [3, 2] });
  if (model.cautions.length || model.skipped.length) {
    const blocks: DeckBlock[] = model.cautions.map((c) => ({ kind: 'note', text: c }) as DeckBlock);
    if (model.skipped.length) blocks.push({ kind: 'heading', text: 'Maps not drawn' }, { kind: 'bullets', items: model.skipped.map((s) => `${s.kind}-wise: ${s.reason}`) });
    pages.push({ title: 'Read with care', subtitle: 'What the figures could make a reader believe wrongly', columns: [blocks] });
  }

  const figures: PageFigure[][] = [];
  for (const sec of model.maps) {
    opts.onStage?.(`drawing the ${sec.kind}-wise figures`);
    const main = sec.variants[sec.main];
    const name = `map-${sec.kind}`;
    // The render stage's figures: measured cells (with key and warnings), slices, the
    // interpolated field, and the label-noise variants side by side on shared scales.
    const read = async (paths: string[]) => {
      const out: Buffer[] = [];
      for (const p of paths.filter((x) => x.endsWith('.png'))) {
        pngs.push(p);
        out.push(readFileSync(p));
      }
      return out;
    };
    const [cells, slices] = await read(await writeMapImages({ map: main.map, ridge: main.ridge, outDir: pngDir, formats: ['png'], scale, name }));
    const [field] = await read(await writeMapImages({ map: main.map, ridge: main.ridge, outDir: pngDir, formats: ['png'], scale, name: `${name}-field`, raster: true, withSlices: false }));
    const byNoise = noiseVariants(sec).slice(0, 3);
    const [noise] =
      byNoise.length >= 2
        ? await read(
            await writeMapImages({
              map: main.map,
              ridge: main.ridge,
              outDir: pngDir,
              formats: ['png'],
              scale,
              name: `${name}-by-noise`,
              withSlices: false,
              facets: { panels: byNoise.map((v) => ({ map: v.map, ridge: v.ridge, label: `label_noise ${formatNumber(v.map.fixed.label_noise as number)}` })) },
            }),
          )
        : [];
    const figs: PageFigure[] = [];
    const title = `${sec.kind[0].toUpperCase()}${sec.kind.slice(1)}-wise map: ${sec.x} × ${sec.y}`;
    const picked = sec.chosen === 'peaks' ? ` (${msg.chosenPeaks})` : main.map.picked.length ? ` (${pickedList(main.map.picked, main.map.pickedTies)})` : '';
    const mapSub = `at ${formatFixed(main.map.fixed)}${picked} · ${main.map.cells.length} measured cells, ${main.map.missing.length} missing`;
    const side: DeckBlock[] = [];
    if (main.ridge) {
      side.push(
        { kind: 'heading', text: `Ridge: the peak's ${sec.x} in each ${sec.y} row` },
        { kind: 'table', columns: RIDGE_COLUMNS(main.ridge), rows: ridgeRows(main.ridge), size: 9, align: ['right', 'right', 'right', 'right', 'right', 'right'] },
      );
    }
    for (const c of main.cautions) side.push({ kind: 'note', text: c });
    pages.push({ title, subtitle: mapSub, columns: [[{ kind: 'image', png: cells }], side], widths: [1.45, 1] });
    pages.push({
      title: `${title}, interpolated`,
      subtitle: `${main.map.method} interpolation between measured cells (leave-one-out rmse ${formatNumber(main.map.loo.rmse)}); hatched areas had no run`,
      columns: [[{ kind: 'image', png: field }, { kind: 'note', text: msg.interpolatedPage }]],
    });
    figs.push({ caption: `Interpolated field (${main.map.method}); hatched areas had no run.`, png: field });
    if (slices) {
      pages.push({ title: `${title}: slices`, subtitle: `test error along ${sec.x} at a few ${sec.y} values, with the seeds' 95% intervals`, columns: [[{ kind: 'image', png: slices }]] });
      figs.push({ caption: `Slices along ${sec.x} with 95% intervals over seeds.`, png: slices });
    }
    if (noise) {
      const rest = Object.fromEntries(Object.entries(main.map.fixed).filter(([k]) => k !== 'label_noise'));
      pages.push({ title: `${title}: by label noise`, subtitle: `at ${formatFixed(rest)}; shared colour scale`, columns: [[{ kind: 'image', png: noise }]] });
      figs.push({ caption: 'The same map at each label-noise level (shared colour scale).', png: noise });
    }
    figures.push(figs);
  }

  const hurts = hurtsTable(model.hurts);
  let hurtsPng: Buffer | null = null;
  if (model.hurts.length) {
    const h = model.hurts[0];
    hurtsPng = await writeHurtsSlices(model, pngDir, scale);
    if (hurtsPng) pngs.push(join(pngDir, 'hurts-slices.png'));
    const table: DeckBlock = hurts.rows.length ? { kind: 'table', columns: hurts.columns, rows: hurts.rows, size: 9.5, align: hurts.columns.map(() => 'right' as const) } : { kind: 'text', text: 'No significant rise of test error with train size in any slice.' };
    pages.push({
      title: 'Where more data hurts',
      subtitle: hurtsSubtitle(h),
      // The table is short (a few segments): it goes on top and the chart takes the rest of the
      // slide at full width, instead of a third of it beside the table.
      columns: hurtsPng ? [[table, { kind: 'image', png: hurtsPng }, { kind: 'text', text: msg.hurtsFigure, size: 9.5, color: '#5b6472' }]] : [[table]],
    });
  }
  let coveragePng: Buffer | null = null;
  if (model.coverage?.figure) {
    coveragePng = (await renderSpec(model.coverage.figure, { format: 'png', scale })) as Buffer;
    writeAtomic(join(pngDir, 'coverage.vl.json'), `${JSON.stringify(model.coverage.figure, null, 1)}\n`);
    writeAtomic(join(pngDir, 'coverage.png'), coveragePng);
    pngs.push(join(pngDir, 'coverage.png'));
  }
  if (model.coverage) {
    const c = model.coverage.counts;
    const rows = coverageRows(model.coverage);
    if (coveragePng) pages.push({ title: 'Coverage against the spec: the grid', subtitle: `complete ${c.complete} · partial ${c.partial} · missing ${c.missing} · diverged ${c.diverged}`, columns: [[{ kind: 'image', png: coveragePng }]] });
    pages.push({
      title: 'Coverage against the spec',
      subtitle: `complete ${c.complete} · partial ${c.partial} · missing ${c.missing} · diverged ${c.diverged}`,
      columns: [
        rows.length
          ? [
              { kind: 'heading', text: 'Grouped by status' },
              { kind: 'table', columns: COVERAGE_GROUP_COLUMNS, rows: coverageGroups(model.coverage), size: 9.5 },
              { kind: 'heading', text: 'Each run that is not complete' },
              { kind: 'table', columns: COVERAGE_COLUMNS, rows, size: 9 },
            ]
          : [{ kind: 'text', text: 'Every planned run is complete.' }],
      ],
    });
  }
  if (model.plan) {
    const groups = planGroups(model.plan);
    const sub = `${model.plan.runs.length} runs, cost ${formatCost(model.plan.cost, model.plan.units)}${model.plan.budget !== null ? ` of budget ${formatCost(model.plan.budget, model.plan.units)}` : ''}`;
    pages.push({
      title: 'Proposed next runs',
      subtitle: `${sub}; grouped by reason, in the plan's order (every run in the HTML page and plan CSV)`,
      columns: [[groups.length ? { kind: 'table', columns: PLAN_GROUP_COLUMNS, rows: groups, size: 9.5 } : { kind: 'text', text: 'Nothing to run: the spec is covered and no ridge point needs refining.' }]],
    });
    if (model.plan.runs.length) pages.push({ title: 'Proposed next runs: the first ones', subtitle: sub, columns: [[{ kind: 'table', columns: PLAN_COLUMNS, rows: planRows(model.plan), size: 9 }]] });
  }

  const pdfPath = join(outDir, 'report.pdf');
  opts.onStage?.('writing the PDF deck');
  writeAtomic(pdfPath, await composeDeck({ pages, footer: `${f.title} · store ${f.storeHash ?? 'unknown'} · made by datlas ${f.generatedAt}` }));

  const htmlPath = join(outDir, 'report.html');
  opts.onStage?.('writing the HTML page');
  writeAtomic(
    htmlPath,
    htmlPage({
      model,
      runtime: readRuntime(),
      figures,
      hurtsFigure: hurtsPng ? { caption: msg.hurtsFigure, png: hurtsPng } : undefined,
      coverageFigure: coveragePng ? { caption: msg.coverageFigure, png: coveragePng } : undefined,
    }),
  );

  const jsonPath = join(outDir, 'report.json');
  writeAtomic(jsonPath, `${JSON.stringify(reportJson(model), null, 2)}\n`);
  return { pdf: pdfPath, html: htmlPath, json: jsonPath, png: pngs };
}
