import { formatNumber, numberExpr } from '../formatNumber.js';
import type { TopLevelSpec } from 'vega-lite';
import type { CoverageResult } from '../plan/coverage.js';
import type { SweepSpec } from '../plan/SweepSpec.js';
import { configKey } from '../store/rowKeys.js';

/** One cell of the coverage chart: a (condition, noise, width, train size) with its seeds' states. */
export interface CoverageCell {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
  planned: number;
  complete: number;
  partial: number;
  missing: number;
  diverged: number;
  /** Complete seeds over planned seeds. */
  done: number;
  label: string;
}

/** The per-cell counts the chart draws (exported for tests and other views). */
export function coverageCells(cov: CoverageResult): CoverageCell[] {
  const cells = new Map<string, CoverageCell>();
  for (const r of cov.runs) {
    const k = configKey(r);
    let c = cells.get(k);
    if (!c) {
      c = { condition: r.condition, label_noise: r.label_noise, width: r.width, train_size: r.train_size, planned: 0, complete: 0, partial: 0, missing: 0, diverged: 0, done: 0, label: '' };
      cells.set(k, c);
    }
    c.planned++;
    c[r.status]++;
  }
  for (const c of cells.values()) {
    c.done = c.complete / c.planned;
    // Seeds done over planned; partial (p) and diverged (d) seeds are flagged so a gap's kind shows.
    c.label = `${c.complete}/${c.planned}${c.partial ? ` ${c.partial}p` : ''}${c.diverged ? ` ${c.diverged}d` : ''}`;
  }
  return [...cells.values()];
}

/** Target figure width in px (a slide's drawing area at 1×, common practice for 16:9 decks). */
const TARGET_WIDTH = 1100;

/**
 * Cell size and panel wrapping for the coverage chart: cells shrink as widths grow (labels only
 * while a cell can hold "3/3"), and noise panels wrap onto rows to keep the figure near a
 * slide's shape rather than a long strip.
 */
export function coverageLayout(o: { widths: number; sizes: number; panels: number; conditions: boolean }): { cell: number; cellHeight: number; labels: boolean; columns: number } {
  const cell = o.widths <= 16 ? 44 : o.widths <= 30 ? 34 : Math.max(12, Math.floor(TARGET_WIDTH / o.widths));
  const labels = cell >= 34;
  const cellHeight = labels ? 30 : Math.max(14, Math.min(30, cell));
  const panelWidth = cell * o.widths + 70;
  const columns = o.conditions ? o.panels : Math.max(1, Math.min(o.panels, Math.floor(TARGET_WIDTH / panelWidth)));
  return { cell, cellHeight, labels, columns };
}

/**
 * The coverage chart: width × train size per label-noise level (columns; conditions as rows),
 * each cell coloured by the share of its planned seeds complete and labelled "done/planned"
 * with partial (p) and diverged (d) seeds flagged. Axes are ordinal: these are planned grid
 * points, not a continuous field, so nothing between them is drawn.
 */
export function coverageSpec(opts: { coverage: CoverageResult; spec: SweepSpec }): TopLevelSpec {
  const { coverage: cov, spec } = opts;
  const values = coverageCells(cov);
  const total = cov.runs.length;
  const { complete, partial, missing, diverged } = cov.counts;
  const manyConditions = spec.conditions.length > 1;
  const fmt = (v: number) => formatNumber(v);
  const layout = coverageLayout({ widths: spec.axes.width.length, sizes: spec.axes.train_size.length, panels: spec.axes.label_noise.length, conditions: manyConditions });
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: {
      text: `Coverage: ${fmt(complete)} of ${fmt(total)} planned runs complete (target ${fmt(spec.epochs)} epochs)`,
      subtitle: [
        `partial ${fmt(partial)} · missing ${fmt(missing)} · diverged ${fmt(diverged)}${cov.extra.length ? ` · ${fmt(cov.extra.length)} store runs outside the spec` : ''}`,
        layout.labels ? 'cell label: complete seeds / planned seeds; p = partial, d = diverged' : `${spec.axes.width.length} widths: cells too narrow for labels, colour = share of seeds complete`,
      ],
      anchor: 'start',
    },
    data: { values: values as unknown as Record<string, unknown>[] },
    // Noise panels wrap onto rows so the figure keeps a slide's shape (a wide grid beside another
    // wide grid would be squeezed to a strip); with conditions, conditions are the rows.
    ...(manyConditions
      ? { facet: { column: { field: 'label_noise', type: 'ordinal', title: 'label noise' }, row: { field: 'condition', type: 'nominal', title: 'condition' } } }
      : { facet: { field: 'label_noise', type: 'ordinal', title: 'label noise' }, columns: layout.columns }),
    spec: {
      width: Math.max(120, layout.cell * spec.axes.width.length),
      height: Math.max(80, layout.cellHeight * spec.axes.train_size.length),
      encoding: {
        x: { field: 'width', type: 'ordinal', title: 'width', sort: 'ascending', axis: { labelAngle: layout.labels ? 0 : -90, labelExpr: numberExpr() } },
        y: { field: 'train_size', type: 'ordinal', title: 'train size', sort: 'descending', axis: { labelExpr: numberExpr() } },
      },
      layer: [
        {
          mark: { type: 'rect', stroke: 'white', strokeWidth: 1 },
          encoding: {
            color: {
              field: 'done',
              type: 'quantitative',
              title: 'seeds complete',
              scale: { scheme: 'viridis', domain: [0, 1] },
              legend: { format: '.0%' },
            },
            tooltip: [
              { field: 'condition', type: 'nominal' },
              { field: 'label_noise', type: 'quantitative', title: 'label noise' },
              { field: 'width', type: 'quantitative' },
              { field: 'train_size', type: 'quantitative', title: 'train size', format: ',' },
              { field: 'complete', type: 'quantitative' },
              { field: 'partial', type: 'quantitative' },
              { field: 'missing', type: 'quantitative' },
              { field: 'diverged', type: 'quantitative' },
            ],
          },
        },
        // Cells too narrow for "3/3" labels show colour only (the title says so; the tooltip has the counts).
        ...(layout.labels
          ? [
              {
                mark: { type: 'text', fontSize: 10 },
                encoding: {
                  text: { field: 'label', type: 'nominal' },
                  // Light text on the dark (low) end of viridis, dark text on the bright end.
                  color: { condition: { test: 'datum.done < 0.6', value: 'white' }, value: 'black' },
                },
              },
            ]
          : []),
      ],
    },
    config: { view: { stroke: null }, font: 'DejaVu Sans' },
  } as TopLevelSpec;
}
