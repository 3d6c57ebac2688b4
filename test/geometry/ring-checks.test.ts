import { booleanValid } from '@turf/boolean-valid';
import { polygon } from '@turf/helpers';
import { kinks } from '@turf/kinks';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { firstKink, holeMeetsShell, ringHasSpike } from '../../src/geometry/ring-checks.js';
import { checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

const closed = (ring: number[][]) => [...ring, ring[0]];
/** Each edge of a closed ring split into `per` equal steps: the same shape, more vertices. */
function densify(ring: number[][], per: number): number[][] {
  const out: number[][] = [];
  for (let i = 0; i + 1 < ring.length; i++) {
    const [ax, ay] = ring[i], [bx, by] = ring[i + 1];
    for (let k = 0; k < per; k++) out.push([ax + ((bx - ax) * k) / per, ay + ((by - ay) * k) / per]);
  }
  return closed(out);
}
const validByIndex = (rings: number[][][]) => rings.every((r, i) => !ringHasSpike(r) && (i === 0 || holeMeetsShell(rings[0], r) <= 1));

describe('ring checks by a segment index', () => {
  it('agree with turf kinks and booleanValid on small rings full of touches (property)', () => {
    // vertices on a coarse grid, so repeated vertices, collinear edges and touching rings are common
    const pt = fc.tuple(fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 4 }));
    const ring = fc.array(pt, { minLength: 3, maxLength: 9 }).map(closed);
    let kinked = 0, invalid = 0;
    fc.assert(
      fc.property(fc.array(ring, { minLength: 1, maxLength: 3 }), (rings) => {
        const turfKinks = kinks(polygon(rings)).features;
        const ours = firstKink(rings);
        expect(ours).toEqual(turfKinks.length > 0 ? turfKinks[0].geometry.coordinates : null);
        if (ours !== null) kinked++;
        if (ours === null) {
          const valid = booleanValid(polygon(rings));
          expect(validByIndex(rings)).toBe(valid);
          if (!valid) invalid++;
        }
      }),
      { seed: 14, numRuns: 3000 },
    );
    // the property must have met both kinds of refusal, or it proved little
    expect(kinked).toBeGreaterThan(100);
    expect(invalid).toBeGreaterThan(0);
  });

  it('finds the crossing of a densified bow-tie where turf does', () => {
    const bowtie = closed([[0, 0], [10, 10], [10, 0], [0, 10]]);
    const dense = densify(bowtie, 250);
    expect(firstKink([dense])).toEqual(kinks(polygon([dense])).features[0].geometry.coordinates);
    expect(firstKink([dense])).toEqual([5, 5]);
    // the same at 10,000 vertices, where turf's pairwise loop would take seconds
    expect(firstKink([densify(bowtie, 2500)])).toEqual([5, 5]);
  });

  it('names the one crossing of a large ring, and passes it without the crossing', () => {
    const n = 8000;
    const ring: number[][] = [];
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * i) / n;
      ring.push([75 + 0.05 * Math.cos(a), 29.5 + 0.05 * Math.sin(a)]);
    }
    const feature = (coordinates: number[][]) => ({ type: 'Feature', properties: { id: 'Z', k_m_d: 5, base_m: 100, ground_m: 120 }, geometry: { type: 'Polygon', coordinates: [closed(coordinates)] } });
    const clean = checkZones('aquifer.geojson', [feature(ring)], DEFAULT_RULES);
    expect(clean.problems.filter((p) => p.severity === 'error')).toEqual([]);
    // swapping two vertices a few apart folds the ring over itself in one small place
    const twisted = ring.slice();
    [twisted[1000], twisted[1002]] = [twisted[1002], twisted[1000]];
    const checked = checkZones('aquifer.geojson', [feature(twisted)], DEFAULT_RULES);
    const errors = checked.problems.filter((p) => p.severity === 'error');
    expect(errors).toHaveLength(1);
    expect(errors[0].message).toMatch(/^polygon 0 intersects itself \(first crossing near \[75\.0\d+,29\.5\d+\]\); fix the ring$/);
    const at = JSON.parse(/near (\[[^\]]+\])/.exec(errors[0].message)![1]) as number[];
    // the crossing lies among the swapped vertices
    expect(Math.hypot(at[0] - twisted[1001][0], at[1] - twisted[1001][1])).toBeLessThan(1e-4);
  });

  it('refuses a spike and a hole touching its shell twice, and keeps a hole inside', () => {
    // the first vertex lies on the next segment: the ring doubles back along it
    expect(ringHasSpike(closed([[1, 0], [0, 0], [2, 0], [2, 2]]))).toBe(true);
    expect(ringHasSpike(closed([[0, 0], [2, 0], [2, 2], [0, 2]]))).toBe(false);
    const shell = closed([[0, 0], [10, 0], [10, 10], [0, 10]]);
    expect(holeMeetsShell(shell, closed([[2, 2], [4, 2], [4, 4], [2, 4]]))).toBe(0);
    expect(holeMeetsShell(shell, closed([[0, 2], [4, 2], [4, 4], [0, 4]]))).toBeGreaterThan(1);
  });
});
