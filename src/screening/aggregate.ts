// Aggregation stage: from solved facings to strip and line totals. Each line's loss comes from
// its own stations only, so nothing is counted twice: a strip's loss for line a sums a's
// stations facing b, and its loss for line b sums b's stations facing a.
import { FACING_PAIRED, FACING_REASON_NAMES, type FacingTable, type StationTable, type Strip } from '../geometry/index.js';
import { SOLVE_OK, SOLVE_STATUS_NAMES } from '../hydraulics/transect-solver.js';
import type { LineRecord } from './district-inputs.js';
import type { DistrictStripFigures } from './district.js';
import { FLAG_NARROW, FLAG_UNEVEN_BASE, FLAG_ZONE_OVERLAP, NOT_PAIRED, type FacingResults } from './solve-facings.js';
import { riskClass, type RiskClass, type ScreenSettings } from '../shared/settings.js';

export interface StripSummary {
  /** The strip as the geometry stage built it: its lines (indices), stations, chainages, spacing and ring. */
  strip: Strip;
  stripId: string;
  /** Ids of the strip's lines a and b. */
  lineAId: string;
  lineBId: string;
  /** Length along line a (m). */
  lengthM: number;
  /** Mean seepage per metre of each line (m^2/d); positive when the line loses water. */
  qAM2PerDay: number;
  qBM2PerDay: number;
  lossAM3PerDay: number;
  lossBM3PerDay: number;
  /** Positive losses of both lines in the strip (m^3/d), and per km of strip along line a. */
  lossM3PerDay: number;
  lossM3PerDayKm: number;
  peakWaterTableM: number;
  peakOffsetM: number;
  minDepthM: number;
  risk: RiskClass | null;
  riskAreaHa: number;
  dupuitRatioMin: number;
  flags: string[];
  /** Facing indices of a's and b's transects in this strip. */
  facingsA: Uint32Array;
  facingsB: Uint32Array;
  /** The district solve's figures inside the strip's polygon; null when it did not run. */
  district: DistrictStripFigures | null;
}

export interface LineSummary {
  lengthM: number;
  /** Net seepage of the line's solved sides, loss less gain (m^3/d); NaN when no side could be solved. */
  netLossM3PerDay: number;
  /** Length where at least one side is paired with a partner (m). */
  pairedM: number;
  unpairedM: number;
  /** Length of line sides whose transect was solved, both sides counted (m). */
  solvedSidesM: number;
  /** Unpaired length of the left and of the right side, by reason (m). */
  unpairedBySideM: [Record<string, number>, Record<string, number>];
}

export function summariseStrip(
  strip: Strip,
  lines: LineRecord[],
  stations: StationTable,
  facings: FacingTable,
  results: FacingResults,
  settings: ScreenSettings,
): StripSummary {
  const facingsA = Uint32Array.from(strip.stationsA, (s) => 2 * s + strip.sideA);
  // every b station in a strip faces a from the same side of b, the side a's transects meet
  const facingsB = Uint32Array.from(strip.stationsB, (s) => 2 * s + strip.sideB);
  let lengthA = 0, lossA = 0, lossB = 0, solvedLengthA = 0, solvedLengthB = 0;
  let peak = -Infinity, peakOffset = NaN, minDepth = Infinity, shallowAreaM2 = 0, ratioMin = Infinity;
  let flagBits = 0, unsolved = 0;
  const unsolvedReasons = new Set<string>();
  const visit = (facing: number, fromA: boolean) => {
    const station = facing >> 1;
    const length = stations.lengthM[station];
    if (fromA) lengthA += length;
    const status = results.status[facing];
    if (status !== SOLVE_OK) {
      unsolved++;
      unsolvedReasons.add(status === NOT_PAIRED ? FACING_REASON_NAMES[results.reason[facing]] : SOLVE_STATUS_NAMES[status]);
      return;
    }
    const loss = results.ownSeepageM2PerDay[facing] * length;
    if (fromA) { lossA += loss; solvedLengthA += length; shallowAreaM2 += results.shallowM[facing] * length; }
    else { lossB += loss; solvedLengthB += length; }
    flagBits |= results.flags[facing];
    if (results.peakWaterTableM[facing] > peak) {
      peak = results.peakWaterTableM[facing];
      peakOffset = fromA ? results.peakOffsetM[facing] : facings.transectLengthM[facing] - results.peakOffsetM[facing];
    }
    if (results.minDepthM[facing] < minDepth) minDepth = results.minDepthM[facing];
    if (results.dupuitRatio[facing] < ratioMin) ratioMin = results.dupuitRatio[facing];
  };
  for (const f of facingsA) visit(f, true);
  for (const f of facingsB) visit(f, false);

  const flags: string[] = [];
  if (flagBits & FLAG_NARROW) flags.push('narrow-for-dupuit');
  if (flagBits & FLAG_UNEVEN_BASE) flags.push('uneven-base');
  if (flagBits & FLAG_ZONE_OVERLAP) flags.push('zone-overlap');
  if (facingsB.length === 0) flags.push('one-sided');
  if (unsolved > 0) flags.push(`unsolved-${unsolved}:${[...unsolvedReasons].sort().join('+')}`);
  const solvedAny = solvedLengthA + solvedLengthB > 0;
  // a side with no solved transect has no loss to report: null, never a zero that reads as "none"
  if (solvedLengthA === 0) lossA = NaN;
  if (solvedLengthB === 0) lossB = NaN;
  const lossM3PerDay = solvedAny ? (lossA > 0 ? lossA : 0) + (lossB > 0 ? lossB : 0) : NaN;
  return {
    strip,
    stripId: strip.id,
    lineAId: lines[strip.lineA].id,
    lineBId: lines[strip.lineB].id,
    lengthM: lengthA,
    qAM2PerDay: solvedLengthA > 0 ? lossA / solvedLengthA : NaN,
    qBM2PerDay: solvedLengthB > 0 ? lossB / solvedLengthB : NaN,
    lossAM3PerDay: lossA,
    lossBM3PerDay: lossB,
    lossM3PerDay,
    lossM3PerDayKm: lengthA > 0 ? lossM3PerDay / (lengthA / 1000) : NaN,
    peakWaterTableM: solvedAny ? peak : NaN,
    peakOffsetM: solvedAny ? peakOffset : NaN,
    minDepthM: solvedAny ? minDepth : NaN,
    risk: solvedAny ? riskClass(minDepth, settings.risk) : null,
    riskAreaHa: shallowAreaM2 / 10_000,
    dupuitRatioMin: solvedAny ? ratioMin : NaN,
    flags,
    facingsA,
    facingsB,
    district: null,
  };
}

export function summariseLines(
  lines: LineRecord[],
  lineLengthsM: Float64Array,
  stations: StationTable,
  facings: FacingTable,
  results: FacingResults,
): LineSummary[] {
  const summaries: LineSummary[] = lines.map((_, index) => ({
    lengthM: lineLengthsM[index],
    netLossM3PerDay: 0,
    pairedM: 0,
    unpairedM: 0,
    solvedSidesM: 0,
    unpairedBySideM: [Object.create(null), Object.create(null)] as [Record<string, number>, Record<string, number>],
  }));
  for (let s = 0; s < stations.count; s++) {
    const summary = summaries[stations.line[s]];
    const length = stations.lengthM[s];
    let paired = false;
    for (let side = 0; side < 2; side++) {
      const facing = 2 * s + side;
      if (results.reason[facing] === FACING_PAIRED) {
        paired = true;
        if (results.status[facing] === SOLVE_OK) {
          summary.netLossM3PerDay += results.ownSeepageM2PerDay[facing] * length;
          summary.solvedSidesM += length;
        }
      } else {
        const reason = FACING_REASON_NAMES[results.reason[facing]];
        const bySide = summary.unpairedBySideM[side];
        bySide[reason] = (bySide[reason] ?? 0) + length;
      }
    }
    if (paired) summary.pairedM += length;
    else summary.unpairedM += length;
  }
  // a line with no solved side has an unknown loss, not none
  for (const summary of summaries) if (summary.solvedSidesM === 0) summary.netLossM3PerDay = NaN;
  return summaries;
}

/** A line's loss per km of paired length (m^3/d/km), as canals.geojson gives it; NaN without a solved side. */
export function lossPerKm(summary: LineSummary): number {
  return summary.pairedM > 0 && Number.isFinite(summary.netLossM3PerDay) ? summary.netLossM3PerDay / (summary.pairedM / 1000) : NaN;
}
