// The report's section on the spread from uncertain K: the district's net seepage with its range,
// and the strips ranked by loss per km with their P10-P90 bars, risk shares and how often they stay
// in the top of the ranking.
import type { SpreadResult } from '../screening/spread.js';
import { escapeHtml } from './escape.js';
import { formatGrouped } from '../output/format.js';

/** Strips shown (the top by median loss per km). */
const SHOWN = 20;

export function spreadSection(spread: SpreadResult): string {
  const n = (v: number) => (Number.isFinite(v) ? formatGrouped(v, 0) : '-');
  const strips = [...spread.strips].filter((s) => Number.isFinite(s.lossM3PerDayKm.p50)).sort((a, b) => b.lossM3PerDayKm.p50 - a.lossM3PerDayKm.p50).slice(0, SHOWN);
  const top = Math.max(...strips.map((s) => s.lossM3PerDayKm.p90), 1);
  const bar = (s: (typeof strips)[number]) => {
    const x = (v: number) => ((Math.max(v, 0) / top) * 200).toFixed(1);
    return `<svg xmlns="http://www.w3.org/2000/svg" width="210" height="14" class="spread-bar"><path d="M${x(s.lossM3PerDayKm.p10)} 7H${x(s.lossM3PerDayKm.p90)}" stroke="#1f5f99" stroke-width="4"/><circle cx="${x(s.lossM3PerDayKm.p50)}" cy="7" r="3.5" fill="#d55e00"/></svg>`;
  };
  const rows = strips
    .map(
      (s) =>
        `<tr><td>${escapeHtml(s.stripId)}</td><td class="num">${n(s.lossM3PerDayKm.p10)}</td><td class="num">${n(s.lossM3PerDayKm.p50)}</td><td class="num">${n(s.lossM3PerDayKm.p90)}</td><td>${bar(s)}</td>` +
        `<td class="num">${(s.topShare * 100).toFixed(0)}%</td><td class="num">${((s.riskShare.ponded + s.riskShare.waterlogged) * 100).toFixed(0)}%</td></tr>`,
    )
    .join('');
  return (
    `<section id="spread"><h2>Spread from uncertain hydraulic conductivity</h2>` +
    `<p class="run-line">${spread.options.samples} seeded draws (seed ${spread.options.seed}) of the K of ${spread.zones.length} zones with a range (log-normal, the range read as P10 and P90), ` +
    `drawn ${spread.options.correlated ? 'together (fully correlated)' : 'independently'}; each draw solves the strips again on the same geometry (the district solve is not repeated). ` +
    `What the losing lines lose (strips): P10 ${n(spread.lostByLosingLinesM3PerDay.p10)}, P50 ${n(spread.lostByLosingLinesM3PerDay.p50)}, P90 ${n(spread.lostByLosingLinesM3PerDay.p90)} m³/d; ` +
    `their net seepage moves less (${n(spread.netSeepageM3PerDay.p10)} to ${n(spread.netSeepageM3PerDay.p90)} m³/d), as recharge holds it. ` +
    `A reach that leaves the top ${spread.options.top} in many draws should not be lined on this screening alone.</p>` +
    `<table class="facts"><thead><tr><th>Strip</th><th>Loss per km P10 (m³/d per km)</th><th>P50</th><th>P90</th><th>P10 to P90 (dot: P50)</th><th>In the top ${spread.options.top}</th><th>Waterlogged or ponded</th></tr></thead><tbody>${rows}</tbody></table></section>`
  );
}
