// The lining planner's tables and layer: lining.csv (every reach of the plan, in plan order),
// lining-programme.csv (the reaches the budget allows, best first, with running totals) and
// lining.geojson (each reach as the stretch of its line, with the same figures).
import { stringify } from 'csv-stringify/sync';
import { cutByChainage } from '../geometry/index.js';
import type { LiningOutcome, ReachOutcome } from '../screening/lining.js';
import { m3PerDayToM3PerYear } from '../shared/units.js';
import { roundNumber } from './format.js';
import { featureCollection, neutraliseCell, toLonLat, type LayerFormat } from './layers.js';

export const LINING_COLUMNS = [
  'reach_id', 'line_id', 'from_m', 'to_m', 'length_m', 'lined_resistance_d', 'method',
  'line_loss_now_m3_d', 'line_loss_lined_m3_d', 'saved_m3_d', 'saved_m3_yr', 'saved_m3_d_km',
  'cost', 'cost_per_1000_m3', 'waterlogged_ha_change', 'potential_ha_change', 'strips_affected', 'programme_rank',
] as const;

export const PROGRAMME_COLUMNS = [
  'programme_rank', 'reach_id', 'line_id', 'length_m', 'saved_m3_d', 'saved_m3_d_km', 'cost',
  'km_total', 'cost_total', 'saved_m3_d_total',
] as const;

function rankOf(outcome: LiningOutcome): Map<ReachOutcome, number> {
  return new Map(outcome.programme.map((step, i) => [step.outcome, i + 1]));
}

export function liningRow(outcome: LiningOutcome, reach: ReachOutcome, rank: number | undefined): Record<(typeof LINING_COLUMNS)[number], unknown> {
  return {
    reach_id: reach.reach.id,
    line_id: reach.reach.lineId,
    from_m: roundNumber(reach.fromM),
    to_m: roundNumber(reach.toM),
    length_m: roundNumber(reach.lengthM),
    lined_resistance_d: roundNumber(reach.reach.resistanceD),
    method: outcome.method,
    line_loss_now_m3_d: roundNumber(reach.lineLossNowM3PerDay),
    line_loss_lined_m3_d: roundNumber(reach.lineLossLinedM3PerDay),
    saved_m3_d: roundNumber(reach.savedM3PerDay),
    saved_m3_yr: roundNumber(m3PerDayToM3PerYear(reach.savedM3PerDay)),
    saved_m3_d_km: roundNumber(reach.savedM3PerDayKm),
    cost: reach.cost === null ? null : roundNumber(reach.cost),
    cost_per_1000_m3: reach.costPer1000M3 === null ? null : roundNumber(reach.costPer1000M3),
    waterlogged_ha_change: roundNumber(reach.waterloggedHaChange),
    potential_ha_change: roundNumber(reach.potentialHaChange),
    strips_affected: reach.affectedStrips
      .map((s) => `${s.stripId} ${s.minDepthNowM.toFixed(2)}->${s.minDepthLinedM.toFixed(2)} m${s.riskNow !== s.riskLined ? ` (${s.riskNow ?? 'unsolved'}->${s.riskLined ?? 'unsolved'})` : ''}`)
      .join('; '),
    programme_rank: rank ?? null,
  };
}

export function liningTable(outcome: LiningOutcome): string {
  const ranks = rankOf(outcome);
  const rows = outcome.reaches.map((reach) => {
    const row = liningRow(outcome, reach, ranks.get(reach));
    return LINING_COLUMNS.map((column) => neutraliseCell(row[column] ?? ''));
  });
  return stringify([[...LINING_COLUMNS], ...rows], { record_delimiter: 'unix' });
}

export function programmeTable(outcome: LiningOutcome): string {
  const rows = outcome.programme.map((step, i) => {
    const row: Record<(typeof PROGRAMME_COLUMNS)[number], unknown> = {
      programme_rank: i + 1,
      reach_id: step.outcome.reach.id,
      line_id: step.outcome.reach.lineId,
      length_m: roundNumber(step.outcome.lengthM),
      saved_m3_d: roundNumber(step.outcome.savedM3PerDay),
      saved_m3_d_km: roundNumber(step.outcome.savedM3PerDayKm),
      cost: step.outcome.cost === null ? null : roundNumber(step.outcome.cost),
      km_total: roundNumber(step.kmTotal),
      cost_total: step.costTotal === null ? null : roundNumber(step.costTotal),
      saved_m3_d_total: roundNumber(step.savedM3PerDayTotal),
    };
    return PROGRAMME_COLUMNS.map((column) => neutraliseCell(row[column] ?? ''));
  });
  return stringify([[...PROGRAMME_COLUMNS], ...rows], { record_delimiter: 'unix' });
}

const LINING_REAL_FIELDS: ReadonlySet<string> = new Set([
  'from_m', 'to_m', 'length_m', 'lined_resistance_d', 'line_loss_now_m3_d', 'line_loss_lined_m3_d', 'saved_m3_d',
  'saved_m3_yr', 'saved_m3_d_km', 'cost', 'cost_per_1000_m3', 'waterlogged_ha_change', 'potential_ha_change',
]);

export function liningLayer(outcome: LiningOutcome, format: LayerFormat = 'collection'): Iterable<string> {
  const { resultNow } = outcome;
  const ranks = rankOf(outcome);
  return featureCollection(
    outcome.reaches.map((reach) => {
      const parts = cutByChainage(resultNow.geometries[reach.line], reach.fromM, reach.toM).map((part) => {
        const positions: [number, number][] = [];
        for (let i = 0; i < part.length; i += 2) positions.push(toLonLat(resultNow.crs, part[i], part[i + 1]));
        return positions;
      });
      return { type: 'Feature', properties: liningRow(outcome, reach, ranks.get(reach)), geometry: { type: 'MultiLineString', coordinates: parts } };
    }),
    format,
    LINING_REAL_FIELDS,
  );
}
