// The run record (run.json) and the end-of-run summary printed to stdout.
import type { ScreenResult } from '../screening/screen.js';
import { formatFixed } from '../report/format.js';
import { roundNumber } from './layers.js';
import type { InputRules } from '../screening/input-rules.js';
import { formatProblem, type Problem } from '../screening/district-inputs.js';
import type { InputFile } from './read-features.js';

export const CAUTION =
  'Screening estimate only (steady Dupuit-Forchheimer flow, fully penetrating unlined lines, horizontal base): ' +
  'confirm in the field and defer to local codes and licensed professional practice before acting.';

export interface RunMeta {
  version: string;
  commandLine: string[];
  canals: InputFile;
  aquifer: InputFile;
  config: string | null;
  inputCrs: string | null;
  rules: InputRules;
  outputs: string[];
  /** Every problem the checks found: warnings, and the errors of features skipped with --skip-invalid. */
  problems: Problem[];
}

function describeInput(file: InputFile) {
  return { path: file.path, format: file.format, source_crs: file.sourceCrs, sha256: file.sha256, bytes: file.bytes, features: file.features.length };
}

export function runRecord(result: ScreenResult, meta: RunMeta): string {
  const { totals, counts, settings } = result;
  const record = {
    tool: 'doab',
    version: meta.version,
    command_line: meta.commandLine,
    settings: {
      step_m: settings.stepM,
      max_gap_m: settings.maxGapM,
      max_angle_deg: settings.maxAngleDeg,
      crs: settings.crs,
      rank_by: settings.rankBy,
      transects: settings.writeTransects,
      spacing_jump: settings.spacingJump,
      dupuit_ratio_min: settings.dupuitRatioMin,
      base_spread_fraction: settings.baseSpreadFraction,
      bank_width_m: settings.bankWidthM,
      waterlogged_depth_m: settings.risk.waterloggedDepthM,
      potential_depth_m: settings.risk.potentialDepthM,
      config: meta.config,
      input_crs: meta.inputCrs,
      fields: meta.rules.fields,
      units: meta.rules.units,
      defaults: meta.rules.defaults,
      kind_words: meta.rules.kindWords,
    },
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
      loss_m3_d: roundNumber(totals.lossM3PerDay),
      loss_m3_yr: roundNumber(totals.lossM3PerYear),
      gain_m3_d: roundNumber(totals.gainM3PerDay),
      net_m3_d: roundNumber(totals.netM3PerDay),
      strip_loss_m3_d: roundNumber(totals.stripLossM3PerDay),
      paired_m: roundNumber(totals.pairedM),
      unpaired_m: roundNumber(totals.unpairedM),
      solved_sides_m: roundNumber(totals.solvedSidesM),
      sides_m: roundNumber(totals.sidesM),
      risk_area_ha: roundNumber(totals.riskAreaHa),
    },
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

export function summaryText(result: ScreenResult, top = 10, skipped = 0): string {
  const { totals, counts } = result;
  const lines: string[] = [];
  lines.push(`doab screen: ${counts.lines} lines, ${counts.stations} stations, ${counts.strips} strips (work CRS ${result.crs.name})`);
  lines.push(
    `Seepage loss from losing lines: ${formatFixed(totals.lossM3PerDay, 0)} m3/d (${formatFixed(totals.lossM3PerYear, 0)} m3/yr), net of what they take in on other sides; ` +
      `gaining lines take in ${formatFixed(totals.gainM3PerDay, 0)} m3/d; the strips' losses add to ${formatFixed(totals.stripLossM3PerDay, 0)} m3/d`,
  );
  lines.push(
    `Paired ${formatFixed(totals.pairedM / 1000, 1)} km, unpaired ${formatFixed(totals.unpairedM / 1000, 1)} km; ` +
      `area with water table < ${result.settings.risk.waterloggedDepthM} m below ground: ${formatFixed(totals.riskAreaHa, 1)} ha`,
  );
  lines.push(
    `Line sides solved: ${formatFixed(totals.solvedSidesM / 1000, 1)} km of ${formatFixed(totals.sidesM / 1000, 1)} km; ` +
      'unpaired and unsolved sides are not counted, so these losses are a lower bound',
  );
  const byRisk = totals.stripsByRisk;
  lines.push(`Strips by risk: ponded ${byRisk.ponded}, waterlogged ${byRisk.waterlogged}, potential ${byRisk.potential}, safe ${byRisk.safe}, unsolved ${byRisk.unsolved}`);
  const header = ['rank', 'strip', 'loss m3/d/km', 'loss m3/d', 'min depth m', 'risk', 'flags'];
  const rows = result.strips.slice(0, top).map((strip, i) => [
    String(i + 1),
    strip.stripId,
    formatFixed(strip.lossM3PerDayKm, 1),
    formatFixed(strip.lossM3PerDay, 1),
    formatFixed(strip.minDepthM, 2),
    strip.risk ?? 'unsolved',
    strip.flags.join(';'),
  ]);
  const widths = header.map((title, c) => Math.max(title.length, ...rows.map((row) => row[c].length)));
  const format = (row: string[]) => row.map((cell, c) => (c >= 2 && c <= 4 ? cell.padStart(widths[c]) : cell.padEnd(widths[c]))).join('  ').trimEnd();
  if (rows.length === 0) {
    lines.push('', `No strips: no two lines face each other within ${result.settings.maxGapM} m and ${result.settings.maxAngleDeg} degrees of parallel; canals.geojson gives each line's unpaired reasons.`);
  } else {
    lines.push('', `Top ${rows.length} strips (ranked by ${result.settings.rankBy === 'loss' ? 'loss per km' : 'smallest depth'}):`);
    lines.push(format(header), ...rows.map(format));
  }
  for (const warning of result.warnings) lines.push(`warning: ${warning}`);
  if (skipped > 0) lines.push(`${skipped} invalid feature${skipped === 1 ? ' was' : 's were'} skipped (--skip-invalid); run.json lists them`);
  lines.push('', `CAUTION: ${CAUTION}`);
  return `${lines.join('\n')}\n`;
}
