import { fixtureMap, fixtureRidge } from './mapFixture.js';
import { writeMapImages } from '../../src/render/writeMapImages.js';
const map = fixtureMap({ missing: [[2, 3], [7, 5], [8, 5]], diverged: [[4, 6], [7, 5]] });
const ridge = fixtureRidge(map, { noPeak: [0, 4], weak: [6] });
let t = Date.now();
console.log(await writeMapImages({ map, ridge, outDir: '/tmp/r6/out', formats: ['png', 'svg', 'pdf'] }), Date.now() - t);
t = Date.now();
console.log(await writeMapImages({ map, ridge, outDir: '/tmp/r6/out', formats: ['png'], raster: true, name: 'raster', colors: 'magma', withSlices: false }), Date.now() - t);
const m2 = fixtureMap({ seeds: 1 });
const r2 = fixtureRidge(m2, { curve: true });
const m3 = { ...map, fixed: { ...map.fixed, label_noise: 0 } };
await writeMapImages({ map, ridge, outDir: '/tmp/r6/out', formats: ['png'], name: 'facet', withSlices: false,
  facets: { panels: [{ map: m3, ridge, label: 'label noise 0%' }, { map: m2, ridge: r2, label: 'label noise 20%' }] } });
