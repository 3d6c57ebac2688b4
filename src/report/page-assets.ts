// The report's own style sheet and its one small script (hover on the map, sorting the table).
// Both are constants: no data is ever written into them, so nothing from the input can end a
// <script> or <style> element early. The page loads nothing from anywhere.
import { RANKING_COLUMNS } from '../output/layers.js';
import { LINE_COLOURS, STRIP_CLASSES, patternId } from './palette.js';

const TEXT_COLUMNS = new Set(['strip_id', 'line_a', 'line_b', 'flags', 'losing_line']);

/** How the table sorts a column of ranking.csv: as numbers, as text, or by risk class. */
export function columnKind(column: string): 'num' | 'text' | 'risk' {
  if (column === 'risk') return 'risk';
  return TEXT_COLUMNS.has(column) ? 'text' : 'num';
}

const NUMBER_CELLS = RANKING_COLUMNS.flatMap((column, i) => (columnKind(column) === 'num' ? [`table.ranking td:nth-child(${i + 1})`] : [])).join(',');

const STRIP_FILLS = STRIP_CLASSES.map((kind) => `.risk-${kind}{fill:url(#${patternId(kind)})}`).join('\n');

export const PAGE_CSS = `
:root{color-scheme:light;--ink:#1d1d1d;--muted:#5b5b5b;--rule:#d6d6d6;--panel:#f6f5f2}
*{box-sizing:border-box}
body{margin:0;font:14px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;color:var(--ink);background:#fff}
main{max-width:1320px;margin:0 auto;padding:16px 24px 48px}
h1{font-size:22px;margin:8px 0 2px}
h2{font-size:18px;margin:28px 0 8px;padding-bottom:4px;border-bottom:1px solid var(--rule)}
h3{font-size:13px;margin:12px 0 4px}
.run-line{color:var(--muted);margin:0 0 12px}
.caution-box{border-left:5px solid #D55E00;background:#fdf3ec;padding:10px 14px;margin:12px 0}
.caution-box p{margin:4px 0}
.totals-grid{display:grid;grid-template-columns:repeat(auto-fill,minmax(190px,1fr));gap:8px;margin:8px 0}
.total-card{background:var(--panel);border:1px solid var(--rule);padding:8px 10px}
.total-card .figure{font-size:18px;font-weight:600;display:block}
.total-card .what{color:var(--muted);font-size:12px}
.total-card.net-seepage{grid-column:span 2}
.net-seepage .what{display:block}
.net-seepage .what:first-child{color:var(--ink);font-weight:600}
.facts{border-collapse:collapse;margin:6px 0}
.facts th,.facts td{border-bottom:1px solid var(--rule);padding:3px 10px 3px 0;text-align:left;vertical-align:top}
.facts td.num{text-align:right;font-variant-numeric:tabular-nums}
table.lining td,table.lining-programme td{white-space:nowrap}
table.lining td.num,table.lining-programme td.num{text-align:right;font-variant-numeric:tabular-nums}
.hash{font-family:ui-monospace,Menlo,Consolas,monospace;font-size:12px;word-break:break-all}
.map-panel{display:grid;grid-template-columns:minmax(0,1fr) 300px;gap:16px;align-items:start}
.map-panel svg.district-map{width:100%;height:auto;display:block;background:#fff}
.map-key{font-size:12.5px}
.map-key ul{list-style:none;margin:0;padding:0}
.map-key li{display:flex;gap:8px;align-items:center;margin:3px 0}
.key-swatch{flex:none}
.key-note{color:var(--muted);font-size:12px;margin:4px 0}
.map-frame{fill:#fbfbf8;stroke:#999}
.map-zone{fill:#8c7b5a;fill-opacity:.06;stroke:#8c7b5a;stroke-width:1;stroke-dasharray:2 2}
.map-zone-label{font-size:11px;fill:#6b5d40}
.map-line-label{font-size:10px;fill:#1d1d1d;text-anchor:middle;paint-order:stroke;stroke:#fff;stroke-width:3px;stroke-linejoin:round;pointer-events:none}
.strip-shape{stroke:#3a3a3a;stroke-width:.4;fill-opacity:.9}
.over-raster .strip-shape{fill-opacity:.35;stroke-width:.8}
.map-depth{image-rendering:pixelated;opacity:.8}
.strip-shape:hover{stroke:#000;stroke-width:2}
${STRIP_FILLS}
.map-canal,.map-drain{fill:none;stroke-linecap:round;stroke-linejoin:round}
.map-canal{stroke:${LINE_COLOURS.canal}}
.map-drain{stroke:${LINE_COLOURS.drain};stroke-dasharray:5 3}
.map-unpaired{fill:none;stroke:${LINE_COLOURS.unpaired};stroke-opacity:.55;stroke-linecap:butt;pointer-events:stroke}
.district-map text{font-size:11px;fill:#000}
.map-tip{position:fixed;z-index:10;pointer-events:none;background:#fff;border:1px solid #333;box-shadow:0 2px 6px rgba(0,0,0,.25);padding:6px 8px;font-size:12px;max-width:340px;display:none}
.map-tip b{display:block;margin-bottom:2px}
.profile-grid{display:grid;grid-template-columns:repeat(auto-fill,minmax(560px,1fr));gap:14px}
.profile-card{margin:0;border:1px solid var(--rule);padding:6px}
.profile-card svg{width:100%;height:auto;display:block}
.profile-card figcaption{font-size:12.5px;color:var(--muted);padding:4px 2px 0}
.table-wrap{max-height:640px;overflow:auto;border:1px solid var(--rule)}
table.ranking{border-collapse:collapse;font-size:12.5px;width:100%}
table.ranking th{position:sticky;top:0;background:#eceae4;text-align:left;padding:0;border-bottom:1px solid #999}
table.ranking th button{font:inherit;font-weight:600;background:none;border:0;padding:5px 8px;cursor:pointer;width:100%;text-align:left;white-space:nowrap}
table.ranking th[aria-sort=ascending] button::after{content:" \\25B2"}
table.ranking th[aria-sort=descending] button::after{content:" \\25BC"}
table.ranking td{padding:3px 8px;border-bottom:1px solid #ececec;white-space:nowrap}
${NUMBER_CELLS}{text-align:right;font-variant-numeric:tabular-nums}
table.ranking tbody tr:hover{background:#f3f1ea}
ul.plain{margin:4px 0;padding-left:20px}
.table-cap{margin:4px 0 8px}
.table-cap button{font:inherit;margin-left:6px}
@media (max-width:900px){.map-panel{grid-template-columns:1fr}}
@media print{.map-tip{display:none!important}.table-wrap{max-height:none;overflow:visible}}
`;

// Hand-written, no library. Sorting keeps rows whose cell is empty (no value) last either way,
// and breaks ties by the current order so that a second sort refines the first.
export const PAGE_SCRIPT = `
(function () {
  'use strict';
  var table = document.getElementById('ranking-table');
  var map = document.querySelector('svg.district-map');
  var tip = document.getElementById('map-tip');
  if (!table) return;
  var body = table.tBodies[0];
  var heads = Array.prototype.slice.call(table.tHead.rows[0].cells);
  var riskOrder = { ponded: 0, waterlogged: 1, potential: 2, safe: 3, unsolved: 4 };

  function keyOf(row, col, kind) {
    var text = row.cells[col].textContent;
    if (text === '') return null;
    // numbers are grouped with thin spaces for reading, and a share is written with %
    if (kind === 'num') return Number(text.replace(/[\\s%]/g, ''));
    if (kind === 'risk') return text in riskOrder ? riskOrder[text] : 5;
    return text;
  }

  function sortBy(col, kind, descending) {
    var keyed = Array.prototype.map.call(body.rows, function (row, i) { return { row: row, key: keyOf(row, col, kind), i: i }; });
    keyed.sort(function (a, b) {
      if (a.key === null || b.key === null) return (a.key === null) - (b.key === null) || a.i - b.i;
      var c = a.key < b.key ? -1 : a.key > b.key ? 1 : 0;
      return (descending ? -c : c) || a.i - b.i;
    });
    // rows move while the body is out of the document, so the browser lays the table out once
    var parent = body.parentNode;
    parent.removeChild(body);
    keyed.forEach(function (k) { body.appendChild(k.row); });
    parent.appendChild(body);
  }

  heads.forEach(function (th, col) {
    var button = th.querySelector('button');
    if (!button) return;
    button.addEventListener('click', function () {
      var descending = th.getAttribute('aria-sort') === 'ascending';
      heads.forEach(function (other) { other.setAttribute('aria-sort', 'none'); });
      th.setAttribute('aria-sort', descending ? 'descending' : 'ascending');
      sortBy(col, th.getAttribute('data-kind'), descending);
    });
  });

  var showAll = document.getElementById('show-all-rows');
  if (showAll) {
    showAll.addEventListener('click', function () {
      table.classList.remove('is-capped');
      showAll.parentNode.hidden = true;
    });
  }

  if (!map || !tip) return;
  var rowsById = null;
  // the strip's figures on hover, in the table's words and units (each header carries them)
  var shown = ['line_a', 'line_b', 'loss_m3_d_km', 'loss_m3_d', 'losing_line', 'losing_share', 'min_depth_m', 'risk',
    'risk_area_ha', 'district_loss_m3_d_km', 'district_min_depth_m', 'flags'];
  var columns = heads.map(function (th) { return th.getAttribute('data-column'); });
  var idColumn = columns.indexOf('strip_id');
  var key = document.querySelector('.map-key');

  function rowOf(id) {
    if (rowsById === null) {
      rowsById = new Map();
      Array.prototype.forEach.call(body.rows, function (row) { rowsById.set(row.cells[idColumn].textContent, row); });
    }
    return rowsById.get(id);
  }

  function show(shape, event) {
    var id = shape.getAttribute('data-strip-id');
    var row = rowOf(id);
    tip.textContent = '';
    var head = document.createElement('b');
    head.textContent = 'Strip ' + id;
    tip.appendChild(head);
    if (row) {
      shown.forEach(function (name) {
        var col = columns.indexOf(name);
        var text = col < 0 ? '' : row.cells[col].textContent;
        if (text === '') return;
        var unit = heads[col].getAttribute('data-unit');
        var line = document.createElement('div');
        line.textContent = heads[col].getAttribute('data-words') + ': ' + text + (unit === '%' ? '%' : unit ? ' ' + unit : '');
        tip.appendChild(line);
      });
    }
    tip.style.display = 'block';
    move(event);
  }

  function clamp(v, low, high) { return Math.max(low, Math.min(v, high)); }
  function meets(x, y, w, h, box) { return x < box.right && box.left < x + w && y < box.bottom && box.top < y + h; }

  // beside the pointer, on the first side where the tip stays in the window and off the map's key;
  // where every side meets the key, beside the key instead
  function move(event) {
    var w = tip.offsetWidth, h = tip.offsetHeight, gap = 14;
    var cx = event.clientX, cy = event.clientY;
    var keyBox = key ? key.getBoundingClientRect() : null;
    var places = [[cx + gap, cy + gap], [cx - w - gap, cy + gap], [cx + gap, cy - h - gap], [cx - w - gap, cy - h - gap]];
    if (keyBox) places.push([keyBox.left - w - gap, cy + gap], [cx + gap, keyBox.top - h - gap], [cx + gap, keyBox.bottom + gap]);
    var chosen = null;
    for (var i = 0; i < places.length && chosen === null; i++) {
      var x = clamp(places[i][0], 4, window.innerWidth - w - 4), y = clamp(places[i][1], 4, window.innerHeight - h - 4);
      if (!keyBox || !meets(x, y, w, h, keyBox)) chosen = [x, y];
    }
    if (chosen === null) chosen = [clamp(places[0][0], 4, window.innerWidth - w - 4), clamp(places[0][1], 4, window.innerHeight - h - 4)];
    tip.style.left = chosen[0] + 'px';
    tip.style.top = chosen[1] + 'px';
  }

  map.addEventListener('mouseover', function (event) {
    var shape = event.target.closest ? event.target.closest('.strip-shape') : null;
    if (shape) show(shape, event);
  });
  map.addEventListener('mousemove', function (event) { if (tip.style.display === 'block') move(event); });
  map.addEventListener('mouseout', function (event) {
    var shape = event.target.closest ? event.target.closest('.strip-shape') : null;
    if (shape) tip.style.display = 'none';
  });
})();
`;
