// The run record (run.json): what was run, on which inputs, with which settings, and what it found.
import { bedsText, bedsUsed } from '../screening/beds.js';
import { wellsRecord, type WellsOutcome } from './wells-tables.js';
import { spreadRecord } from './spread-tables.js';
import type { SpreadResult } from '../screening/spread.js';
import type { FigureMethod, ScreenResult } from '../screening/screen.js';
import { formatFixed, roundNumber } from './format.js';
import { m3PerDayToM3PerYear } from '../shared/units.js';
import type { InputRules } from '../shared/input-rules.js';
import { settingsAsConfig } from '../shared/settings.js';
import { formatProblem, type Problem } from '../shared/errors.js';

export const CAUTION =
  'Screening estimate only (steady Dupuit-Forchheimer flow, fully penetrating lines, a clean bed unless a bed resistance is given, horizontal base): ' +
  'confirm in the field and defer to local codes and licensed professional practice before acting.';

/** The name of the one seepage total a planner reads, in the summary, run.json and the report. */
export const NET_SEEPAGE_NAME = 'Net seepage from the lines into the aquifer';

/**
 * Net seepage from the lines into the aquifer and its two parts, rounded as they are printed, so
 * that the summary, run.json and the report show the same digits. Net is the rounded loss less the
 * rounded intake, so the printed sum adds up; per year it is the unrounded net times 365.25.
 */
export interface NetSeepage {
  /** Which method gave the figures: the district solve, or the strips alone. */
  method: FigureMethod;
  /** Decimals printed for m^3/d (m^3/yr has its own): whole cubic metres for a district, more for a small one. */
  decimals: number;
  netM3PerDay: number;
  netM3PerYear: number;
  yearDecimals: number;
  /** Summed over the lines that lose water, each line net over its length. */
  lostByLosingLinesM3PerDay: number;
  /** Summed over the lines that take water in (drains, mostly), as a positive number. */
  takenInByGainingLinesM3PerDay: number;
}

/** Decimals that show a figure of this size to about three digits or more, never past 2. */
function readableDecimals(magnitude: number): number {
  return magnitude >= 100 ? 0 : magnitude >= 10 ? 1 : 2;
}

function roundTo(value: number, decimals: number): number {
  const rounded = Number(value.toFixed(decimals));
  return Object.is(rounded, -0) ? 0 : rounded;
}

function netSeepage(method: FigureMethod, lossM3PerDay: number, gainM3PerDay: number): NetSeepage {
  const decimals = readableDecimals(Math.max(lossM3PerDay, gainM3PerDay));
  const lost = roundTo(lossM3PerDay, decimals), takenIn = roundTo(gainM3PerDay, decimals);
  const perYear = m3PerDayToM3PerYear(lossM3PerDay - gainM3PerDay);
  const yearDecimals = readableDecimals(m3PerDayToM3PerYear(Math.max(lossM3PerDay, gainM3PerDay)));
  return {
    method,
    decimals,
    netM3PerDay: roundTo(lost - takenIn, decimals),
    netM3PerYear: roundTo(perYear, yearDecimals),
    yearDecimals,
    lostByLosingLinesM3PerDay: lost,
    takenInByGainingLinesM3PerDay: takenIn,
  };
}

/**
 * The net seepage a planner reads (the district solve's when it ran, else the strips'), and the
 * strips' own beside it when the district solve ran (null otherwise).
 */
export function netSeepageTotals(result: ScreenResult): { main: NetSeepage; stripsAlone: NetSeepage | null } {
  const { totals } = result;
  return {
    main: netSeepage(totals.method, totals.lossM3PerDay, totals.gainM3PerDay),
    stripsAlone: totals.method === 'district' ? netSeepage('strips', totals.stripLinesLossM3PerDay, totals.stripLinesGainM3PerDay) : null,
  };
}

/** A net seepage in words, as the summary prints it: "N m3/d (M m3/yr) = lost by losing lines A - taken in by gaining lines B". */
export function netSeepageText(figure: NetSeepage, unit = { day: 'm3/d', year: 'm3/yr' }, format = formatFixed): string {
  const d = (v: number) => format(v, figure.decimals);
  return (
    `${d(figure.netM3PerDay)} ${unit.day} (${format(figure.netM3PerYear, figure.yearDecimals)} ${unit.year}) = ` +
    `lost by losing lines ${d(figure.lostByLosingLinesM3PerDay)} - taken in by gaining lines ${d(figure.takenInByGainingLinesM3PerDay)} ${unit.day}`
  );
}

/** How a net seepage reads in run.json: the printed figures, and the method that gave them. */
function netSeepageRecord(figure: NetSeepage) {
  return {
    method: figure.method,
    m3_d: figure.netM3PerDay,
    m3_yr: figure.netM3PerYear,
    lost_by_losing_lines_m3_d: figure.lostByLosingLinesM3PerDay,
    taken_in_by_gaining_lines_m3_d: figure.takenInByGainingLinesM3PerDay,
  };
}

/** What the run record says of an input file (a reader's result has these and more). */
export interface InputFacts {
  path: string;
  format: string;
  sourceCrs: string | null;
  sha256: string;
  bytes: number;
  featureCount: number;
}

export interface RunMeta {
  version: string;
  commandLine: string[];
  /** When the run started (ISO 8601, UTC); null to leave it out (a library caller wanting identical records). */
  startedAt: string | null;
  canals: InputFacts;
  aquifer: InputFacts;
  config: string | null;
  rules: InputRules;
  outputs: string[];
  /** Every problem the checks found: warnings, and the errors of features skipped with --skip-invalid. */
  problems: Problem[];
  /** The checks against wells, when a wells file was given. */
  wells?: { outcome: WellsOutcome; sha256: string | null };
  /** The spread from uncertain K, when drawn (--samples). */
  spread?: SpreadResult;
  /** The DEM the ground came from (--dem). */
  dem?: { path: string; sha256: string; crs: string; pixels: number; nodataPixels: number } | null;
}

function describeInput(file: InputFacts) {
  return { path: file.path, format: file.format, source_crs: file.sourceCrs, sha256: file.sha256, bytes: file.bytes, features: file.featureCount };
}

/** The district solve's grid, convergence, water balance and areas, or why it did not run. */
function districtRecord(result: ScreenResult) {
  const district = result.district;
  if (!district) return { ran: false, reason: 'skipped (stripsOnly): every figure comes from the strips' };
  const { grid, balance } = district;
  return {
    ran: true,
    cell_m: district.cellM,
    requested_cell_m: district.requestedCellM,
    coarse_cell_m: district.coarseCellM,
    columns: grid.columns,
    rows: grid.rows,
    origin_m: [grid.originX, grid.originY],
    status: district.status,
    linear_iterations: district.linearIterations,
    picard_iterations: district.picardIterations,
    // Newton steps on the beds' square root (0 when every bed is clean)
    bed_iterations: district.bedIterations,
    dry_cells: district.dryCells,
    water_balance: {
      recharge_m3_d: roundNumber(balance.rechargeM3PerDay),
      line_loss_m3_d: roundNumber(balance.lineLossM3PerDay),
      line_gain_m3_d: roundNumber(balance.lineGainM3PerDay),
      outer_edge_in_m3_d: roundNumber(balance.edgeInM3PerDay),
      outer_edge_out_m3_d: roundNumber(balance.edgeOutM3PerDay),
      residual_m3_d: roundNumber(balance.residualM3PerDay),
      // three digits, never rounded to 0: how well the balance closes is the point of the figure
      residual_relative: Number(balance.residualRelative.toPrecision(3)),
      largest_cell_residual_m3_d: roundNumber(balance.largestCellResidualM3PerDay),
    },
    area_by_risk_ha: Object.fromEntries(Object.entries(district.areaByRiskHa).map(([risk, ha]) => [risk, roundNumber(ha)])),
    line_and_bank_area_ha: roundNumber(district.lineAndBankAreaHa),
    shallow_area_ha: roundNumber(district.shallowAreaHa),
  };
}

function lineBedsRecord(result: ScreenResult) {
  const used = bedsUsed(result.lines);
  return {
    text: bedsText(used),
    lines: used.lines,
    clean: used.clean,
    resistance_from_attribute: used.resistanceFromAttribute,
    resistance_from_default: used.resistanceFromDefault,
    perimeter_from_attribute: used.perimeterFromAttribute,
    perimeter_from_width_and_depth: used.perimeterFromWidthAndDepth,
    perimeter_from_default: used.perimeterFromDefault,
    resistance_min_d: roundNumber(used.resistanceMinD),
    resistance_max_d: roundNumber(used.resistanceMaxD),
  };
}

export function runRecord(result: ScreenResult, meta: RunMeta): string {
  const { totals, counts, settings } = result;
  const seepage = netSeepageTotals(result);
  const record = {
    tool: 'doab',
    version: meta.version,
    title: result.settings.title,
    started_at: meta.startedAt,
    command_line: meta.commandLine,
    // in config-file form, so that a later run (doab profile) reads them with the config parser
    settings: { ...settingsAsConfig(settings), ...meta.rules },
    config_file: meta.config,
    inputs: { canals: describeInput(meta.canals), aquifer: describeInput(meta.aquifer) },
    work_crs: { name: result.crs.name, epsg: result.crs.epsg, proj4: result.crs.proj4Def },
    counts: {
      lines: counts.lines,
      canals: result.lines.filter((line) => line.kind === 'canal').length,
      drains: result.lines.filter((line) => line.kind === 'drain').length,
      zones: counts.zones,
      stations: counts.stations,
      transect_sides: counts.facingsByReason,
      transect_sides_solved: counts.solvedFacings,
      strips: counts.strips,
      strips_by_risk: totals.stripsByRisk,
    },
    totals: {
      // net seepage and risk area come from this method: the district solve when it ran
      method: totals.method,
      // the figures the summary prints, to its last digit
      net_seepage_into_aquifer: netSeepageRecord(seepage.main),
      // the strips' own, the quicker method, beside the district solve's (null when it did not run)
      net_seepage_into_aquifer_strips_alone: seepage.stripsAlone && netSeepageRecord(seepage.stripsAlone),
      strip_risk_area_ha: roundNumber(totals.stripRiskAreaHa),
      paired_m: roundNumber(totals.pairedM),
      unpaired_m: roundNumber(totals.unpairedM),
      solved_sides_m: roundNumber(totals.solvedSidesM),
      sides_m: roundNumber(totals.sidesM),
      risk_area_ha: roundNumber(totals.riskAreaHa),
    },
    district_solve: districtRecord(result),
    line_beds: lineBedsRecord(result),
    wells: meta.wells ? wellsRecord(meta.wells.outcome, meta.wells.sha256) : null,
    k_spread: meta.spread ? spreadRecord(meta.spread) : null,
    dem: meta.dem ? { path: meta.dem.path, sha256: meta.dem.sha256, crs: meta.dem.crs, pixels: meta.dem.pixels, nodata_pixels: meta.dem.nodataPixels } : null,
    outputs: meta.outputs,
    warnings: [...meta.problems.filter((p) => p.severity === 'warning').map(formatProblem), ...result.warnings],
    skipped_features: meta.problems.filter((p) => p.severity === 'error').map((p) => ({
      file: p.place.file,
      feature: p.place.featureIndex ?? null,
      id: p.place.featureId ?? null,
      field: p.place.field ?? null,
      problem: p.message,
    })),
    caution: CAUTION,
  };
  return `${JSON.stringify(record, null, 2)}\n`;
}
