// Zones digitised in detail: the cross-checks find the same overlaps and holes, with the same
// messages, whether a zone's outline has 4 vertices or the same shape has 10,000 (issue 14).
import { densifiedRing } from '../../bench/zone-grid.js';
import { describe, expect, it } from 'vitest';
import { crossCheck } from '../../src/screening/cross-checks.js';
import { checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

/** turf's earth radius (m). */
const R = 6371008.8;
const RAD = Math.PI / 180;
/**
 * Area (m^2) of a box between two meridians and two parallels, as turf's area measures it, in closed
 * form: R^2 (lon1 - lon0) (sin lat1 - sin lat0), lon in radians (Lambert's cylindrical equal-area
 * projection, which turf's ring sum is for a ring along meridians and parallels).
 */
const boxAreaM2 = ([lon0, lat0, lon1, lat1]: number[]) => R * R * (lon1 - lon0) * RAD * (Math.sin(lat1 * RAD) - Math.sin(lat0 * RAD));

/** The box as a closed counter-clockwise ring of `vertices` vertices, each side split evenly from its lower-left end. */
function boxRing([lon0, lat0, lon1, lat1]: number[], vertices: number): number[][] {
  return densifiedRing([[lon0, lat0], [lon1, lat0], [lon1, lat1], [lon0, lat1]], vertices);
}

const zone = (id: string, box: number[], vertices: number) => ({
  type: 'Feature',
  properties: { id, k_m_d: 10, base_m: 90, ground_m: 100, recharge_mm_yr: 0 },
  geometry: { type: 'Polygon', coordinates: [boxRing(box, vertices)] },
});

function messages(boxes: Record<string, number[]>, vertices: number): string[] {
  const checked = checkZones('zones.geojson', Object.entries(boxes).map(([id, box]) => zone(id, box, vertices)), DEFAULT_RULES);
  expect(checked.problems).toEqual([]);
  expect(checked.records[0].polygonsLonLat[0][0]).toHaveLength(vertices + 1);
  return crossCheck([], checked.records, { lines: 'lines.geojson', zones: 'zones.geojson' }).problems.map((p) => `${p.place.featureId ?? ''} ${p.place.field} ${p.message}`);
}

describe('cross-checks on zones of 10,000 vertices', () => {
  it('give an overlap the area of its closed form, as for the same zones with 4 vertices', () => {
    const boxes = { A: [75, 29.5, 75.1, 29.6], B: [75.05, 29.55, 75.15, 29.65] };
    const overlapHa = (boxAreaM2([75.05, 29.55, 75.1, 29.6]) / 10_000).toFixed(2);
    expect(overlapHa).toBe('2688.35');
    const expected = [`B geometry overlaps zone "A" (feature 0) over ${overlapHa} ha; where zones overlap doab uses the one listed first`];
    expect(messages(boxes, 4)).toEqual(expected);
    expect(messages(boxes, 10_000)).toEqual(expected);
  });

  it('find no overlap between zones that share an edge or do not touch', () => {
    const boxes = { A: [75, 29.5, 75.1, 29.6], B: [75.1, 29.5, 75.2, 29.6], C: [75.25, 29.5, 75.3, 29.6] };
    expect(messages(boxes, 4)).toEqual([]);
    expect(messages(boxes, 10_000)).toEqual([]);
  });

  it('find no overlap or hole where two zones share one edge of a third (a T-junction)', () => {
    // A's east edge is B's west edge and C's; at 10,000 vertices A's and B's or C's vertices along it mostly differ
    const boxes = { A: [75, 29.5, 75.1, 29.6], B: [75.1, 29.5, 75.2, 29.53], C: [75.1, 29.53, 75.2, 29.6] };
    expect(messages(boxes, 4)).toEqual([]);
    expect(messages(boxes, 10_000)).toEqual([]);
  });

  it('give a hole between zones the area of its closed form and its place', () => {
    // four zones around a hole 0.01 degrees square; W and E carry its corners on their inner edges
    // only in the 4-vertex case, so the two cases share no vertex beyond the corners of each box
    const boxes = { N: [75, 29.52, 75.03, 29.53], S: [75, 29.5, 75.03, 29.51], W: [75, 29.51, 75.01, 29.52], E: [75.02, 29.51, 75.03, 29.52] };
    const holeHa = (boxAreaM2([75.01, 29.51, 75.02, 29.52]) / 10_000).toFixed(2);
    expect(holeHa).toBe('107.60');
    const expected = [
      ` geometry the zones leave a gap of ${holeHa} ha between them near lon 75.01500, lat 29.51500; ` +
        'transects that cross it are joined to a neighbour zone when the gap is small (up to 2 m or 1% of the transect), else left unsolved',
    ];
    expect(messages(boxes, 4)).toEqual(expected);
    expect(messages(boxes, 10_000)).toEqual(expected);
  });

  it('warn of overlaps along a shared edge that was digitised twice, a little apart, only past the sliver tolerance', () => {
    // B's west edge 1e-7 degrees (about 1 cm) into A: 1 cm over 11 km is about 110 m^2, more than 1 m^2
    const boxes = { A: [75, 29.5, 75.1, 29.6], B: [75.1 - 1e-7, 29.5, 75.2, 29.6] };
    const sliverHa = (boxAreaM2([75.1 - 1e-7, 29.5, 75.1, 29.6]) / 10_000).toFixed(2);
    const expected = [`B geometry overlaps zone "A" (feature 0) over ${sliverHa} ha; where zones overlap doab uses the one listed first`];
    expect(messages(boxes, 4)).toEqual(expected);
    expect(messages(boxes, 10_000)).toEqual(expected);
    // 1e-10 degrees (about 10 micrometres, 0.1 m^2) is a sliver: no warning
    expect(messages({ A: boxes.A, B: [75.1 - 1e-10, 29.5, 75.2, 29.6] }, 10_000)).toEqual([]);
  });
});
