import { describe, expect, it } from 'vitest';
import { formatNumber, numberExpr, numberFormatScript } from '../src/formatNumber.js';

// SI prefixes k, M, G (BIPM, The International System of Units, 9th ed., Table 7); 3 significant
// digits as in the ridge tables (common practice).
const CASES: [number, string][] = [
  [56234, '56.2k'],
  [1e5, '100k'],
  [178000, '178k'],
  [177828, '178k'],
  [1e6, '1M'],
  [1_000_000, '1M'],
  [2.5e9, '2.5G'],
  [999_960, '1M'],
  [10000, '10k'],
  [16384, '16.4k'],
  [9999, '9999'],
  [1024, '1024'],
  [512, '512'],
  [0, '0'],
  [0.1, '0.1'],
  [0.4123, '0.412'],
  [123.6, '124'],
  [1.2345e-4, '1.23e-4'],
  [-56234, '-56.2k'],
  [-0.25, '-0.25'],
];

describe('formatNumber', () => {
  it('prints large magnitudes SI style, small ones to 3 significant digits', () => {
    for (const [v, want] of CASES) expect(formatNumber(v), String(v)).toBe(want);
    expect(formatNumber(NaN)).toBe('–');
    expect(formatNumber(null)).toBe('–');
    expect(formatNumber(0.0123, 2)).toBe('0.012');
  });

  it('the report page runs the same function (its source is embedded)', () => {
    const fn = new Function(`${numberFormatScript()}\nreturn formatNumber;`)() as (v: number) => string;
    for (const [v] of CASES) expect(fn(v)).toBe(formatNumber(v));
  });

  it('chart labels: the vega expression gives formatNumber\'s text for every value (vega runtime)', async () => {
    const vega = await import('vega');
    const values = [...CASES.map(([v]) => v), 3, 7.25, 99.5, 250.2, 0.05, 0.999, 12345, 4096, 65536, 1.5e6, 3.3e-5, NaN];
    const view = new vega.View(
      vega.parse({
        data: [{ name: 't', values: values.map((v) => ({ v: Number.isNaN(v) ? null : v })), transform: [{ type: 'formula', as: 'label', expr: numberExpr('datum.v') }] }],
      } as never),
      { renderer: 'none' },
    );
    await view.runAsync();
    const labels = (view.data('t') as { label: string }[]).map((d) => d.label);
    view.finalize();
    expect(labels).toEqual(values.map((v) => formatNumber(v)));
  });

  it('chart tick labels render with it', async () => {
    const vega = await import('vega');
    const vl = await import('vega-lite');
    const spec = vl.compile({
      data: { values: [{ x: 1e5, y: 0 }, { x: 3e5, y: 1 }] },
      mark: 'point',
      encoding: {
        x: { field: 'x', type: 'quantitative', scale: { domain: [1e5, 3e5], nice: false }, axis: { values: [1e5, 2e5, 3e5], labelExpr: numberExpr() } },
        y: { field: 'y', type: 'quantitative' },
      },
    } as never).spec;
    const view = new vega.View(vega.parse(spec), { renderer: 'none' });
    const svg = await view.toSVG();
    view.finalize();
    for (const t of ['100k', '200k', '300k']) expect(svg).toContain(`>${t}<`);
  });
});
