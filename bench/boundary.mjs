// The arquero boundary of the library, measured in one process on a store (npm run bench runs it
// on the 1M-row bench store; `node bench/boundary.mjs STORE [REPS]` by hand). Prints one JSON line.
// Imports the package by its name: the built dist/, as a user's script would.
import { buildMap, fromArquero, openStore } from 'descent-atlas';

const [store, repsText = '5'] = process.argv.slice(2);
const reps = Number(repsText);
const ms = (t0) => performance.now() - t0;
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
function time(fn) {
  fn(); // warm-up: first calls compile
  const out = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    fn();
    out.push(ms(t0));
  }
  return median(out);
}
async function timeAsync(fn) {
  await fn();
  const out = [];
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    await fn();
    out.push(ms(t0));
  }
  return median(out);
}

let t0 = performance.now();
const s = await openStore(store);
const openFirst = ms(t0);
const rows = s.rows;
t0 = performance.now();
s.toArquero();
// The first call also decodes the text columns from the file's dictionary codes (kept afterwards).
const toArqueroFirst = ms(t0);
const per1M = (v) => (v * 1e6) / rows;

const toArquero = time(() => s.toArquero());
const aq = s.toArquero();
const fromWhole = time(() => fromArquero(aq));
// Keep the wider half of the widths: a filter a user would write.
const widths = [...new Set(s.table.width)].sort((a, b) => a - b);
const cut = widths[Math.floor(widths.length / 2)];
const keep = `d => d.width >= ${cut}`;
const filtered = aq.filter(keep);
const filteredRows = filtered.numRows();
const filterVerb = time(() => aq.filter(keep).numRows());
const fromFiltered = time(() => fromArquero(filtered));
const mapOpts = { kind: 'model', method: 'linear', raster: { nx: 64, ny: 64 }, ridge: false };
const mapStore = await timeAsync(() => buildMap(s, mapOpts));
const mapArquero = await timeAsync(() => buildMap(aq, mapOpts));

const r = (v) => Number(v.toFixed(1));
process.stdout.write(`${JSON.stringify({
  rows, reps, filter: keep, openStoreFirstMs: r(openFirst), toArqueroFirstMs: r(toArqueroFirst),
  toArqueroMs: r(toArquero), toArqueroMsPer1M: r(per1M(toArquero)),
  fromArqueroMs: r(fromWhole), fromArqueroMsPer1M: r(per1M(fromWhole)),
  filterVerbMs: r(filterVerb), filteredRows, fromFilteredMs: r(fromFiltered), fromFilteredMsPer1MActive: r((fromFiltered * 1e6) / filteredRows),
  buildMapStoreMs: r(mapStore), buildMapArqueroMs: r(mapArquero),
})}\n`);
