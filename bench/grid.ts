/**
 * Grid benchmark: interpolation speed on sweep-sized inputs (figures, not pass/fail).
 *   node --import tsx bench/grid.ts
 * Targets from the issue: linear on 5,000 cells to a 256×256 raster < 0.3 s; gp with 2,000 cells < 10 s.
 */
import { buildMap } from '../src/grid/buildMap.js';
import { gaussianProcessField } from '../src/grid/gaussianProcessField.js';
import type { ScatterPoints } from '../src/grid/Interpolator.js';
import { linearField } from '../src/grid/linearField.js';
import { thinPlateField } from '../src/grid/thinPlateField.js';
import { tableFromRows } from '../src/store/tableFromRows.js';
import type { RowRecord } from '../src/store/tableFromRows.js';

/** Cells on an nx × ny grid in the unit square with a double-descent-like ridge plus seed noise. */
function gridPoints(nx: number, ny: number): ScatterPoints {
  const n = nx * ny;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const v = new Float64Array(n);
  let k = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      x[k] = i / (nx - 1);
      y[k] = j / (ny - 1);
      v[k] = 0.3 - 0.1 * x[k] + 0.15 * y[k] * Math.exp(-(((x[k] - 0.4) / 0.08) ** 2)) + 0.005 * Math.sin(97 * k);
      k++;
    }
  }
  return { dims: 2, x, y, v, noise: new Float64Array(n).fill(0.005 ** 2) };
}

const raster = Float64Array.from({ length: 256 }, (_, i) => i / 255);
const ms = (t0: number) => performance.now() - t0;
const fmt = (t: number) => `${(t / 1000).toFixed(3)} s`;
/** CPU milliseconds of this process: on a shared, loaded machine wall time overstates the cost. */
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

function time(label: string, points: ScatterPoints, fit: (p: ScatterPoints) => ReturnType<typeof linearField>, repeats: number) {
  let best = { fit: Infinity, grid: Infinity, cpu: Infinity };
  for (let r = 0; r < repeats; r++) {
    const c0 = cpuMs();
    const t0 = performance.now();
    const f = fit(points);
    const t1 = performance.now();
    f.grid(raster, raster);
    const t2 = performance.now();
    if (t2 - t0 < best.fit + best.grid) best = { fit: t1 - t0, grid: t2 - t1, cpu: cpuMs() - c0 };
  }
  console.log(`${label.padEnd(34)} fit+leave-one-out ${fmt(best.fit)}  raster 256×256 ${fmt(best.grid)}  total ${fmt(best.fit + best.grid)} (cpu ${fmt(best.cpu)})`);
}

const p5000 = gridPoints(100, 50);
const p2000 = gridPoints(50, 40);
console.log(`load average ${(await import('node:os')).loadavg().map((l) => l.toFixed(1)).join(' ')} on ${(await import('node:os')).cpus().length} cores`);
time('linear, 5,000 cells (best of 5)', p5000, linearField, 5);
time('thin-plate, 5,000 cells', p5000, thinPlateField, 1);
time('gp, 2,000 cells (incl. hyper fit)', p2000, gaussianProcessField, 1);

// End to end from rows: 5,000 cells (100 widths × 50 epochs × 2 seeds), auto (gp not tried beyond its limit).
const rows: Partial<RowRecord>[] = [];
for (let i = 0; i < 100; i++) {
  for (let s = 0; s < 2; s++) {
    for (let j = 0; j < 50; j++) {
      const w = 2 ** (1 + i / 10);
      const e = Math.round(10 ** (j / 10));
      rows.push({ run: `r${i}-${s}`, seed: s, width: w, epochs: e + j, train_size: 1000, test_error: 0.3 - 0.01 * Math.log2(w) + 0.002 * s + 0.001 * Math.sin(i * j) });
    }
  }
}
const table = tableFromRows(rows);
for (const method of ['linear', 'auto'] as const) {
  const c0 = cpuMs();
  const t0 = performance.now();
  const map = buildMap(table, { kind: 'model', method });
  console.log(`${`buildMap ${method}, ${map.cells.length} cells`.padEnd(34)} ${fmt(ms(t0))} (cpu ${fmt(cpuMs() - c0)}; method ${map.method}, LOO RMSE ${map.loo.rmse.toPrecision(3)})`);
}
