// The lining planner's section of report.html: the plan's reaches and what each would save, the
// programme the budget allows with its running totals, and before/after cross-sections of the
// strips that the programme's first reaches change most.
import { m3PerDayToM3PerYear } from '../shared/units.js';
import type { LiningOutcome } from '../screening/lining.js';
import { profileOfFacing } from '../screening/profile.js';
import { escapeHtml } from './escape.js';
import { orientFromLineA, renderProfileSvg } from './profile-svg.js';
import { formatGrouped } from '../output/format.js';

function num(value: number | null, decimals = 0): string {
  return value === null || !Number.isFinite(value) ? '' : formatGrouped(value, decimals);
}

/** Before/after cross-sections for this many of the programme's first reaches. */
const PROFILED_REACHES = 3;

export function liningSection(outcome: LiningOutcome): string {
  const method = outcome.method === 'district' ? 'the district solve' : 'the strips alone (no district solve ran: neighbours and line ends are not seen)';
  const rows = outcome.reaches
    .map((r) => {
      const rank = outcome.programme.findIndex((step) => step.outcome === r);
      return (
        `<tr><td>${escapeHtml(r.reach.id)}</td><td>${escapeHtml(r.reach.lineId)}</td><td class="num">${num(r.fromM)}</td><td class="num">${num(r.toM)}</td>` +
        `<td class="num">${num(r.reach.resistanceD, 1)}</td><td class="num">${num(r.lineLossNowM3PerDay)}</td><td class="num">${num(r.lineLossLinedM3PerDay)}</td>` +
        `<td class="num">${num(r.savedM3PerDay)}</td><td class="num">${num(m3PerDayToM3PerYear(r.savedM3PerDay))}</td><td class="num">${num(r.savedM3PerDayKm)}</td>` +
        `<td class="num">${num(r.costPer1000M3, 2)}</td><td class="num">${num(r.waterloggedHaChange, 1)}</td><td class="num">${rank >= 0 ? rank + 1 : ''}</td></tr>`
      );
    })
    .join('');
  const steps = outcome.programme
    .map(
      (step, i) =>
        `<tr><td class="num">${i + 1}</td><td>${escapeHtml(step.outcome.reach.id)}</td><td>${escapeHtml(step.outcome.reach.lineId)}</td>` +
        `<td class="num">${num(step.outcome.lengthM / 1000, 2)}</td><td class="num">${num(step.outcome.savedM3PerDay)}</td>` +
        `<td class="num">${num(step.kmTotal, 2)}</td><td class="num">${num(step.costTotal)}</td><td class="num">${num(step.savedM3PerDayTotal)}</td></tr>`,
    )
    .join('');
  const budget = outcome.plan.budget === null ? 'no budget: every reach that saves water, best first' : 'km' in outcome.plan.budget ? `a budget of ${outcome.plan.budget.km} km` : `a budget of ${num(outcome.plan.budget.money)} ${escapeHtml(outcome.plan.currency)}`;
  const programmeLine =
    outcome.programme.length === 0
      ? '<p>No reach of the plan saves water, or none fits the budget: the programme is empty.</p>'
      : `<p class="run-line">With all ${outcome.programme.length} reaches of the programme lined at once the canals keep ${num(outcome.programmeSavedM3PerDay)} m³/d ` +
        `(${num(m3PerDayToM3PerYear(outcome.programmeSavedM3PerDay))} m³/yr; the reaches' own savings add up to ${num(outcome.programme[outcome.programme.length - 1].savedM3PerDayTotal)} m³/d, ` +
        `as lining one reach changes what its neighbours lose); the waterlogged area changes by ${num(outcome.programmeWaterloggedHaChange, 1)} ha and the potentially waterlogged by ${num(outcome.programmePotentialHaChange, 1)} ha.</p>`;
  return (
    `<section id="lining"><h2>Lining plan</h2>` +
    `<p class="run-line">Plan ${escapeHtml(outcome.plan.file)}; every figure from ${method}, screened again with each reach's lining in place of its bed ` +
    `(${outcome.screenings} screenings). Saved water is what all canals together stop losing, neighbours included; the lined line's own loss is beside it. ` +
    `Programme ranked by ${outcome.rankedBy}, within ${budget}. Cost per 1,000 m³ is the reach's cost over its saving in ${outcome.plan.lifeYears ?? '(no life given)'} years, undiscounted.</p>` +
    `<table class="lining"><thead><tr><th>Reach</th><th>Line</th><th>From (m)</th><th>To (m)</th><th>Lined resistance (d)</th><th>Line loss now (m³/d)</th><th>Line loss lined (m³/d)</th>` +
    `<th>Saved (m³/d)</th><th>Saved (m³/yr)</th><th>Saved per km (m³/d per km)</th><th>Cost per 1,000 m³ (${escapeHtml(outcome.plan.currency)})</th><th>Waterlogged area change (ha)</th><th>Programme rank</th></tr></thead><tbody>${rows}</tbody></table>` +
    `<h3>Programme</h3>${programmeLine}` +
    (steps
      ? `<table class="lining-programme"><thead><tr><th>Rank</th><th>Reach</th><th>Line</th><th>Length (km)</th><th>Saved (m³/d)</th><th>Running km</th><th>Running cost (${escapeHtml(outcome.plan.currency)})</th><th>Running saved (m³/d)</th></tr></thead><tbody>${steps}</tbody></table>`
      : '') +
    beforeAfter(outcome) +
    `</section>`
  );
}

function beforeAfter(outcome: LiningOutcome): string {
  const after = outcome.resultProgramme;
  if (!after) return '';
  const { stations } = outcome.resultNow;
  const figures: string[] = [];
  for (const step of outcome.programme.slice(0, PROFILED_REACHES)) {
    const { line, fromM, toM } = step.outcome;
    // the strip beside the lined line that the reach changes most: its own transects show the lining
    const beside = step.outcome.affectedStrips
      .map((affected) => outcome.resultNow.strips.find((s) => s.stripId === affected.stripId))
      .find((s) => s !== undefined && (s.strip.lineA === line || s.strip.lineB === line));
    if (!beside) continue;
    const stripAfter = after.strips.find((s) => s.stripId === beside.stripId);
    if (!stripAfter) continue;
    // a transect cast from the lined line inside the lined range: the middle one
    const own = beside.strip.lineA === line ? beside.facingsA : beside.facingsB;
    const inside = [...own].filter((facing) => stations.chainageM[facing >> 1] >= fromM && stations.chainageM[facing >> 1] <= toM);
    if (inside.length === 0) continue;
    const facing = inside[Math.floor(inside.length / 2)];
    const now = profileOfFacing(outcome.resultNow, beside, facing);
    const lined = profileOfFacing(after, stripAfter, facing);
    if (!now || !lined) continue;
    const at = `${formatGrouped(stations.chainageM[facing >> 1], 0)} m along ${escapeHtml(step.outcome.reach.lineId)}`;
    figures.push(
      `<figure class="profile-card"><figcaption>Reach ${escapeHtml(step.outcome.reach.id)}: strip ${escapeHtml(beside.stripId)} at ${at}, now</figcaption>${renderProfileSvg(orientFromLineA(now, beside.lineAId))}</figure>` +
        `<figure class="profile-card"><figcaption>the same transect with the programme lined</figcaption>${renderProfileSvg(orientFromLineA(lined, stripAfter.lineAId))}</figure>`,
    );
  }
  if (figures.length === 0) return '';
  return (
    `<h3>Before and after</h3><p class="run-line">For each of the programme's first reaches, the strip beside the lined line that it changes most, ` +
    `on a transect cast from the lined reach (the strips' own solution, with the lining in the bed's place), now and with the whole programme lined.</p>` +
    `<div class="profile-grid">${figures.join('\n')}</div>`
  );
}
