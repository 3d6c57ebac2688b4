// report.html: one self-contained page from a screening result (summary, map, cross-sections of the
// top strips, the ranked table, the run). Pure: same result and meta in, same bytes out. Inline
// CSS, inline SVG and one small inline script; a Content-Security-Policy forbids every fetch.
import { liningSection } from './lining-section.js';
import { wellsSection } from './wells-section.js';
import { spreadSection } from './spread-section.js';
import type { SpreadResult } from '../screening/spread.js';
import type { WellsOutcome } from '../output/wells-tables.js';
import type { LiningOutcome } from '../screening/lining.js';
import { bedsText, bedsUsed } from '../screening/beds.js';
import { FACING_REASON_NAMES } from '../geometry/index.js';
import { CAUTION, NET_SEEPAGE_NAME, netSeepageTotals, type NetSeepage } from '../output/run-record.js';
import { lineTableRow, RANKING_COLUMNS, rankedLines, rankingRow } from '../output/layers.js';
import { keyFacing, profileOfFacing } from '../screening/profile.js';
import type { ScreenResult } from '../screening/screen.js';
import type { InputRules } from '../shared/input-rules.js';
import { escapeHtml } from './escape.js';
import { formatFixed, formatGrouped, joinedInPieces } from '../output/format.js';
import { districtMapPieces } from './map-svg.js';
import { columnKind, PAGE_CSS, PAGE_SCRIPT } from './page-assets.js';
import { STRIP_CLASSES, STRIP_STYLES, patternId } from './palette.js';
import { orientFromLineA, renderProfileSvg } from './profile-svg.js';

export interface ReportInput {
  label: string;
  path: string;
  sha256: string;
  /** The CRS the file was written in, as the reader named it; null for lon/lat (WGS 84) as RFC 7946 asks. */
  sourceCrs?: string | null;
}

export interface ReportMeta {
  version: string;
  commandLine: string[];
  /** When the run started (ISO 8601, UTC), as the run record has it; null when not recorded. */
  startedAt?: string | null;
  inputs: ReportInput[];
  /** Cross-sections drawn for this many of the top-ranked strips; default 10. */
  topProfiles?: number;
  /** Problems found in the inputs (warnings, skipped features), listed before the run's own warnings. */
  inputWarnings?: string[];
  /**
   * Table rows shown before "show all" (default 1000): every row is in the page, but laying out
   * 10,000 rows again after each sort takes seconds in a browser, and the first rows are the ones read.
   */
  rowsShown?: number;
  /** How the inputs were read (field names, units, defaults), for the record. */
  rules?: InputRules;
  /** A lining plan's outcome (doab lining): its section follows the summary. */
  lining?: LiningOutcome;
  /** The checks against wells: their section follows the map. */
  wells?: WellsOutcome;
  /** The spread from uncertain K: its section follows the wells'. */
  spread?: SpreadResult;
}

/** The assumptions behind every number in the report, as the README states them. */
export const ASSUMPTIONS: readonly string[] = [
  'Steady state: canal stages and recharge are taken as constant long enough for the water table to settle.',
  'Dupuit-Forchheimer: flow is horizontal and the head is the same over a vertical, in an unconfined aquifer on a horizontal impervious base; ' +
    'fair when a strip is at least about 5 times wider than its mean saturated thickness (common practice), and narrower strips are flagged.',
  'Lines fully penetrate the aquifer. A line meets it without entry resistance (a clean bed) unless it has a bed resistance, through which it passes (its wetted perimeter / resistance) x (stage - head at the bank), or the bed\'s underside where the water table falls below it; no radial resistance of partial penetration is added, so losses are upper estimates where a bed resistance is not given.',
  'Zones are taken in series across each transect, each with one hydraulic conductivity, recharge and ground level.',
  'All elevations (stages, base, ground) are in one vertical datum.',
  'Only paired, solved line sides are counted by the strips: a side with no partner, outside the aquifer or unsolved adds nothing to their figures, so the strip losses are a lower bound.',
  'The district solve (when it ran) burns every line into the cells it crosses: a clean line holds its stage there, a line with a bed resistance exchanges through its bed; its figures depend on the cell size (each line carries the change at twice the cell), and water crosses the aquifer\'s outer edge only where a zone gives an edge head.',
  'Where the water table reaches the ground, water that would seep out at the surface is not modelled: losses on such strips (ponded) are not reliable.',
];


/** A command line as a person would type it again: arguments with spaces or quotes in single quotes. */
function shellWords(words: string[]): string {
  return words.map((word) => (/^[\w@%+=:,./-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`)).join(' ');
}

function totalCard(figure: string, what: string): string {
  return `<div class="total-card"><span class="figure">${figure}</span><span class="what">${what}</span></div>`;
}

function summarySection(result: ScreenResult, inputWarnings: string[]): string {
  const { totals, counts, settings } = result;
  const canals = result.lines.filter((line) => line.kind === 'canal').length;
  const district = result.district;
  const source = district ? 'district solve' : 'strips alone';
  const seepage = netSeepageTotals(result);
  const seepageParts = (figure: NetSeepage) =>
    `lost by losing lines ${formatGrouped(figure.lostByLosingLinesM3PerDay, figure.decimals)} − taken in by gaining lines ` +
    `${formatGrouped(figure.takenInByGainingLinesM3PerDay, figure.decimals)} m³/d`;
  const cards = [
    `<div class="total-card net-seepage" data-method="${seepage.main.method}"><span class="what">${escapeHtml(NET_SEEPAGE_NAME)} (${source})</span>` +
      `<span class="figure">${formatGrouped(seepage.main.netM3PerDay, seepage.main.decimals)} m³/d</span>` +
      `<span class="what">${formatGrouped(seepage.main.netM3PerYear, seepage.main.yearDecimals)} m³/yr</span><span class="what">= ${seepageParts(seepage.main)}` +
      `${seepage.main.netM3PerDay < 0 ? ' (negative: the lines take in more than they lose)' : ''}</span></div>`,
    ...(district
      ? [
          totalCard(`${formatGrouped(district.balance.rechargeM3PerDay)} m³/d`, 'recharge over the aquifer (district water balance)'),
          totalCard(
            `${district.balance.residualM3PerDay.toPrecision(2)} m³/d`,
            'water balance residual of the district solve, cell by cell: a check of the solve, not a seepage figure',
          ),
        ]
      : []),
    ...(seepage.stripsAlone
      ? [
          totalCard(
            `${formatGrouped(seepage.stripsAlone.netM3PerDay, seepage.stripsAlone.decimals)} m³/d`,
            `net seepage by the strips alone (the quicker method, for comparison): ${seepageParts(seepage.stripsAlone)}`,
          ),
        ]
      : []),
    totalCard(`${formatFixed(totals.pairedM / 1000, 1)} km`, 'line length with at least one side paired'),
    totalCard(`${formatFixed(totals.unpairedM / 1000, 1)} km`, 'line length with neither side paired'),
    totalCard(
      `${formatFixed(totals.solvedSidesM / 1000, 1)} of ${formatFixed(totals.sidesM / 1000, 1)} km`,
      district ? 'line sides the strips solved (the district solve covers every side)' : 'line sides solved (each line has two); the rest add no loss',
    ),
    totalCard(
      `${formatGrouped(totals.riskAreaHa, 1)} ha`,
      `area where the water table is less than ${escapeHtml(settings.risk.waterloggedDepthM)} m below ground (${source}${district ? ', banks left out' : ''})`,
    ),
  ].join('');
  const method = district
    ? `<p class="run-line">The net seepage and areas above come from the district solve: steady 2D flow over the whole aquifer on ${escapeHtml(district.cellM)} m cells ` +
      `(${formatGrouped(district.grid.columns)} x ${formatGrouped(district.grid.rows)}, ${escapeHtml(district.status)}); each line's figure at twice the cell is in canals.geojson ` +
      `(coarse_cell_diff_m3_d), and the strips' own figures beside it (strip_net_loss_m3_d). Area by risk class: ` +
      `${Object.entries(district.areaByRiskHa).map(([risk, ha]) => `${escapeHtml(risk)} ${formatGrouped(ha, 1)} ha`).join(', ')}.</p>`
    : '<p class="run-line">The district solve did not run (stripsOnly): every figure comes from the strips alone, which miss junctions, line ends and unpaired sides.</p>';
  const riskRows = STRIP_CLASSES.map(
    (kind) =>
      `<tr><td><svg class="key-swatch" width="22" height="14" viewBox="0 0 22 14" aria-hidden="true"><rect x="1" y="1" width="20" height="12" ` +
      `fill="url(#${patternId(kind)})" stroke="#444444" stroke-width="0.6"/></svg></td><th scope="row">${STRIP_STYLES[kind].label}</th>` +
      `<td class="num">${formatGrouped(totals.stripsByRisk[kind])}</td></tr>`,
  ).join('');
  const sides = FACING_REASON_NAMES.map((name) => `${escapeHtml(name)} ${formatGrouped(counts.facingsByReason[name] ?? 0)}`).join(', ');
  const allWarnings = [...inputWarnings, ...result.warnings];
  const warnings = allWarnings.length
    ? `<ul class="plain warnings">${allWarnings.map((w) => `<li>${escapeHtml(w)}</li>`).join('')}</ul>`
    : '<p>None.</p>';
  return (
    `<section id="summary"><h2>District summary</h2><div class="totals-grid">${cards}</div>${method}` +
    `<h3>Strips by risk class</h3><table class="facts risk-counts"><tbody>${riskRows}` +
    `<tr><td></td><th scope="row">all strips</th><td class="num">${formatGrouped(counts.strips)}</td></tr></tbody></table>` +
    `<p>${formatGrouped(counts.lines)} lines (${formatGrouped(canals)} canals, ${formatGrouped(counts.lines - canals)} drains), ` +
    `${formatGrouped(counts.zones)} aquifer zones, ${formatGrouped(counts.stations)} stations every ${escapeHtml(settings.stepM)} m; transect sides: ${sides}.</p>` +
    `<h3>Warnings</h3>${warnings}</section>`
  );
}

function cautionSection(): string {
  return (
    `<section id="cautions" class="caution-box"><p><b>Not a design.</b> ${escapeHtml(CAUTION)}</p>` +
    `<p>The numbers rest on these assumptions:</p><ul class="plain">${ASSUMPTIONS.map((a) => `<li>${escapeHtml(a)}</li>`).join('')}</ul>` +
    `<p>Confirm every finding in the field (piezometers, seepage measurements) before acting on it, and defer to local codes, ` +
    `regulations and licensed professional practice for any design, lining or drainage decision.</p></section>`
  );
}

function* mapSection(result: ScreenResult): Generator<string> {
  const map = districtMapPieces(result);
  yield (
    `<section id="map"><h2>Map</h2><p class="run-line">Work CRS ${escapeHtml(result.crs.name)}, grid north up. ` +
    `Hover over a strip for its figures.</p><div class="map-panel">`
  );
  yield* map.svg;
  yield `${map.key}</div><div id="map-tip" class="map-tip" role="tooltip"></div></section>`;
}

function profilesSection(result: ScreenResult, top: number): string {
  const strips = result.strips.slice(0, top);
  if (strips.length === 0) return `<section id="profiles"><h2>Cross-sections</h2><p>No strips.</p></section>`;
  const figures = strips.map((strip, i) => {
    const solved = profileOfFacing(result, strip, keyFacing(result, strip));
    const profile = solved && orientFromLineA(solved, strip.lineAId);
    const caption =
      `#${i + 1} ${escapeHtml(strip.stripId)}: ${escapeHtml(STRIP_STYLES[strip.risk ?? 'unsolved'].label)}, ` +
      `loss ${formatFixed(strip.lossM3PerDayKm, 1)} m³/d per km, smallest depth ${formatFixed(strip.minDepthM, 2)} m` +
      (strip.flags.length ? `; flags ${escapeHtml(strip.flags.join(', '))}` : '');
    const body = profile ? renderProfileSvg(profile) : '<p>No solved transect in this strip: nothing to draw.</p>';
    return `<figure class="profile-card" data-strip-id="${escapeHtml(strip.stripId)}">${body}<figcaption>${caption}</figcaption></figure>`;
  });
  return (
    `<section id="profiles"><h2>Cross-sections of the top ${strips.length} strips</h2>` +
    `<p class="run-line">Each is the strip's key transect, the one with the highest water table, solved again from the same inputs and drawn with the strip's line a on the left.</p>` +
    `<div class="profile-grid">${figures.join('\n')}</div></section>`
  );
}

/** A figure for reading: about three digits or more, never more than two decimals, thousands grouped. */
export function readableNumber(value: number): string {
  const magnitude = Math.abs(value);
  return formatGrouped(value, magnitude >= 100 || magnitude === 0 ? 0 : magnitude >= 10 ? 1 : 2);
}

interface RankingHeading {
  /** Words for the column's header and for the map's hover text. */
  words: string;
  /** The unit, after the words in the header and after the value on hover; '' for none. */
  unit: string;
  show: (value: unknown) => string;
}

/**
 * The ranked table's columns as a reader wants them: words with units, numbers rounded for reading
 * (ranking.csv keeps six digits). Each header keeps the CSV column's name in data-column.
 */
function rankingHeadings(result: ScreenResult): Record<(typeof RANKING_COLUMNS)[number], RankingHeading> {
  const text = (v: unknown) => String(v);
  const shallow = result.settings.risk.waterloggedDepthM;
  return {
    rank: { words: 'Rank', unit: '', show: text },
    strip_id: { words: 'Strip', unit: '', show: text },
    line_a: { words: 'Line a', unit: '', show: text },
    line_b: { words: 'Line b', unit: '', show: text },
    length_m: { words: 'Length', unit: 'km', show: (v) => formatFixed((v as number) / 1000, 2) },
    spacing_m: { words: 'Spacing of the lines', unit: 'm', show: (v) => formatGrouped(v as number) },
    loss_m3_d: { words: 'Loss', unit: 'm³/d', show: (v) => readableNumber(v as number) },
    loss_m3_d_km: { words: 'Loss per km', unit: 'm³/d per km', show: (v) => readableNumber(v as number) },
    loss_m3_yr: { words: 'Loss per year', unit: 'm³/yr', show: (v) => formatGrouped(v as number) },
    losing_line: { words: 'Losing line', unit: '', show: text },
    losing_share: { words: "Losing line's share of the loss", unit: '%', show: (v) => formatFixed(100 * (v as number), 0) },
    min_depth_m: { words: 'Smallest depth to water table', unit: 'm', show: (v) => formatFixed(v as number, 2) },
    risk: { words: 'Risk class', unit: '', show: text },
    risk_area_ha: { words: `Area with water table less than ${shallow} m deep`, unit: 'ha', show: (v) => formatGrouped(v as number, 1) },
    district_loss_m3_d_km: { words: 'Loss per km, district solve', unit: 'm³/d per km', show: (v) => readableNumber(v as number) },
    district_min_depth_m: { words: 'Smallest depth to water table, district solve', unit: 'm', show: (v) => formatFixed(v as number, 2) },
    flags: { words: 'Flags', unit: '', show: text },
  };
}

/** The ranked strips' table, a few hundred rows per piece. */
function* rankingSection(result: ScreenResult, rowsShown: number): Generator<string> {
  const headings = rankingHeadings(result);
  const head = RANKING_COLUMNS.map((column) => {
    const { words, unit } = headings[column];
    return (
      `<th scope="col" data-column="${column}" data-kind="${columnKind(column)}" data-words="${escapeHtml(words)}" data-unit="${escapeHtml(unit)}" aria-sort="none">` +
      `<button type="button">${escapeHtml(unit ? `${words} (${unit})` : words)}</button></th>`
    );
  }).join('');
  const row = (i: number) => {
    const cellsOf = rankingRow(result.strips[i], i + 1);
    // end tags of td are optional in HTML, and the style sheet aligns numbers by column: both
    // keep a 10,000-row table smaller
    const cells = RANKING_COLUMNS.map((column) => {
      const value = cellsOf[column];
      return `<td>${value === null || value === undefined || value === '' ? '' : escapeHtml(headings[column].show(value))}`;
    }).join('');
    return `<tr class="rank-row">${cells}</tr>`;
  };
  const count = result.strips.length;
  const capped = count > rowsShown;
  const cap = capped
    ? `<p class="table-cap">Showing the first ${formatGrouped(rowsShown)} of ${formatGrouped(count)} rows in the current order. ` +
      `<button type="button" id="show-all-rows">Show all ${formatGrouped(count)} rows</button></p>`
    : '';
  yield (
    `<section id="ranking"><h2>Ranked strips</h2><p class="run-line">The rows and columns of ranking.csv, ranked by ` +
    `${result.settings.rankBy === 'loss' ? 'loss per km' : 'smallest depth'}, with numbers rounded for reading (ranking.csv keeps six digits). Click a column header to sort.</p>${cap}` +
    `<div class="table-wrap"><table id="ranking-table" class="ranking${capped ? ' is-capped' : ''}"><thead><tr>${head}</tr></thead>` +
    `<tbody>\n`
  );
  yield* joinedInPieces(count, row);
  yield `\n</tbody></table></div></section>`;
}

// the line table's columns as a reader wants them: words with units, numbers rounded for reading (lines.csv keeps six digits)
const LINE_HEADINGS: [string, string, (value: unknown) => string][] = [
  ['rank', 'Rank', (v) => String(v)],
  ['line_id', 'Line', (v) => String(v)],
  ['name', 'Name', (v) => String(v ?? '')],
  ['kind', 'Kind', (v) => String(v)],
  ['length_m', 'Length (km)', (v) => formatFixed((v as number) / 1000, 2)],
  ['net_loss_m3_d', 'Net loss (m³/d)', (v) => formatGrouped(v as number)],
  ['net_loss_m3_d_km', 'Net loss per km (m³/d per km)', (v) => formatGrouped(v as number)],
  ['loss_method', 'From', (v) => (v === 'district' ? 'district solve' : 'strips alone')],
  ['covers_share', 'Share of its sides covered', (v) => `${formatFixed((v as number) * 100, 0)}%`],
  ['coarse_cell_diff_m3_d', 'Change at twice the cell (m³/d)', (v) => formatGrouped(v as number)],
  ['strip_net_loss_m3_d', 'Strips alone (m³/d)', (v) => formatGrouped(v as number)],
];

function linesSection(result: ScreenResult): string {
  const head = LINE_HEADINGS.map(([, heading]) => `<th scope="col">${escapeHtml(heading)}</th>`).join('');
  const rows = rankedLines(result).map((i, rank) => {
    const row = lineTableRow(result, i, rank) as Record<string, unknown>;
    return `<tr>${LINE_HEADINGS.map(([column, , show]) => `<td>${escapeHtml(row[column] === null ? '-' : show(row[column]))}`).join('')}</tr>`;
  });
  return (
    `<section id="lines"><h2>Lines by loss per km</h2><p class="run-line">Every line, ranked by the net loss per km a planner lines by ` +
    `(${result.district ? 'from the district solve, the whole water table' : 'from the strips alone: no district solve ran'}); the rows of lines.csv. ` +
    `A negative net loss is a line that takes in water (a drain, mostly).` +
    (result.district ? '' : ' Each figure covers only the line\'s solved sides (the share column): two lines compare only as far as their shares do, and a share well under 100% is a lower bound.') +
    `</p>` +
    `<div class="table-wrap"><table id="lines-table" class="lines"><thead><tr>${head}</tr></thead><tbody>\n${rows.join('\n')}\n</tbody></table></div></section>`
  );
}

function settingRows(settings: object, prefix = ''): string[] {
  const rows: string[] = [];
  for (const [key, value] of Object.entries(settings)) {
    if (value !== null && typeof value === 'object') rows.push(...settingRows(value as object, `${prefix}${key}.`));
    else rows.push(`<tr><th scope="row">${escapeHtml(prefix + key)}</th><td>${escapeHtml(JSON.stringify(value))}</td></tr>`);
  }
  return rows;
}

function runSection(result: ScreenResult, meta: ReportMeta): string {
  const inputs = meta.inputs
    .map(
      (input) =>
        `<tr><th scope="row">${escapeHtml(input.label)}</th><td>${escapeHtml(input.path)}</td>` +
        `<td>${escapeHtml(input.sourceCrs ?? 'lon/lat, WGS 84 (EPSG:4326), as RFC 7946 asks')}</td><td class="hash">${escapeHtml(input.sha256)}</td></tr>`,
    )
    .join('');
  const rules = meta.rules;
  const mapping = rules
    ? `<h3>How the inputs were read</h3><table class="facts"><tbody>` +
      (['lines', 'zones'] as const)
        .map((kind) => `<tr><th scope="row">${kind} fields</th><td>${escapeHtml(Object.entries(rules.fields[kind]).map(([field, name]) => `${field}: ${name}`).join(', '))}</td></tr>`)
        .join('') +
      `<tr><th scope="row">units of the inputs</th><td>${escapeHtml(`K in ${rules.units.k}, recharge in ${rules.units.recharge}, elevations in ${rules.units.elevation}`)}; every output is in metres and days whatever the input units</td></tr>` +
      `<tr><th scope="row">defaults</th><td>${escapeHtml(`kind ${rules.defaults.kind} where a line gives none, recharge ${rules.defaults.recharge} ${rules.units.recharge} where a zone gives none; kind words: canal = ${rules.kindWords.canal.join(', ')}; drain = ${rules.kindWords.drain.join(', ')}`)} (a default that applied to every feature is among the warnings above)</td></tr>` +
      `<tr><th scope="row">line beds</th><td>${escapeHtml(bedsText(bedsUsed(result.lines)))}; defaults: bed resistance ${rules.defaults.bedResistanceD} d, wetted perimeter ${rules.defaults.wettedPerimeterM ?? 'none'}${rules.defaults.wettedPerimeterM === null ? '' : ' m'}, side slope ${rules.defaults.bankSlope} horizontal to 1 vertical</td></tr>` +
      `</tbody></table>`
    : '';
  return (
    `<section id="run"><h2>Run</h2><table class="facts"><tbody>` +
    `<tr><th scope="row">doab version</th><td>${escapeHtml(meta.version)}</td></tr>` +
    (meta.startedAt ? `<tr><th scope="row">run started</th><td>${escapeHtml(meta.startedAt)} (as run.json records it)</td></tr>` : '') +
    `<tr><th scope="row">command line</th><td class="hash">${escapeHtml(shellWords(meta.commandLine))}</td></tr>` +
    `<tr><th scope="row">work CRS</th><td>${escapeHtml(result.crs.name)}</td></tr></tbody></table>` +
    `<h3>Inputs</h3><table class="facts"><thead><tr><th>input</th><th>path</th><th>written in</th><th>SHA-256</th></tr></thead><tbody>${inputs}</tbody></table>` +
    mapping +
    `<h3>Settings</h3><table class="facts settings"><tbody>${settingRows(result.settings).join('')}</tbody></table></section>`
  );
}

/**
 * The whole report as one HTML text. Example:
 * renderReport(screenDistrict(lines, zones, DEFAULT_SETTINGS), { version: '0.1.0', commandLine: ['doab', 'screen'], inputs: [] })
 */
export function renderReport(result: ScreenResult, meta: ReportMeta): string {
  let html = '';
  for (const piece of reportPieces(result, meta)) html += piece;
  return html;
}

/**
 * The report's text a section at a time, each built only when asked for: a run's writer takes
 * them in turn, so a large district's sections are never all held (and never built before the
 * writer reaches the report). The same text as renderReport.
 */
export function* reportPieces(result: ScreenResult, meta: ReportMeta): Generator<string> {
  const top = meta.topProfiles ?? 10;
  if (!Number.isInteger(top) || top < 0) throw new Error(`Unexpected topProfiles value: ${top}.`);
  const rowsShown = meta.rowsShown ?? 1000;
  if (!Number.isInteger(rowsShown) || rowsShown < 1) throw new Error(`Unexpected rowsShown value: ${rowsShown}.`);
  const capRule = `#ranking-table.is-capped tbody tr:nth-child(n+${rowsShown + 1}){display:none}`;
  const csp = "default-src 'none'; style-src 'unsafe-inline'; script-src 'unsafe-inline'; img-src data:";
  yield (
    `<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">` +
    `<meta http-equiv="Content-Security-Policy" content="${csp}">` +
    `<meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<title>doab screening report: ${result.counts.strips} strips</title><style>${PAGE_CSS}${capRule}\n</style></head>\n<body><main>` +
    `<header><h1>${result.settings.title ? `${escapeHtml(result.settings.title)}: ` : ''}doab screening report</h1><p class="run-line">${meta.startedAt ? `run ${escapeHtml(meta.startedAt.replace('T', ' ').replace(/\.\d+Z$/, ' UTC'))}; ` : ''}${result.counts.lines} lines, ${result.counts.strips} strips, ` +
    `work CRS ${escapeHtml(result.crs.name)}; doab ${escapeHtml(meta.version)}</p></header>\n`
  );
  yield `${cautionSection()}\n`;
  yield `${summarySection(result, meta.inputWarnings ?? [])}\n`;
  if (meta.lining) yield `${liningSection(meta.lining)}\n`;
  yield* mapSection(result);
  yield '\n';
  if (meta.wells) yield `${wellsSection(result, meta.wells)}\n`;
  if (meta.spread) yield `${spreadSection(meta.spread)}\n`;
  yield `${profilesSection(result, top)}\n`;
  yield `${linesSection(result)}\n`;
  yield* rankingSection(result, rowsShown);
  yield '\n';
  yield `${runSection(result, meta)}\n</main>\n<script>${PAGE_SCRIPT}</script>\n</body></html>\n`;
}
