// The report's section on the wells: observed against computed water table (a scatter plot with
// the line of perfect fit), a map of the residuals over the zone outlines, and the figures per zone
// with the suggested conductivity multipliers.
import type { WellsOutcome } from '../output/wells-tables.js';
import type { ScreenResult } from '../screening/screen.js';
import { escapeHtml } from './escape.js';
import { formatFixed } from '../output/format.js';

const W = 360, H = 300, PAD = 46;

function scatter(outcome: WellsOutcome): string {
  const points = outcome.comparison.figures.filter((f) => Number.isFinite(f.residualM));
  if (points.length === 0) return '<p>No well has a computed water table.</p>';
  const values = points.flatMap((f) => [f.well.observedM, f.computedM]);
  let lo = Math.min(...values), hi = Math.max(...values);
  const margin = Math.max((hi - lo) * 0.05, 0.1);
  lo -= margin;
  hi += margin;
  const sx = (v: number) => PAD + ((v - lo) / (hi - lo)) * (W - PAD - 10);
  const sy = (v: number) => H - PAD - ((v - lo) / (hi - lo)) * (H - PAD - 10);
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((t) => lo + t * (hi - lo));
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="wells-scatter" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="observed against computed water table">` +
    `<rect x="${PAD}" y="10" width="${W - PAD - 10}" height="${H - PAD - 10}" fill="#fafaf7" stroke="#999999"/>` +
    `<path class="wells-one-to-one" d="M${sx(lo).toFixed(1)} ${sy(lo).toFixed(1)}L${sx(hi).toFixed(1)} ${sy(hi).toFixed(1)}" stroke="#777777" stroke-dasharray="4 3"/>` +
    ticks.map((t) => `<text x="${sx(t).toFixed(1)}" y="${H - PAD + 14}" font-size="10" text-anchor="middle">${formatFixed(t, 1)}</text><text x="${PAD - 4}" y="${(sy(t) + 3).toFixed(1)}" font-size="10" text-anchor="end">${formatFixed(t, 1)}</text>`).join('') +
    `<text x="${(PAD + W) / 2}" y="${H - 8}" font-size="11" text-anchor="middle">observed water table, m</text>` +
    `<text x="12" y="${(H - PAD) / 2}" font-size="11" text-anchor="middle" transform="rotate(-90 12 ${(H - PAD) / 2})">computed water table, m</text>` +
    points
      .map((f) => `<circle class="well-point" cx="${sx(f.well.observedM).toFixed(1)}" cy="${sy(f.computedM).toFixed(1)}" r="3.5" fill="#1f5f99" fill-opacity="0.8"><title>${escapeHtml(`${f.well.id}: observed ${f.well.observedM.toFixed(2)} m, computed ${f.computedM.toFixed(2)} m`)}</title></circle>`)
      .join('') +
    `</svg>`
  );
}

function residualMap(result: ScreenResult, outcome: WellsOutcome): string {
  const { polygons } = result.zoneIndex;
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const rings of polygons.rings) for (const ring of rings) for (let i = 0; i < ring.length; i += 2) {
    x0 = Math.min(x0, ring[i]); x1 = Math.max(x1, ring[i]); y0 = Math.min(y0, ring[i + 1]); y1 = Math.max(y1, ring[i + 1]);
  }
  const scale = Math.min((W * 1.4 - 20) / (x1 - x0), (H - 20) / (y1 - y0));
  const width = (x1 - x0) * scale + 20, height = (y1 - y0) * scale + 20;
  const px = (x: number) => 10 + (x - x0) * scale, py = (y: number) => 10 + (y1 - y) * scale;
  const outlines = polygons.rings
    .map((rings) => rings.map((ring) => {
      let d = '';
      for (let i = 0; i < ring.length; i += 2) d += `${i === 0 ? 'M' : 'L'}${px(ring[i]).toFixed(1)} ${py(ring[i + 1]).toFixed(1)}`;
      return `<path d="${d}Z" fill="#f4f1e8" stroke="#b7ad92"/>`;
    }).join(''))
    .join('');
  const largest = Math.max(...outcome.comparison.figures.map((f) => (Number.isFinite(f.residualM) ? Math.abs(f.residualM) : 0)), 0.01);
  const wells = outcome.comparison.figures
    .filter((f) => Number.isFinite(f.residualM))
    .map((f) => {
      const [x, y] = result.crs.forward([f.well.lon, f.well.lat]);
      const r = 2.5 + 6 * Math.sqrt(Math.abs(f.residualM) / largest);
      // computed above observed (the screening too wet there) in orange, below in blue
      const colour = f.residualM > 0 ? '#d55e00' : '#0072b2';
      return `<circle class="well-residual" cx="${px(x).toFixed(1)}" cy="${py(y).toFixed(1)}" r="${r.toFixed(1)}" fill="${colour}" fill-opacity="0.75"><title>${escapeHtml(`${f.well.id}: residual ${f.residualM >= 0 ? '+' : ''}${f.residualM.toFixed(2)} m`)}</title></circle>`;
    })
    .join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" class="wells-map" viewBox="0 0 ${width.toFixed(0)} ${height.toFixed(0)}" width="${width.toFixed(0)}" height="${height.toFixed(0)}" role="img" aria-label="residuals at the wells">${outlines}${wells}</svg>`;
}

export function wellsSection(result: ScreenResult, outcome: WellsOutcome): string {
  const { comparison, fit } = outcome;
  const f = (v: number, d = 2) => (Number.isFinite(v) ? formatFixed(v, d) : '-');
  const rows = fit.zones
    .map((zone) => {
      const stats = comparison.byZone.find((z) => z.zoneId === zone.zoneId)?.summary;
      return (
        `<tr><td>${escapeHtml(zone.zoneId)}</td><td class="num">${stats?.count ?? 0}</td><td class="num">${f(stats?.meanErrorM ?? NaN)}</td><td class="num">${f(stats?.rmseM ?? NaN)}</td>` +
        `<td class="num">${zone.fitted ? `x${f(zone.multiplier)}${zone.atBound ? ' (at its bound)' : ''}` : zone.wells > 0 ? 'not fitted (only the zones with most wells are)' : '-'}</td></tr>`
      );
    })
    .join('');
  return (
    `<section id="wells"><h2>Checks against wells</h2>` +
    `<p class="run-line">${comparison.all.count} of ${comparison.figures.length} wells of ${escapeHtml(comparison.file)} compared with the computed water table ` +
    `(the district solve's where it ran, else the strip transect the well stands on)${comparison.uncovered > 0 ? `; ${comparison.uncovered} have none (wells.csv says why)` : ''}: ` +
    `mean error ${f(comparison.all.meanErrorM)} m (computed less observed), RMSE ${f(comparison.all.rmseM)} m. ` +
    `The multipliers of each zone's K that best fit the wells (least squares in log K, between 0.1 and 10) are ${outcome.applied ? '<strong>applied to this run</strong> (--apply-k-fit)' : 'suggested only, not applied'}; ` +
    `at the fit's resolution they take the RMSE from ${f(fit.rmseBeforeM)} to ${f(fit.rmseAfterM)} m. A fit to a few wells is a hint, not a calibration.</p>` +
    `<div class="wells-figures">${scatter(outcome)}${residualMap(result, outcome)}</div>` +
    `<p class="run-line">On the map, orange: computed above observed; blue: below; the size grows with the residual.</p>` +
    `<table class="facts"><thead><tr><th>Zone</th><th>Wells</th><th>Mean error (m)</th><th>RMSE (m)</th><th>Suggested K multiplier</th></tr></thead><tbody>${rows}</tbody></table></section>`
  );
}
