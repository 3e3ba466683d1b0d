import { numberFormatScript } from '../formatNumber.js';

/**
 * The report page's own script (plain ES2017, runs in the browser beside the inlined vega and
 * vega-lite builds). It compiles each map's vega-lite spec, draws it with vega.View, switches
 * between the precomputed variants of a map when its selector changes, and fills the read-out
 * panel with the hovered cell's numbers. Every value from the data goes in through textContent,
 * never innerHTML, so labels from user data stay text.
 */
export const PAGE_SCRIPT = String.raw`
(function () {
  'use strict';
  var data = JSON.parse(document.getElementById('datlas-data').textContent);
  var views = [];
  var current = [];
  var api = { views: views, current: current, data: data, errors: [], ready: null, render: render, cellAt: cellAt };
  window.datlas = api;

  // The tool's one number format (src/formatNumber.ts), its source embedded below.
  ${numberFormatScript()}
  function fmt(v) {
    return formatNumber(typeof v === 'number' ? v : NaN);
  }
  function el(tag, text, cls) {
    var e = document.createElement(tag);
    if (text !== undefined && text !== null) e.textContent = String(text);
    if (cls) e.className = cls;
    return e;
  }
  function clear(node) { while (node.firstChild) node.removeChild(node.firstChild); }

  /** The hovered cell's numbers: mean, interval, seeds, train error, the runs behind it. */
  function showCell(si, rec) {
    var sec = data.sections[si];
    var panel = document.getElementById('readout-' + si);
    clear(panel);
    panel.setAttribute('data-cell', String(rec.cell));
    panel.appendChild(el('div', sec.x + ' ' + fmt(rec.x) + ' · ' + sec.y + ' ' + fmt(rec.y), 'ro-head'));
    var dl = el('dl');
    function item(k, v, cls) { dl.appendChild(el('dt', k)); dl.appendChild(el('dd', v, cls)); }
    item('mean ' + sec.metric, fmt(rec.mean), 'ro-mean');
    item('95% interval', rec.low === null ? 'none (one seed)' : fmt(rec.low) + ' – ' + fmt(rec.high), 'ro-interval');
    item('sd', fmt(rec.sd));
    item('seeds', rec.n + (rec.seeds.length ? ' (' + rec.seeds.join(', ') + ')' : ''), 'ro-seeds');
    if (rec.diverged) item('diverged', String(rec.diverged));
    item('train error', fmt(rec.train));
    panel.appendChild(dl);
    panel.appendChild(el('div', 'runs behind it (seed: value)', 'ro-sub'));
    var ul = el('ul', null, 'ro-runs');
    rec.runs.slice(0, 12).forEach(function (r, k) {
      var li = el('li');
      li.appendChild(el('span', r, 'ro-run'));
      li.appendChild(el('span', ' · seed ' + rec.seeds[k] + ': ' + (rec.values[k] === null || rec.values[k] === undefined ? 'diverged' : fmt(rec.values[k])), 'ro-val'));
      ul.appendChild(li);
    });
    if (rec.runs.length > 12) ul.appendChild(el('li', '… ' + (rec.runs.length - 12) + ' more'));
    panel.appendChild(ul);
  }

  function ridgeTable(si, variant) {
    var sec = data.sections[si];
    var tbody = document.getElementById('ridge-' + si);
    clear(tbody);
    variant.ridge.forEach(function (r) {
      var tr = el('tr');
      [fmt(r.y), r.peak ? fmt(r.peak.x) : 'no peak', r.peak ? fmt(r.peak.low) + ' – ' + fmt(r.peak.high) : '', r.peak ? fmt(r.peak.error) : '',
        r.peak ? fmt(r.peak.prominence) + ' (' + fmt(r.peak.prominenceSe) + ' se)' : '', fmt(r.threshold), r.noiseFrom]
        .forEach(function (c) { tr.appendChild(el('td', c)); });
      tbody.appendChild(tr);
    });
    var notes = document.getElementById('notes-' + si);
    clear(notes);
    variant.cautions.forEach(function (c) { notes.appendChild(el('li', c)); });
    var meta = document.getElementById('meta-' + si);
    meta.textContent = variant.meta;
    void sec;
  }

  /** The measured cell whose edges hold a point in data units (for hovers off the rect marks). */
  function cellAt(si, x, y) {
    var v = data.sections[si].variants[current[si]];
    for (var i = 0; i < v.cells.length; i++) {
      var c = v.cells[i];
      if (x >= c.x0 && x < c.x1 && y >= c.y0 && y < c.y1) return c;
    }
    return null;
  }

  function render(si, vi) {
    var sec = data.sections[si];
    var variant = sec.variants[vi];
    var host = document.getElementById('map-' + si);
    if (views[si]) views[si].finalize();
    clear(host);
    current[si] = vi;
    host.setAttribute('data-variant', String(vi));
    var vg = vegaLite.compile(variant.spec).spec;
    var view = new vega.View(vega.parse(vg), { renderer: 'canvas', container: host, hover: true, logLevel: vega.Warn });
    views[si] = view;
    var onCell = function (event, item) {
      var d = item && item.datum;
      if (d && typeof d.cell === 'number' && variant.cells[d.cell]) showCell(si, variant.cells[d.cell]);
    };
    // Hover with a mouse; a tap on touch screens arrives as a click.
    view.addEventListener('mousemove', onCell);
    view.addEventListener('click', onCell);
    ridgeTable(si, variant);
    var panel = document.getElementById('readout-' + si);
    clear(panel);
    panel.removeAttribute('data-cell');
    panel.appendChild(el('div', 'Hover a cell to see its mean, interval, seeds and runs.', 'ro-hint'));
    return view.runAsync();
  }

  window.addEventListener('error', function (e) { api.errors.push(String(e.message)); });
  var jobs = data.sections.map(function (sec, si) {
    var select = document.getElementById('select-' + si);
    if (select) select.addEventListener('change', function () { render(si, Number(select.value)); });
    return render(si, sec.main);
  });
  api.ready = Promise.all(jobs).then(function () { document.body.setAttribute('data-ready', 'true'); });
})();
`;
