// The spread from uncertain hydraulic conductivity: zones give a K range (low and high, read as the
// P10 and P90 of a log-normal) or a standard deviation of ln K; N seeded draws of every zone's K
// (independent by default, or one draw for all zones) re-solve the strips on the geometry the run
// already built (stations, transects and zone cuts are not redone), and give per strip and per line
// P10/P50/P90 loss, each strip's probability of each risk class, how often it stays in the top of
// the ranking, and the district's net seepage with its range. Pure.
import { buildLineTable, buildStrips } from '../geometry/index.js';
import { RISK_CLASSES, type RiskClass, type ScreenSettings } from '../shared/settings.js';
import type { InputRules } from '../shared/input-rules.js';
import { kToMPerDay } from '../shared/units.js';
import { seededRandom } from '../shared/random.js';
import type { Problem } from '../shared/errors.js';
import { summariseLines, summariseStrip } from './aggregate.js';
import type { ZoneRecord } from './district-inputs.js';
import { rankStrips, type ScreenResult } from './screen.js';
import { solveFacings } from './solve-facings.js';
import { groundFromDem } from './ground.js';

/** The standard normal's 90th percentile: P10 and P90 lie this many standard deviations from the median (common practice; Abramowitz and Stegun (1964), table 26.1 [from memory]). */
export const Z90 = 1.2815515655446004;

export interface ZoneSpread {
  /** Median K (m/d) and standard deviation of ln K; 0 where the zone gives no range. */
  medianMPerDay: number;
  logSd: number;
}

export interface SpreadOptions {
  samples: number;
  seed: number;
  /** One draw for all zones (fully correlated) instead of one per zone. */
  correlated: boolean;
  /** The ranking's top this many strips, for how often each stays there. */
  top: number;
}

export interface Percentiles {
  p10: number;
  p50: number;
  p90: number;
}

export interface StripSpread {
  stripId: string;
  lossM3PerDayKm: Percentiles;
  /** Share of the draws in each risk class (unsolved included). */
  riskShare: Record<RiskClass | 'unsolved', number>;
  /** Share of the draws in which the strip ranks within the top. */
  topShare: number;
}

export interface LineSpread {
  lineId: string;
  netLossM3PerDay: Percentiles;
}

export interface SpreadResult {
  options: SpreadOptions;
  /** Zones with a range, by id, with their median and log standard deviation. */
  zones: { zoneId: string; medianMPerDay: number; logSd: number }[];
  strips: StripSpread[];
  lines: LineSpread[];
  /** The strips' net seepage of all lines (m^3/d): loss less gain over the solved sides (recharge holds it nearly fixed). */
  netSeepageM3PerDay: Percentiles;
  /** What the losing lines lose (m^3/d): the sum of the positive net losses, the figure lining acts on. */
  lostByLosingLinesM3PerDay: Percentiles;
}

/**
 * Each zone's spread from its attributes (the config's fields.zones.kLow/kHigh, or kLogSd): a
 * range gives median sqrt(low high) and ln(high/low) / (2 Z90); problems name file, zone and field.
 */
export function readZoneSpreads(file: string, features: readonly unknown[], zones: readonly ZoneRecord[], rules: InputRules): { spreads: ZoneSpread[]; problems: Problem[] } {
  const f = rules.fields.zones;
  const problems: Problem[] = [];
  const spreads = zones.map((zone): ZoneSpread => {
    const properties = ((features[zone.featureIndex] as { properties?: Record<string, unknown> } | undefined)?.properties ?? {}) as Record<string, unknown>;
    const place = (field: string) => ({ file, featureIndex: zone.featureIndex, featureId: zone.id, field });
    const given = (field: string) => properties[field] !== undefined && properties[field] !== null && properties[field] !== '';
    const number = (field: string): number | null => {
      const value = properties[field];
      if (typeof value !== 'number' || !Number.isFinite(value) || !(value > 0)) {
        problems.push({ severity: 'error', place: place(field), message: `expected a positive number, found ${JSON.stringify(value)?.slice(0, 60)}` });
        return null;
      }
      return value;
    };
    if (given(f.kLow) || given(f.kHigh)) {
      if (given(f.kLogSd)) problems.push({ severity: 'error', place: place(f.kLogSd), message: `give a K range ("${f.kLow}", "${f.kHigh}") or "${f.kLogSd}", not both` });
      if (!given(f.kLow) || !given(f.kHigh)) {
        problems.push({ severity: 'error', place: place(given(f.kLow) ? f.kHigh : f.kLow), message: `a K range needs both "${f.kLow}" and "${f.kHigh}" (the P10 and P90)` });
        return { medianMPerDay: zone.kMPerDay, logSd: 0 };
      }
      const low = number(f.kLow), high = number(f.kHigh);
      if (low === null || high === null) return { medianMPerDay: zone.kMPerDay, logSd: 0 };
      if (!(high >= low)) problems.push({ severity: 'error', place: place(f.kHigh), message: `"${f.kHigh}" ${high} is below "${f.kLow}" ${low}` });
      const lowM = kToMPerDay(low, rules.units.k), highM = kToMPerDay(high, rules.units.k);
      // a K the run scaled (the multipliers fitted to wells, --apply-k-fit) moves the range with it
      const givenK = properties[f.k];
      const scale = typeof givenK === 'number' && givenK > 0 ? zone.kMPerDay / kToMPerDay(givenK, rules.units.k) : 1;
      return { medianMPerDay: Math.sqrt(lowM * highM) * scale, logSd: Math.log(highM / lowM) / (2 * Z90) };
    }
    if (given(f.kLogSd)) {
      const value = properties[f.kLogSd];
      if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || value > 5) {
        problems.push({ severity: 'error', place: place(f.kLogSd), message: `expected a standard deviation of ln K from 0 to 5, found ${JSON.stringify(value)?.slice(0, 60)}` });
        return { medianMPerDay: zone.kMPerDay, logSd: 0 };
      }
      return { medianMPerDay: zone.kMPerDay, logSd: value };
    }
    return { medianMPerDay: zone.kMPerDay, logSd: 0 };
  });
  return { spreads, problems };
}


/** A standard normal deviate from two uniform draws (Box-Muller, G.E.P. Box and M.E. Muller (1958), Ann. Math. Stat. 29, 610-611 [from memory]). */
function normal(random: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

/** The p-th percentile of sorted values, by linear interpolation between closest ranks (NIST/SEMATECH e-Handbook's definition R-7, common practice). */
export function percentile(sorted: Float64Array | number[], p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p, lo = Math.floor(h);
  return lo + 1 < n ? sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]) : sorted[lo];
}

function percentilesOf(values: Float64Array): Percentiles {
  const sorted = Float64Array.from(values.filter(Number.isFinite)).sort();
  return { p10: percentile(sorted, 0.1), p50: percentile(sorted, 0.5), p90: percentile(sorted, 0.9) };
}

/** Draws each zone's K `samples` times and re-solves the strips of the run for each draw. */
export function spreadFromK(result: ScreenResult, spreads: readonly ZoneSpread[], options: SpreadOptions): SpreadResult {
  const { lines, zones, stations, facings, zoneIndex, lineLengthsM, geometries } = result;
  const settings: ScreenSettings = { ...result.settings, stripsOnly: true };
  const lineTable = buildLineTable(geometries);
  const random = seededRandom(options.seed);
  const stripIds = result.strips.map((strip) => strip.stripId);
  const stripIndex = new Map(stripIds.map((id, i) => [id, i]));
  const n = options.samples;
  const stripLoss = stripIds.map(() => new Float64Array(n).fill(NaN));
  const stripRisk = stripIds.map(() => Object.fromEntries([...RISK_CLASSES, 'unsolved'].map((risk) => [risk, 0])) as Record<RiskClass | 'unsolved', number>);
  const stripTop = new Float64Array(stripIds.length);
  const lineLoss = lines.map(() => new Float64Array(n).fill(NaN));
  const net = new Float64Array(n);
  const lost = new Float64Array(n);
  for (let s = 0; s < n; s++) {
    const shared = normal(random);
    const drawn = zones.map((zone, z): ZoneRecord => {
      const { medianMPerDay, logSd } = spreads[z];
      if (logSd === 0 && medianMPerDay === zone.kMPerDay) return zone;
      const deviate = options.correlated ? shared : normal(random);
      return { ...zone, kMPerDay: medianMPerDay * Math.exp(logSd * deviate) };
    });
    const results = solveFacings(lines, lineLengthsM, drawn, zoneIndex, stations, facings, settings);
    // depths over the DEM's ground, as the run took them
    if (result.ground) groundFromDem(result.ground, lines, drawn, zoneIndex, stations, facings, results, settings);
    const strips = buildStrips(lineTable, stations, { ...facings, reason: results.reason }, { spacingJump: settings.spacingJump }).map((strip) =>
      summariseStrip(strip, lines, stations, facings, results, settings),
    );
    rankStrips(strips, 'loss');
    strips.forEach((strip, rank) => {
      const i = stripIndex.get(strip.stripId);
      if (i === undefined) return;
      stripLoss[i][s] = strip.lossM3PerDayKm;
      stripRisk[i][strip.risk ?? 'unsolved']++;
      if (rank < options.top) stripTop[i]++;
    });
    const summaries = summariseLines(lines, lineLengthsM, stations, facings, results);
    let total = 0, losing = 0;
    summaries.forEach((summary, l) => {
      lineLoss[l][s] = summary.netLossM3PerDay;
      if (Number.isFinite(summary.netLossM3PerDay)) total += summary.netLossM3PerDay;
      if (summary.netLossM3PerDay > 0) losing += summary.netLossM3PerDay;
    });
    net[s] = total;
    lost[s] = losing;
  }
  return {
    options,
    zones: zones.flatMap((zone, z) => (spreads[z].logSd > 0 ? [{ zoneId: zone.id, medianMPerDay: spreads[z].medianMPerDay, logSd: spreads[z].logSd }] : [])),
    strips: stripIds.map((stripId, i) => ({
      stripId,
      lossM3PerDayKm: percentilesOf(stripLoss[i]),
      riskShare: Object.fromEntries(Object.entries(stripRisk[i]).map(([risk, count]) => [risk, count / n])) as Record<RiskClass | 'unsolved', number>,
      topShare: stripTop[i] / n,
    })),
    lines: lines.map((line, l) => ({ lineId: line.id, netLossM3PerDay: percentilesOf(lineLoss[l]) })),
    netSeepageM3PerDay: percentilesOf(net),
    lostByLosingLinesM3PerDay: percentilesOf(lost),
  };
}
