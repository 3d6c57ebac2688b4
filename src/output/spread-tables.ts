// The spread from uncertain K as tables: spread-strips.csv (each strip's P10/P50/P90 loss per km,
// the share of the draws in each risk class, how often it stays in the top of the ranking) and
// spread-lines.csv (each line's P10/P50/P90 net loss), and its part of run.json.
import { stringify } from 'csv-stringify/sync';
import type { SpreadResult } from '../screening/spread.js';
import { RISK_CLASSES } from '../shared/settings.js';
import { roundNumber } from './format.js';
import { neutraliseCell } from './layers.js';

export const SPREAD_STRIP_COLUMNS = [
  'strip_id', 'loss_m3_d_km_p10', 'loss_m3_d_km_p50', 'loss_m3_d_km_p90', ...RISK_CLASSES.map((risk) => `share_${risk}`), 'share_unsolved', 'share_in_top',
] as const;
export const SPREAD_LINE_COLUMNS = ['line_id', 'net_loss_m3_d_p10', 'net_loss_m3_d_p50', 'net_loss_m3_d_p90'] as const;

export function spreadStripsTable(spread: SpreadResult): string {
  const rows = spread.strips.map((strip) =>
    [
      strip.stripId,
      roundNumber(strip.lossM3PerDayKm.p10),
      roundNumber(strip.lossM3PerDayKm.p50),
      roundNumber(strip.lossM3PerDayKm.p90),
      ...RISK_CLASSES.map((risk) => roundNumber(strip.riskShare[risk])),
      roundNumber(strip.riskShare.unsolved),
      roundNumber(strip.topShare),
    ].map((cell) => neutraliseCell(cell ?? '')),
  );
  return stringify([[...SPREAD_STRIP_COLUMNS], ...rows], { record_delimiter: 'unix' });
}

export function spreadLinesTable(spread: SpreadResult): string {
  const rows = spread.lines.map((line) =>
    [line.lineId, roundNumber(line.netLossM3PerDay.p10), roundNumber(line.netLossM3PerDay.p50), roundNumber(line.netLossM3PerDay.p90)].map((cell) => neutraliseCell(cell ?? '')),
  );
  return stringify([[...SPREAD_LINE_COLUMNS], ...rows], { record_delimiter: 'unix' });
}

export function spreadRecord(spread: SpreadResult) {
  const p = (x: { p10: number; p50: number; p90: number }) => ({ p10: roundNumber(x.p10), p50: roundNumber(x.p50), p90: roundNumber(x.p90) });
  return {
    samples: spread.options.samples,
    seed: spread.options.seed,
    zones_drawn: spread.options.correlated ? 'together (fully correlated)' : 'independently',
    method: 'strips',
    zones: spread.zones.map((zone) => ({ zone_id: zone.zoneId, median_k_m_d: roundNumber(zone.medianMPerDay), log_sd: roundNumber(zone.logSd) })),
    net_seepage_m3_d: p(spread.netSeepageM3PerDay),
    lost_by_losing_lines_m3_d: p(spread.lostByLosingLinesM3PerDay),
    top: spread.options.top,
  };
}

/** The summary's lines: the district's range, and the strips most often in the top. */
export function spreadText(spread: SpreadResult): string {
  const f = (v: number) => (Number.isFinite(v) ? v.toFixed(0) : '-');
  const steady = [...spread.strips].sort((a, b) => b.topShare - a.topShare || b.lossM3PerDayKm.p50 - a.lossM3PerDayKm.p50).slice(0, 5);
  return (
    `Spread from uncertain K (strips, ${spread.options.samples} draws, seed ${spread.options.seed}, zones drawn ${spread.options.correlated ? 'together' : 'independently'}; ${spread.zones.length} zones with a range): ` +
    `lost by losing lines P10 ${f(spread.lostByLosingLinesM3PerDay.p10)}, P50 ${f(spread.lostByLosingLinesM3PerDay.p50)}, P90 ${f(spread.lostByLosingLinesM3PerDay.p90)} m3/d ` +
    `(net seepage ${f(spread.netSeepageM3PerDay.p10)} to ${f(spread.netSeepageM3PerDay.p90)} m3/d: recharge holds it nearly fixed)\n` +
    `Strips most often in the top ${spread.options.top} by loss per km (share of draws; P10-P90 m3/d/km): ` +
    steady.map((s) => `${s.stripId} ${(s.topShare * 100).toFixed(0)}% (${f(s.lossM3PerDayKm.p10)}-${f(s.lossM3PerDayKm.p90)})`).join(', ')
  );
}
