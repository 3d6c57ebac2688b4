// Zones that should share an edge but were digitised with a small gap between them: the strip is
// still solved across the gap (joined to a neighbour zone) and the run says so; a real hole in
// the aquifer leaves the transects unsolved, with a warning, not a silent zero.
import { describe, expect, it } from 'vitest';
import { checkZones } from '../../src/screening/district-inputs.js';
import { crossCheck } from '../../src/screening/cross-checks.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';
import { box, line, lonLat, screenLocal } from './local-district.js';

const lines = [
  line('A', { kind: 'canal', stage_m: 105 }, [[0, 0], [2000, 0]]),
  line('B', { kind: 'canal', stage_m: 103 }, [[0, -400], [2000, -400]]),
];
const zone = { k_m_d: 10, base_m: 90, ground_m: 108, recharge_mm_yr: 0 };

describe('gaps between zones', () => {
  it('bridges a 1 m digitising gap and still gives the closed-form seepage', () => {
    const result = screenLocal(lines, [box('N', zone, [-3000, -199.5, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -200.5])]);
    expect(result.strips).toHaveLength(1);
    // q = K (h0^2 - hL^2) / (2L) = 10 (225 - 169) / 800 = 0.7 m^2/d (Dupuit; Woessner and Poeter (2020), section 7.3 [published])
    // B starts as far west as A and lies south of it, so B is the strip's line a (geometry, not ids, decides)
    expect(result.strips[0].lineAId).toBe('B');
    expect(result.strips[0].qBM2PerDay).toBeCloseTo(0.7, 2);
    expect(result.warnings.join('\n')).toMatch(/cross small gaps between zones \(up to 1\.0 m\)/);
  });

  it('leaves a 100 m hole unsolved and says how many transect sides it cost', () => {
    // the strip method's own figures: the district solve sees the two canals through no aquifer either
    const result = screenLocal(lines, [box('N', zone, [-3000, -150, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -250])], { stripsOnly: true });
    expect(result.counts.facingsByReason['outside-aquifer']).toBeGreaterThan(0);
    expect(result.warnings.join('\n')).toMatch(/\d+ transect sides leave the aquifer zones/);
    expect(result.totals.lossM3PerDay).toBe(0);
  });
});

describe('doab check on gaps between zones', () => {
  it('warns of a hole the zones leave between them, with its area and place', () => {
    // W and E carry the gap's corners on their inner edges, so neighbouring edges share vertices
    const ring = (id: string, points: number[][]) => ({ type: 'Feature', properties: { id, ...zone }, geometry: { type: 'Polygon', coordinates: [lonLat([...points, points[0]])] } });
    const zones = checkZones('zones.geojson', [
      box('N', zone, [-3000, -199.5, 5000, 3000]),
      box('S', zone, [-3000, -3000, 5000, -200.5]),
      ring('W', [[-4000, -3000], [-3000, -3000], [-3000, -200.5], [-3000, -199.5], [-3000, 3000], [-4000, 3000]]),
      ring('E', [[5000, -3000], [6000, -3000], [6000, 3000], [5000, 3000], [5000, -199.5], [5000, -200.5]]),
    ], DEFAULT_RULES);
    expect(zones.problems).toEqual([]);
    const { problems } = crossCheck([], zones.records, { lines: 'lines.geojson', zones: 'zones.geojson' });
    // the gap is 8000 m long and 1 m wide: 8000 m^2 (turf measures on the sphere, so within 1 %)
    expect(problems).toHaveLength(1);
    const area = Number(/gap of (\d+) m2/.exec(problems[0].message)?.[1]);
    expect(area).toBeGreaterThan(7900);
    expect(area).toBeLessThan(8100);
    expect(problems[0]).toMatchObject({ severity: 'warning', place: { file: 'zones.geojson' } });
  });

  it('says nothing of zones that share their edges exactly', () => {
    const zones = checkZones('zones.geojson', [box('N', zone, [-3000, -200, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -200])], DEFAULT_RULES);
    expect(crossCheck([], zones.records, { lines: 'l', zones: 'z' }).problems).toEqual([]);
  });
});

describe('the solve stage reads the geometry stage and never writes into it', () => {
  it('leaves the facings as cast, and a second solve on the same facings gives the same answer', async () => {
    const { solveFacings } = await import('../../src/screening/solve-facings.js');
    // a 100 m hole: transects that leave the zones are outside-aquifer in the solve results only
    // with the transects layer asked for, the run keeps every result column to compare
    const result = screenLocal(lines, [box('N', zone, [-3000, -150, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -250])], { writeTransects: true });
    const castReasons = result.facings.reason.slice();
    const again = solveFacings(result.lines, result.lineLengthsM, result.zones, result.zoneIndex, result.stations, result.facings, result.settings);
    expect(result.facings.reason).toEqual(castReasons);
    expect(castReasons.some((reason, i) => reason !== result.results.reason[i])).toBe(true);
    for (const key of Object.keys(again) as (keyof typeof again)[]) expect(again[key], key).toEqual(result.transects![key]);
  });
});
