import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { renderSpec } from '../render/renderSpec.js';
import { cellMapSpec } from './cellMapSpec.js';
import { composeDeck } from './composeDeck.js';
import type { DeckBlock, DeckPage } from './composeDeck.js';
import { formatFixed, formatNumber } from './formatNumber.js';
import { htmlPage } from './htmlPage.js';
import type { PageFigure } from './htmlPage.js';
import { readRuntime } from './readRuntime.js';
import type { MapSection, ReportModel } from './ReportModel.js';
import { reportJson } from './reportJson.js';
import {
  COVERAGE_COLUMNS,
  coverageRows,
  factRows,
  HURTS_COLUMNS,
  hurtsRows,
  PLAN_COLUMNS,
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
  /** Extra pictures per map section from the render stage (interpolated field, slices), in model.maps order. */
  figures?: { caption: string; png: Buffer; file: string }[][];
}

/** Writes beside, then renames: a reader never sees half a file. */
function writeAtomic(path: string, data: string | Buffer): void {
  const tmp = `${path}.${process.pid}.tmp`;
  writeFileSync(tmp, data);
  renameSync(tmp, path);
}

const slug = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^_+|_+$/g, '');

/** Variants of a section that differ from the main one only in label noise (for the small multiples). */
function noiseVariants(sec: MapSection) {
  const main = sec.variants[sec.main];
  const others = Object.entries(main.map.fixed).filter(([k]) => k !== 'label_noise');
  return sec.variants.filter((v) => others.every(([k, val]) => v.map.fixed[k] === val));
}

/** The PDF deck, the self-contained HTML page, the PNG set and a JSON summary of the report. */
export async function writeReport(opts: WriteReportOptions): Promise<ReportFiles> {
  const { model, outDir, scale = 2 } = opts;
  const pngDir = join(outDir, 'png');
  mkdirSync(pngDir, { recursive: true });
  const pngs: string[] = [];
  const savePng = (name: string, buf: Buffer) => {
    const p = join(pngDir, name);
    writeAtomic(p, buf);
    pngs.push(p);
    return buf;
  };

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

  for (const [si, sec] of model.maps.entries()) {
    const main = sec.variants[sec.main];
    const measured = savePng(`map-${sec.kind}.png`, (await renderSpec(cellMapSpec(main.map, main.ridge), { format: 'png', scale })) as Buffer);
    const extra = opts.figures?.[si] ?? [];
    for (const fig of extra) savePng(fig.file, fig.png);
    const side: DeckBlock[] = [];
    if (main.ridge) {
      side.push({ kind: 'heading', text: `Ridge: peak ${sec.x} per ${sec.y}` }, { kind: 'table', columns: RIDGE_COLUMNS(main.ridge), rows: ridgeRows(main.ridge), size: 9.5, align: ['right', 'right', 'right', 'right', 'left', 'right'] });
    }
    for (const c of main.cautions) side.push({ kind: 'note', text: c });
    const title = `${sec.kind[0].toUpperCase()}${sec.kind.slice(1)}-wise map: ${sec.x} × ${sec.y}`;
    const mapSub = `at ${formatFixed(main.map.fixed)} · ${main.map.cells.length} measured cells, ${main.map.missing.length} missing`;
    // The interpolated field (render stage) when there is one, else the measured cells.
    const lead = extra[0];
    pages.push({ title, subtitle: mapSub, columns: [[{ kind: 'image', png: lead ? lead.png : measured }, ...(lead ? [{ kind: 'text', text: lead.caption, size: 9.5, color: '#5b6472' } as DeckBlock] : [])], side], widths: [3, 2] });
    if (lead) {
      pages.push({ title: `${title}: measured cells only`, subtitle: mapSub, columns: [[{ kind: 'image', png: measured }, { kind: 'text', text: 'Colour: mean over seeds per measured cell; nothing interpolated. White diamond and bar: peak and its interval; dashed orange: interpolation threshold; grey ×: no data.', size: 9.5, color: '#5b6472' }]] });
    }
    for (const fig of extra.slice(1)) pages.push({ title: `${title}: ${fig.caption}`, subtitle: mapSub, columns: [[{ kind: 'image', png: fig.png }]] });
    // How the map changes with label noise: small multiples of the measured cells.
    const byNoise = noiseVariants(sec);
    if (byNoise.length >= 2) {
      const shown = byNoise.slice(0, 3);
      const cols: DeckBlock[][] = [];
      for (const v of shown) {
        const noise = v.map.fixed.label_noise;
        const png = savePng(`map-${sec.kind}-noise-${slug(String(noise))}.png`, (await renderSpec(cellMapSpec(v.map, v.ridge, { width: 300, height: 260, title: `label_noise ${noise}` }), { format: 'png', scale })) as Buffer);
        cols.push([{ kind: 'image', png }]);
      }
      pages.push({ title: `${title}: by label noise`, subtitle: `at ${formatFixed(Object.fromEntries(Object.entries(main.map.fixed).filter(([k]) => k !== 'label_noise')))}`, columns: cols });
    }
  }

  const hurts = hurtsRows(model.hurts);
  if (model.hurts.length) {
    const h = model.hurts[0];
    pages.push({
      title: 'Where more data hurts',
      subtitle: `${h.slices ?? '?'} train-size slices at ${formatFixed(h.fixed) || 'every epoch'}, α = ${formatNumber(h.alpha ?? 0.05)}; worst rise first`,
      columns: [[hurts.length ? { kind: 'table', columns: HURTS_COLUMNS, rows: hurts, size: 10 } : { kind: 'text', text: 'No significant rise of test error with train size in any slice.' }]],
    });
  }
  if (model.coverage) {
    const c = model.coverage.counts;
    const rows = coverageRows(model.coverage);
    pages.push({
      title: 'Coverage against the spec',
      subtitle: `complete ${c.complete} · partial ${c.partial} · missing ${c.missing} · diverged ${c.diverged}`,
      columns: [[rows.length ? { kind: 'table', columns: COVERAGE_COLUMNS, rows, size: 10 } : { kind: 'text', text: 'Every planned run is complete.' }]],
    });
  }
  if (model.plan) {
    const rows = planRows(model.plan);
    pages.push({
      title: 'Proposed next runs',
      subtitle: `${model.plan.runs.length} runs, cost ${formatNumber(model.plan.cost)}${model.plan.budget !== null ? ` of budget ${formatNumber(model.plan.budget)}` : ''}`,
      columns: [[rows.length ? { kind: 'table', columns: PLAN_COLUMNS, rows, size: 10 } : { kind: 'text', text: 'Nothing to run: the spec is covered and no ridge point needs refining.' }]],
    });
  }

  const pdfPath = join(outDir, 'report.pdf');
  writeAtomic(pdfPath, await composeDeck({ pages, footer: `${f.title} · store ${f.storeHash ?? 'unknown'} · made by datlas ${f.generatedAt}` }));

  const figures: PageFigure[][] = model.maps.map((_, si) => (opts.figures?.[si] ?? []).map((x) => ({ caption: x.caption, png: x.png })));
  const htmlPath = join(outDir, 'report.html');
  writeAtomic(htmlPath, htmlPage({ model, runtime: readRuntime(), figures }));

  const jsonPath = join(outDir, 'report.json');
  writeAtomic(jsonPath, `${JSON.stringify(reportJson(model), null, 2)}\n`);
  return { pdf: pdfPath, html: htmlPath, json: jsonPath, png: pngs };
}
