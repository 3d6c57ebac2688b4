import { describe, expect, it } from 'vitest';
import { rechargeToMPerDay } from '../../src/shared/units.js';
import { checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

const square = [[[30, 29], [30.01, 29], [30.01, 29.01], [30, 29.01], [30, 29]]];

function zone(properties: Record<string, unknown>) {
  return { type: 'Feature', properties: { id: 'z', k_m_d: 10, base_m: 90, ground_m: 110, ...properties }, geometry: { type: 'Polygon', coordinates: square } };
}

describe('field names cut by the shapefile format', () => {
  // dBASE III field names hold at most 10 characters (the shapefile technical description, ESRI 1998 [from memory])
  it('reads recharge_m as recharge_mm_yr, with a warning', () => {
    const checked = checkZones('zones.shp', [zone({ recharge_m: 150 })], DEFAULT_RULES);
    expect(checked.records[0].rechargeMPerDay).toBeCloseTo(rechargeToMPerDay(150, 'mm/yr'), 15);
    expect(checked.problems).toHaveLength(1);
    expect(checked.problems[0]).toMatchObject({ severity: 'warning', place: { file: 'zones.shp', field: 'recharge_m' } });
    expect(checked.problems[0].message).toMatch(/reading "recharge_m" as "recharge_mm_yr"/);
  });

  it('prefers the full name when it is there', () => {
    const checked = checkZones('zones.geojson', [zone({ recharge_mm_yr: 50, recharge_m: 150 })], DEFAULT_RULES);
    expect(checked.records[0].rechargeMPerDay).toBeCloseTo(rechargeToMPerDay(50, 'mm/yr'), 15);
    expect(checked.problems).toEqual([]);
  });
});
