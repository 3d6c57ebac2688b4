// The config's units, applied through the validation stage, give SI values. The expected figures
// are worked out here from the definitions, not from doab's own constants:
//   1 d = 86 400 s (SI Brochure, BIPM 2019, table 8, non-SI units accepted for use with the SI [published])
//   1 ft = 0.3048 m exactly (international yard and pound agreement, 1959 [published])
//   1 year = 365.25 d, the Julian year (IAU [published]); recharge in mm/yr is a long-run mean
import { describe, expect, it } from 'vitest';
import { DataError, UsageError } from '../../src/shared/errors.js';
import { parseConfig } from '../../src/input/config.js';
import { checkLines, checkZones } from '../../src/screening/district-inputs.js';

/** The problems of features, leaving out what is said once for a whole file (a default applied to every feature). */
const featureProblems = <P extends { place: { featureIndex?: number } }>(problems: P[]): P[] => problems.filter((p) => p.place.featureIndex !== undefined);

const zone = (properties: Record<string, unknown>) => ({
  type: 'Feature',
  properties: { id: 'z', ...properties },
  geometry: { type: 'Polygon', coordinates: [[[30.45, 29.46], [30.56, 29.46], [30.56, 29.54], [30.45, 29.54], [30.45, 29.46]]] },
});
const line = (id: string, properties: Record<string, unknown>) => ({
  type: 'Feature',
  properties: { id, ...properties },
  geometry: { type: 'LineString', coordinates: [[30.5, 29.5], [30.52, 29.5]] },
});

function zoneWith(configText: string, properties: Record<string, unknown>) {
  const { rules } = parseConfig('config.jsonc', configText);
  const checked = checkZones('aquifer.geojson', [zone(properties)], rules);
  expect(featureProblems(checked.problems).filter((p) => p.severity === 'error')).toEqual([]);
  return { zone: checked.records[0], problems: featureProblems(checked.problems) };
}

const relative = (got: number, expected: number) => Math.abs(got / expected - 1);

describe('hydraulic conductivity units', () => {
  it('ft/d: 1 ft/d = 0.3048 m/d exactly (international foot, 1959 agreement)', () => {
    const { zone: z } = zoneWith('{ "units": { "k": "ft/d" } }', { k_m_d: 50, base_m: 0, ground_m: 10 });
    expect(relative(z.kMPerDay, 15.24)).toBeLessThan(1e-12);
  });

  it('cm/s: 1 cm/s = 0.01 m/s x 86 400 s/d = 864 m/d', () => {
    const { zone: z } = zoneWith('{ "units": { "k": "cm/s" } } // comments are allowed', { k_m_d: 0.01, base_m: 0, ground_m: 10 });
    expect(relative(z.kMPerDay, 8.64)).toBeLessThan(1e-12);
    const { zone: one } = zoneWith('{ "units": { "k": "cm/s" } }', { k_m_d: 1, base_m: 0, ground_m: 10 });
    expect(relative(one.kMPerDay, 864)).toBeLessThan(1e-12);
  });

  it('m/s: 1 m/s = 86 400 m/d, which is far outside the handbook range and says so', () => {
    const { zone: z, problems } = zoneWith('{ "units": { "k": "m/s" } }', { k_m_d: 1, base_m: 0, ground_m: 10 });
    expect(relative(z.kMPerDay, 86_400)).toBeLessThan(1e-12);
    expect(problems).toHaveLength(1);
    expect(problems[0].message).toMatch(/86400 m\/d is outside the handbook range.*\(m\/s\)/);
    // a sand's 1e-4 m/s is 8.64 m/d, inside the range: no warning
    const sand = zoneWith('{ "units": { "k": "m/s" } }', { k_m_d: 1e-4, base_m: 0, ground_m: 10 });
    expect(relative(sand.zone.kMPerDay, 8.64)).toBeLessThan(1e-12);
    expect(featureProblems(sand.problems)).toEqual([]);
  });

  it('m/d is the default and is taken as it is', () => {
    const { zone: z } = zoneWith('{}', { k_m_d: 12.5, base_m: 0, ground_m: 10 });
    expect(z.kMPerDay).toBe(12.5);
  });
});

describe('recharge units', () => {
  it('mm/yr (the default) over the Julian year: 365.25 mm/yr = 0.001 m/d', () => {
    const { zone: z } = zoneWith('{}', { k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 365.25 });
    expect(relative(z.rechargeMPerDay, 0.001)).toBeLessThan(1e-12);
    // negative for net evaporation or pumping
    const dry = zoneWith('{}', { k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: -730.5 });
    expect(relative(dry.zone.rechargeMPerDay, -0.002)).toBeLessThan(1e-12);
  });

  it('in/yr and mm/d: 1 in = 25.4 mm exactly (international inch, 1959 agreement), a year of 365.25 d', () => {
    const { zone: inches } = zoneWith('{ "units": { "recharge": "in/yr" } }', { k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 10 });
    // 10 in/yr = 254 mm/yr = 0.254 m / 365.25 d
    expect(relative(inches.rechargeMPerDay, 0.254 / 365.25)).toBeLessThan(1e-12);
    const { zone: daily } = zoneWith('{ "units": { "recharge": "mm/d" } }', { k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 0.5 });
    expect(relative(daily.rechargeMPerDay, 0.0005)).toBeLessThan(1e-12);
  });

  it('m/d is taken as it is, and the default recharge is in the configured unit', () => {
    const { zone: z } = zoneWith('{ "units": { "recharge": "m/d" } }', { k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 0.0005 });
    expect(z.rechargeMPerDay).toBe(0.0005);
    const fallback = zoneWith('{ "units": { "recharge": "m/d" }, "defaults": { "recharge": 0.0002 } }', { k_m_d: 10, base_m: 0, ground_m: 10 });
    expect(fallback.zone.rechargeMPerDay).toBe(0.0002);
  });

  it('judges plausibility after the conversion: 0.01 m/d is 3652.5 mm/yr, beyond 3000 mm/yr', () => {
    const { rules } = parseConfig('config.jsonc', '{ "units": { "recharge": "m/d" } }');
    const checked = checkZones('aquifer.geojson', [zone({ k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 0.01 })], rules);
    expect(checked.records).toEqual([]);
    expect(featureProblems(checked.problems)).toHaveLength(1);
    expect(featureProblems(checked.problems)[0].place).toEqual({ file: 'aquifer.geojson', featureIndex: 0, featureId: 'z', field: 'recharge_mm_yr' });
    expect(featureProblems(checked.problems)[0].message).toMatch(/recharge 0\.01 m\/d is 3653 mm\/yr, not plausible/);
    // 0.008 m/d is 2922 mm/yr: inside the limit
    expect(featureProblems(checkZones('aquifer.geojson', [zone({ k_m_d: 10, base_m: 0, ground_m: 10, recharge_mm_yr: 0.008 })], rules).problems)).toEqual([]);
  });
});

describe('elevation units', () => {
  it('ft: base, ground and stages times 0.3048 m', () => {
    const config = '{ "units": { "elevation": "ft" } }';
    const { zone: z } = zoneWith(config, { k_m_d: 10, base_m: 100, ground_m: 150 });
    expect(relative(z.baseM, 30.48)).toBeLessThan(1e-12);
    expect(relative(z.groundM, 45.72)).toBeLessThan(1e-12);
    const { rules } = parseConfig('config.jsonc', config);
    const lines = checkLines('canals.geojson', [line('level', { stage_m: 140 }), line('sloping', { stage_start_m: 141, stage_end_m: 139 })], rules);
    expect(featureProblems(lines.problems)).toEqual([]);
    expect(relative(lines.records[0].stageStartM, 42.672)).toBeLessThan(1e-12);
    expect(lines.records[0].stageEndM).toBe(lines.records[0].stageStartM);
    expect(relative(lines.records[1].stageStartM, 42.9768)).toBeLessThan(1e-12);
    expect(relative(lines.records[1].stageEndM, 42.3672)).toBeLessThan(1e-12);
  });

  it('compares ground and base after the conversion, and reports them in metres', () => {
    const { rules } = parseConfig('config.jsonc', '{ "units": { "elevation": "ft" } }');
    const checked = checkZones('aquifer.geojson', [zone({ k_m_d: 10, base_m: 100, ground_m: 100 })], rules);
    expect(featureProblems(checked.problems)[0].place.field).toBe('ground_m');
    expect(featureProblems(checked.problems)[0].message).toMatch(/ground 30\.48 m must lie above the aquifer base 30\.48 m/);
  });
});

describe('field names and units from the config together', () => {
  it('reads K in cm/s from a renamed attribute', () => {
    const { zone: z } = zoneWith('{ "fields": { "zones": { "k": "ksat_cm_s" } }, "units": { "k": "cm/s" } }', { ksat_cm_s: 0.002, base_m: 0, ground_m: 10 });
    expect(relative(z.kMPerDay, 1.728)).toBeLessThan(1e-12);
  });

  it('rejects a unit doab does not know as a usage error, naming the key and the choices', () => {
    expect(() => parseConfig('config.jsonc', '{ "units": { "elevation": "yd" } }')).toThrow(UsageError);
    expect(() => parseConfig('config.jsonc', '{ "units": { "elevation": "yd" } }')).toThrow(/config\.jsonc: "units\.elevation" must be one of "m", "ft", found "yd"/);
  });
});
