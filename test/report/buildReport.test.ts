import { describe, expect, it } from 'vitest';
import { buildReport } from '../../src/report/buildReport.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { SYN, syntheticRows, syntheticTable } from './syntheticSweep.js';

describe('buildReport', () => {
  const table = syntheticTable(syntheticRows());
  const model = buildReport({ table, title: 'Synthetic', boot: 100, now: '2026-12-01T00:00:00.000Z' });

  it('states the sweep facts', () => {
    // 7 widths × 3 sizes × 2 noise × 3 seeds runs, 4 logged epochs each.
    expect(model.facts.runs).toBe(126);
    expect(model.facts.rows).toBe(504);
    expect(model.facts.seeds).toEqual({ distinct: 3, perCellMin: 3, perCellMax: 3 });
    expect(model.facts.axes.find((a) => a.name === 'width')!.values).toEqual(SYN.widths);
  });

  it('offers every combination of the fixed values when there are few, and shows the one with the most peaks first', () => {
    const m = model.maps.find((s) => s.kind === 'model')!;
    // train_size (3) × label_noise (2) = 6 model-wise maps.
    expect(m.variants).toHaveLength(6);
    expect(new Set(m.variants.map((v) => v.label)).size).toBe(6);
    const peaks = (i: number) => (m.variants[i].ridge?.rows ?? []).filter((r) => r.peak !== null).length;
    for (let i = 0; i < m.variants.length; i++) expect(peaks(m.main)).toBeGreaterThanOrEqual(peaks(i));
    // The shown map is interpolated by the method leave-one-out picked, on a full raster.
    expect(m.variants[m.main].map.raster.nx).toBeGreaterThan(8);
  });

  it('draws the epoch-wise map at the measured width nearest the model-wise peak', () => {
    const m = model.maps.find((s) => s.kind === 'model')!;
    const e = model.maps.find((s) => s.kind === 'epoch')!;
    const peak = m.variants[m.main].ridge!.rows.filter((r) => r.peak).sort((a, b) => b.y - a.y)[0].peak!.x;
    const w = e.variants.map((v) => v.map.fixed.width as number);
    const nearest = SYN.widths.reduce((b, x) => (Math.abs(Math.log(x / peak)) < Math.abs(Math.log(b / peak)) ? x : b));
    expect(w).toContain(nearest);
  });

  it('skips the kinds a sweep cannot support and says why', () => {
    const one = syntheticTable(syntheticRows({ skip: (_w, n) => n !== 64 }));
    const r = buildReport({ table: one, title: 'one size', boot: 50 });
    expect(r.maps.map((m) => m.kind)).toEqual(['model']);
    expect(r.skipped).toEqual([
      { kind: 'sample', reason: 'the sweep has 1 value of train_size; this map needs at least 3' },
      { kind: 'epoch', reason: 'the sweep has 1 value of train_size; this map needs at least 2' },
    ]);
    expect(r.hurts).toEqual([]);
  });

  it('warns about one-seed cells and never reports a peak for them from seeds', () => {
    const single = syntheticTable(syntheticRows({ skip: (_w, _n, _q, s) => s !== 0 }));
    const r = buildReport({ table: single, title: 'one seed', boot: 50 });
    expect(r.cautions.some((c) => c.startsWith('Some cells have one seed'))).toBe(true);
    for (const sec of r.maps) for (const v of sec.variants) for (const row of v.ridge?.rows ?? []) if (row.peak) expect(row.noiseFrom).toBe('curve');
  });

  it('offers each condition in the selector and compares the peak across conditions', () => {
    const rows = syntheticRows({ skip: (_w, n, q) => n === 32 || q === 0.1 });
    const t = tableFromRows([
      ...rows.map((r) => ({ ...r, condition: 'optimizer=adam' })),
      ...rows.map((r) => ({ ...r, run: `sgd-${r.run}`, condition: 'optimizer=sgd', test_error: r.test_error + 0.02 })),
    ]);
    const r = buildReport({ table: t, title: 'conditions', boot: 50 });
    const m = r.maps.find((s) => s.kind === 'model')!;
    expect(m.selector).toContain('condition');
    expect(new Set(m.variants.map((v) => v.map.fixed.condition))).toEqual(new Set(['optimizer=adam', 'optimizer=sgd']));
    expect(r.findings.some((f) => f.startsWith('By condition, the model-wise peak') && f.includes('optimizer=sgd: width'))).toBe(true);
  });

  it('says when runs diverged and when seeds per configuration are uneven', () => {
    const rows = syntheticRows({ skip: (w, n, q, s) => w === 8 && n === 64 && q === 0.1 && s === 2 });
    const t = tableFromRows(
      rows.map((r) => (r.width === 256 && r.train_size === 32 && r.label_noise === 0.2 && r.seed === 1 && r.epochs >= 100 ? { ...r, test_error: NaN, status: 'diverged' as const } : r)),
    );
    const r = buildReport({ table: t, title: 'gaps', boot: 50 });
    expect(r.facts.seeds).toEqual({ distinct: 3, perCellMin: 2, perCellMax: 3 });
    expect(r.findings).toContain('Seeds per configuration range from 2 to 3: configurations with fewer seeds have wider intervals and weaker tests.');
    expect(r.findings).toContain('1 of 125 runs diverged somewhere along their curve; their values are left out of the means (marked on the maps).');
  });
});

describe('buildReport, epoch-wise rows as curves', () => {
  // Same answer as `datlas ridge` on the same store.
  // Invented one-seed logs of 400 epochs (log-spaced 1..10^4) with evaluation noise and 1% one-epoch
  // spikes: the epoch-wise ridge must test every logged epoch, as `datlas ridge` does, not the
  // shown map's 100 (common practice: a spike is not a double-descent peak).
  function curves(opts: { bump: boolean; noiseSeed: number }) {
    let s = opts.noiseSeed * 7919 + 17;
    const rnd = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
    const gauss = () => Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd());
    const rows = [];
    for (const width of [16, 32, 64])
      for (const train_size of [64, 128])
        for (let i = 0; i < 400; i++) {
          const epochs = Math.round(10 ** ((4 * i) / 399));
          const le = Math.log10(epochs);
          // Falling to 0.2 by epoch ~30; with the bump, a broad rise to ~0.29 over epochs 100–300.
          let err = 0.2 + 0.3 * Math.exp(-le * 2) + (opts.bump ? 0.09 * Math.exp(-(((le - 2.3) / 0.3) ** 2)) : 0);
          err += 0.004 * gauss() + (rnd() < 0.01 ? 0.05 : 0);
          rows.push({ run: `w${width}-n${train_size}`, width, train_size, label_noise: 0.1, seed: 0, epochs, test_error: err, train_error: Math.max(0, 0.3 - le * 0.1) });
        }
    return tableFromRows(rows);
  }
  const epochRows = (t: ReturnType<typeof tableFromRows>) => {
    const r = buildReport({ table: t, title: 'curves', boot: 100 });
    return r.maps.find((m) => m.kind === 'epoch')!.variants.flatMap((v) => v.ridge?.rows ?? []);
  };

  it('reports no peak on falling curves with one-epoch spikes', () => {
    for (const noiseSeed of [1]) for (const row of epochRows(curves({ bump: false, noiseSeed }))) expect(row.peak).toBeNull();
  });

  it('finds the broad rise over epochs 100–300', () => {
    const rows = epochRows(curves({ bump: true, noiseSeed: 1 }));
    const peaks = rows.filter((r) => r.peak !== null).map((r) => r.peak!.x);
    expect(peaks.length).toBeGreaterThan(0);
    for (const x of peaks) {
      expect(x).toBeGreaterThan(80);
      expect(x).toBeLessThan(450);
    }
  });
});
