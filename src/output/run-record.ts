// The run record (run.json): what was run, on which inputs, with which settings, and what it found.
import type { ScreenResult } from '../screening/screen.js';
import { roundNumber } from './format.js';
import type { InputRules } from '../shared/input-rules.js';
import { settingsAsConfig } from '../shared/settings.js';
import { formatProblem, type Problem } from '../shared/errors.js';

export const CAUTION =
  'Screening estimate only (steady Dupuit-Forchheimer flow, fully penetrating unlined lines, horizontal base): ' +
  'confirm in the field and defer to local codes and licensed professional practice before acting.';

/** What the run record says of an input file (a reader's result has these and more). */
export interface InputFacts {
  path: string;
  format: string;
  sourceCrs: string | null;
  sha256: string;
  bytes: number;
  features: readonly unknown[];
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
}

function describeInput(file: InputFacts) {
  return { path: file.path, format: file.format, source_crs: file.sourceCrs, sha256: file.sha256, bytes: file.bytes, features: file.features.length };
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

export function runRecord(result: ScreenResult, meta: RunMeta): string {
  const { totals, counts, settings } = result;
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
      // loss, gain, net and risk area come from this method: the district solve when it ran
      method: totals.method,
      loss_m3_d: roundNumber(totals.lossM3PerDay),
      loss_m3_yr: roundNumber(totals.lossM3PerYear),
      gain_m3_d: roundNumber(totals.gainM3PerDay),
      net_m3_d: roundNumber(totals.netM3PerDay),
      strip_loss_m3_d: roundNumber(totals.stripLossM3PerDay),
      strip_lines_loss_m3_d: roundNumber(totals.stripLinesLossM3PerDay),
      strip_lines_gain_m3_d: roundNumber(totals.stripLinesGainM3PerDay),
      strip_risk_area_ha: roundNumber(totals.stripRiskAreaHa),
      paired_m: roundNumber(totals.pairedM),
      unpaired_m: roundNumber(totals.unpairedM),
      solved_sides_m: roundNumber(totals.solvedSidesM),
      sides_m: roundNumber(totals.sidesM),
      risk_area_ha: roundNumber(totals.riskAreaHa),
    },
    district_solve: districtRecord(result),
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
