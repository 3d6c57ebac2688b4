// Invariants every geometry run must keep, shared by the fixture and property tests.
import { booleanValid } from '@turf/boolean-valid';
import { polygon } from '@turf/helpers';
import { kinks } from '@turf/kinks';
import { expect } from 'vitest';
import { FACING_PAIRED, type FacingTable, type StationTable, type Strip } from '../../src/geometry/index.js';

/** Every paired facing belongs to exactly one strip, and strips hold nothing else. */
export function expectPairedFacingsOnce(stations: StationTable, facings: FacingTable, strips: Strip[]): void {
  const seen = new Uint8Array(facings.count);
  for (const s of strips) {
    for (const st of s.stationsA) seen[2 * st + s.sideA]++;
    for (const st of s.stationsB) {
      const k = 2 * st + s.sideB;
      expect(facings.partner[k]).toBe(s.lineA);
      seen[k]++;
    }
  }
  for (let k = 0; k < facings.count; k++) {
    expect(seen[k], `facing ${k} of station ${k >> 1}`).toBe(facings.reason[k] === FACING_PAIRED ? 1 : 0);
  }
  expect(stations.count * 2).toBe(facings.count);
}

/** Twice the signed area of a closed interleaved ring. */
export function signedArea2(ring: Float64Array): number {
  let sum = 0;
  for (let i = 2; i < ring.length; i += 2) sum += ring[i - 2] * ring[i + 1] - ring[i] * ring[i - 1];
  return sum;
}

/** Closed, counter-clockwise, and valid by turf's own OGC checks. */
export function expectValidRing(ring: Float64Array): void {
  const n = ring.length;
  expect(n).toBeGreaterThanOrEqual(8);
  expect([ring[n - 2], ring[n - 1]]).toEqual([ring[0], ring[1]]);
  expect(signedArea2(ring)).toBeGreaterThan(0);
  const coords: number[][] = [];
  for (let i = 0; i < n; i += 2) coords.push([ring[i], ring[i + 1]]);
  const poly = polygon([coords]);
  expect(kinks(poly).features).toHaveLength(0);
  expect(booleanValid(poly)).toBe(true);
}
