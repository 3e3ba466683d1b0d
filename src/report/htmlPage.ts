import { cellMapSpec, cellRecords } from './cellMapSpec.js';
import { escapeHtml, jsonForScript, scriptForInline } from './escapeHtml.js';
import { formatCost, formatFixed, formatNumber } from '../formatNumber.js';
import { pickedList, report as msg } from '../messages.js';
import { metricLabel } from '../render/axisText.js';
import { PAGE_SCRIPT } from './pageScript.js';
import type { MapSection, ReportModel } from './ReportModel.js';
import { factRows, hurtsSubtitle, hurtsTable, planGroups, planRows, PLAN_COLUMNS, PLAN_GROUP_COLUMNS, COVERAGE_COLUMNS, COVERAGE_GROUP_COLUMNS, coverageGroups, coverageRows } from './reportTables.js';

/** A static picture beside a map (interpolated field, slices), embedded as a data URL. */
export interface PageFigure {
  caption: string;
  png: Buffer;
}

export interface HtmlPageOptions {
  model: ReportModel;
  /** The browser builds of vega and vega-lite, inlined so the page needs no network. */
  runtime: { vega: string; vegaLite: string };
  /** Per map section (same order as model.maps): pictures to show under the interactive map. */
  figures?: PageFigure[][];
  /** Test error along train size where more data hurts most. */
  hurtsFigure?: PageFigure;
  /** The planned grid coloured by completed seeds. */
  coverageFigure?: PageFigure;
}

const esc = escapeHtml;

function table(columns: string[], rows: string[][], cls = ''): string {
  const head = columns.map((c) => `<th>${esc(c)}</th>`).join('');
  const body = rows.map((r) => `<tr>${r.map((c) => `<td>${esc(c)}</td>`).join('')}</tr>`).join('\n');
  return `<table class="${cls}"><thead><tr>${head}</tr></thead><tbody>${body}</tbody></table>`;
}

/** What the page's script needs per map section: specs, cell records and ridge rows per variant. */
function sectionData(sec: MapSection) {
  return {
    kind: sec.kind,
    x: sec.x,
    y: sec.y,
    // The metric's label as on the figures ("test error"), not the column name.
    metric: metricLabel(sec.variants[sec.main]?.map.metric ?? 'test_error'),
    main: sec.main,
    variants: sec.variants.map((v) => ({
      label: v.label,
      meta: variantMeta(v.map, v === sec.variants[sec.main]) + (v === sec.variants[sec.main] && sec.chosen === 'peaks' ? ` · shown first: ${msg.chosenPeaks}` : ''),
      spec: cellMapSpec(v.map, v.ridge, { width: 520, height: 340 }),
      cells: cellRecords(v.map),
      ridge: (v.ridge?.rows ?? []).map((r) => ({ y: r.y, peak: r.peak, threshold: r.threshold, noiseFrom: r.noiseFrom })),
      cautions: v.cautions,
    })),
  };
}

function variantMeta(map: MapSection['variants'][number]['map'], main: boolean): string {
  const picked = map.picked.length ? ` · ${pickedList(map.picked, map.pickedTies)}` : '';
  // Only the main variant has an interpolated field on the page (the pictures below the map).
  const field = main ? ` · pictures below: ${map.method} interpolation (leave-one-out rmse ${formatNumber(map.loo.rmse)})` : '';
  return `${map.cells.length} measured cells · ${map.missing.length} missing${field}${picked}`;
}

function figureHtml(f: PageFigure): string {
  return `<figure><img alt="${esc(f.caption)}" src="data:image/png;base64,${f.png.toString('base64')}"><figcaption>${esc(f.caption)}</figcaption></figure>`;
}

function mapSectionHtml(sec: MapSection, si: number, figures: PageFigure[]): string {
  const options = sec.variants
    .map((v, vi) => `<option value="${vi}"${vi === sec.main ? ' selected' : ''}>${esc(v.label)}</option>`)
    .join('');
  const selector =
    sec.variants.length > 1
      ? `<label class="selector">${esc(sec.selector.join(' · ') || 'fixed values')}: <select id="select-${si}">${options}</select></label>`
      : `<p class="selector">at ${esc(sec.variants[0]?.label ?? '')}</p>`;
  const figs = figures.map(figureHtml).join('\n');
  return `<section class="map" id="section-${esc(sec.kind)}">
<h2>${esc(sec.kind)}-wise map: ${esc(sec.x)} × ${esc(sec.y)}</h2>
${selector}
<p class="meta" id="meta-${si}"></p>
<div class="mapwrap"><div class="chart" id="map-${si}"></div><aside class="readout" id="readout-${si}" aria-live="polite"></aside></div>
<p class="legend">Colour: mean over seeds in each measured cell (nothing interpolated here). Circles joined by the black line: the double-descent peak of each row, whiskers its location interval; a gap means no significant peak. White dashed line: interpolation threshold (mean train error ≤ ε). Grey ×: grid point with no data.</p>
<ul class="notes" id="notes-${si}"></ul>
<table class="ridge"><thead><tr><th>${esc(sec.y)}</th><th>peak ${esc(sec.x)}</th><th>interval</th><th>error at peak</th><th>prominence</th><th>threshold</th><th>noise from</th></tr></thead><tbody id="ridge-${si}"></tbody></table>
${figs}
</section>`;
}

const CSS = `
body{font-family:"DejaVu Sans",system-ui,sans-serif;color:#1d2430;margin:0 auto;max-width:1100px;padding:24px;line-height:1.45}
h1{margin:0 0 4px;font-size:26px}h2{margin:32px 0 6px;font-size:19px;border-top:3px solid #2b4c7e;padding-top:10px}
.sub{color:#5b6472;margin:0 0 16px}
table{border-collapse:collapse;margin:8px 0 12px;font-size:13px}th,td{padding:3px 10px;text-align:left;border-bottom:1px solid #e3e6eb}th{background:#eef1f5}
.findings li{margin:4px 0}.cautions li,.notes li{background:#fff4e0;border-left:3px solid #e0a030;padding:4px 8px;margin:4px 0;list-style:none}
.cautions,.notes{padding:0}
.mapwrap{display:flex;gap:16px;align-items:flex-start;flex-wrap:wrap}.chart{min-width:560px}
.readout{flex:1;min-width:230px;border:1px solid #d5dae2;border-radius:6px;padding:8px 12px;font-size:13px;background:#fafbfc}
.readout dl{display:grid;grid-template-columns:auto 1fr;gap:2px 10px;margin:6px 0}.readout dt{color:#5b6472}.readout dd{margin:0;font-variant-numeric:tabular-nums}
.ro-head{font-weight:bold}.ro-val{color:#5b6472}.ro-sub{color:#5b6472;margin-top:6px}.ro-runs{margin:2px 0;padding-left:18px;max-height:160px;overflow:auto;word-break:break-all}.ro-hint{color:#5b6472}
.selector{font-size:14px}.meta,.legend{color:#5b6472;font-size:12.5px}
figure{margin:12px 0}figure img{max-width:100%;border:1px solid #e3e6eb}figcaption{color:#5b6472;font-size:12.5px}
footer{margin-top:40px;color:#5b6472;font-size:12px}
`;

/** The report as one self-contained HTML file (no network: scripts, data and pictures inline). */
export function htmlPage(opts: HtmlPageOptions): string {
  const { model, runtime } = opts;
  const f = model.facts;
  const data = { sections: model.maps.map(sectionData) };
  const sections = model.maps.map((sec, si) => mapSectionHtml(sec, si, opts.figures?.[si] ?? [])).join('\n');
  const skipped = model.skipped.length
    ? `<h2>Maps not drawn</h2><ul>${model.skipped.map((s) => `<li>${esc(s.kind)}-wise: ${esc(s.reason)}</li>`).join('')}</ul>`
    : '';
  const hurts = hurtsTable(model.hurts);
  const hurtsMeta = model.hurts[0] ? `<p class="meta">${esc(hurtsSubtitle(model.hurts[0]))}</p>` : '';
  const hurtsHtml = `<h2>Where more data hurts</h2>${hurtsMeta}${
    hurts.rows.length ? table(hurts.columns, hurts.rows) : '<p>No significant rise of test error with train size in any slice the sweep covers.</p>'
  }${opts.hurtsFigure ? figureHtml(opts.hurtsFigure) : ''}`;
  const coverageHtml = model.coverage
    ? `<h2>Coverage against the spec</h2><p>${esc(
        `complete ${model.coverage.counts.complete} · partial ${model.coverage.counts.partial} · missing ${model.coverage.counts.missing} · diverged ${model.coverage.counts.diverged}`,
      )}</p>${
        model.coverage.gaps.length
          ? `${table(COVERAGE_GROUP_COLUMNS, coverageGroups(model.coverage))}<details><summary>each run that is not complete</summary>${table(COVERAGE_COLUMNS, coverageRows(model.coverage))}</details>`
          : ''
      }${opts.coverageFigure ? figureHtml(opts.coverageFigure) : ''}`
    : '';
  const planHtml = model.plan
    ? `<h2>Proposed next runs</h2><p>${esc(`${model.plan.runs.length} runs, cost ${formatCost(model.plan.cost, model.plan.units)}${model.plan.budget !== null ? ` of budget ${formatCost(model.plan.budget, model.plan.units)}` : ''}`)}</p>${
        model.plan.runs.length ? `${table(PLAN_GROUP_COLUMNS, planGroups(model.plan))}<details><summary>every run, in order</summary>${table(PLAN_COLUMNS, planRows(model.plan))}</details>` : ''
      }`
    : '';
  const cautions = model.cautions.length ? `<h2>Read with care</h2><ul class="cautions">${model.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul>` : '';
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; script-src 'unsafe-inline' 'unsafe-eval'; style-src 'unsafe-inline'; img-src data: blob:">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(f.title)}</title>
<style>${CSS}</style>
</head>
<body>
<header>
<h1>${esc(f.title)}</h1>
<p class="sub">${esc(`${f.runs} runs · ${f.rows} logged rows · metric ${metricLabel(f.metric)} · data of ${f.dataDate ?? 'unknown date'} · store ${f.storeHash ?? 'unknown'}`)}</p>
</header>
<h2>Headline findings</h2>
<ol class="findings">${model.findings.map((s) => `<li>${esc(s)}</li>`).join('')}</ol>
${cautions}
<h2>The sweep</h2>
${table(['fact', 'value'], factRows(f), 'facts')}
${sections}
${skipped}
${hurtsHtml}
${coverageHtml}
${planHtml}
<footer>${esc(`Made by datlas on ${f.generatedAt}. Fixed values: ${model.maps.map((m) => `${m.kind}: ${formatFixed(m.variants[m.main]?.map.fixed ?? {})}`).join('; ')}.`)}</footer>
<script type="application/json" id="datlas-data">${jsonForScript(data)}</script>
<script>${scriptForInline(runtime.vega)}</script>
<script>${scriptForInline(runtime.vegaLite)}</script>
<script>${scriptForInline(PAGE_SCRIPT)}</script>
</body>
</html>
`;
}
