import { describe, expect, it } from 'vitest';
import { checkLines, checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

/** The problems of features, leaving out what is said once for a whole file (a default applied to every feature). */
const featureProblems = <P extends { place: { featureIndex?: number } }>(problems: P[]): P[] => problems.filter((p) => p.place.featureIndex !== undefined);

function lineFeature(properties: Record<string, unknown>, coordinates: number[][] = [[30, 29], [30.01, 29]]) {
  return { type: 'Feature', properties, geometry: { type: 'LineString', coordinates } };
}

describe('line checks', () => {
  it('refuses an id with "|", which would make strip ids ambiguous', () => {
    const checked = checkLines('l.geojson', [lineFeature({ id: 'A|B', stage_m: 100 })], DEFAULT_RULES);
    expect(checked.records).toEqual([]);
    expect(featureProblems(checked.problems)[0]).toMatchObject({ severity: 'error', place: { featureIndex: 0, field: 'id' } });
    expect(featureProblems(checked.problems)[0].message).toMatch(/contains "\|"/);
  });

  it('warns when both a constant stage and start and end stages are given, and uses the constant', () => {
    const checked = checkLines('l.geojson', [lineFeature({ id: 'A', stage_m: 100, stage_start_m: 101, stage_end_m: 99 })], DEFAULT_RULES);
    expect(checked.records[0]).toMatchObject({ stageStartM: 100, stageEndM: 100, stageField: 'stage_m' });
    expect(featureProblems(checked.problems)).toHaveLength(1);
    expect(featureProblems(checked.problems)[0]).toMatchObject({ severity: 'warning', place: { field: 'stage_m' } });
  });

  it('warns of a line with no length', () => {
    const checked = checkLines('l.geojson', [lineFeature({ id: 'A', stage_m: 100 }, [[30, 29], [30, 29], [30, 29]])], DEFAULT_RULES);
    expect(checked.records).toHaveLength(1);
    expect(featureProblems(checked.problems).map((p) => p.message)).toEqual([expect.stringMatching(/no length/)]);
  });
});

describe('every problem of a feature in one run', () => {
  it('lists a line\'s bad kind, bad stages and bad geometry together', () => {
    const feature = { type: 'Feature', properties: { id: 'A', kind: 'river', stage_start_m: '100,5', stage_end_m: 'high' }, geometry: { type: 'Point', coordinates: [30, 29] } };
    const checked = checkLines('l.geojson', [feature], DEFAULT_RULES);
    expect(checked.records).toEqual([]);
    expect(featureProblems(checked.problems).map((p) => [p.severity, p.place.field])).toEqual([
      ['error', 'kind'],
      ['error', 'stage_start_m'],
      ['error', 'stage_end_m'],
      ['error', 'geometry'],
    ]);
    expect(featureProblems(checked.problems)[1].message).toMatch(/decimal comma\? write 100\.5/);
  });

  it('lists a zone\'s missing conductivity, ground below base and implausible recharge together', () => {
    const feature = {
      type: 'Feature',
      properties: { id: 'Z', base_m: 100, ground_m: 95, recharge_mm_yr: 9000 },
      geometry: { type: 'Polygon', coordinates: [[[30, 29], [30.01, 29], [30.01, 29.01], [30, 29.01], [30, 29]]] },
    };
    const checked = checkZones('z.geojson', [feature], DEFAULT_RULES);
    expect(checked.records).toEqual([]);
    expect(featureProblems(checked.problems).map((p) => p.place.field)).toEqual(['k_m_d', 'ground_m', 'recharge_mm_yr']);
  });
});

describe('zone geometry', () => {
  it('refuses a polygon with no area', () => {
    const flat = { type: 'Feature', properties: { id: 'Z', k_m_d: 10, base_m: 90, ground_m: 100 }, geometry: { type: 'Polygon', coordinates: [[[30, 29], [30.01, 29], [30.02, 29], [30, 29]]] } };
    const checked = checkZones('z.geojson', [flat], DEFAULT_RULES);
    expect(checked.records).toEqual([]);
    expect(featureProblems(checked.problems)).toHaveLength(1);
    expect(featureProblems(checked.problems)[0]).toMatchObject({ severity: 'error', place: { field: 'geometry' } });
    expect(featureProblems(checked.problems)[0].message).toMatch(/no area/);
  });
});

describe('the checks and the solve interpolate a stage by the same chainage', () => {
  it('reports the chainage of a vertex as the planar distance along the line in the work CRS, as the stations have it', async () => {
    const { checkLines, checkZones } = await import('../../src/screening/district-inputs.js');
    const { crossCheck } = await import('../../src/screening/cross-checks.js');
    const { DEFAULT_RULES } = await import('../../src/shared/input-rules.js');
    const { box, line } = await import('./local-district.js');
    // 200 km off the central meridian of UTM 36N the geodesic length of 10 km is about 1 m shorter
    // than the projected one (UTM point scale, common practice); the solve's chainage is the projected one
    const lines = checkLines('l.geojson', [line('S', { stage_start_m: 95, stage_end_m: 85 }, [[0, 0], [10000, 0], [20000, 0]])], DEFAULT_RULES).records;
    const zones = checkZones('z.geojson', [box('Z', { k_m_d: 10, base_m: 90.5, ground_m: 100 }, [-100, -100, 20100, 100])], DEFAULT_RULES).records;
    const { problems } = crossCheck(lines, zones, { lines: 'l.geojson', zones: 'z.geojson' }, 'EPSG:32636');
    expect(problems.map((problem) => problem.message)).toContainEqual(expect.stringMatching(/^stage 90 m at chainage 10000 m is at or below the aquifer base 90.5 m/));
  });
});
