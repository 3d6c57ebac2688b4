import { booleanPointInPolygon } from '@turf/boolean-point-in-polygon';
import { multiPolygon } from '@turf/helpers';
import { describe, expect, it } from 'vitest';
import { pointInOutline, zoneOutline } from '../../src/geometry/zone-outlines.js';
import { seededRandom } from '../../src/shared/random.js';

// a MultiPolygon: a square with a square hole (given the wrong way round), and a triangle
const polygons = [
  [[[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]], [[1, 1], [3, 1], [3, 3], [1, 3], [1, 1]]],
  [[[5, 0], [5, 2], [7, 0], [5, 0]]],
];

describe('pointInOutline', () => {
  it('answers as turf booleanPointInPolygon, boundary included, at vertices, on edges and anywhere', () => {
    const outline = zoneOutline(polygons);
    const shape = multiPolygon(polygons);
    const rnd = seededRandom(3);
    const points: number[][] = [[2, 2], [0.5, 0.5], [0, 0], [2, 0], [1, 2], [3, 3], [6, 1], [5, 1], [6, 0.5], [4.5, 2], [8, 8], [-1, 2]];
    for (let i = 0; i < 2000; i++) points.push([Math.round(rnd() * 80 - 4) / 8, Math.round(rnd() * 48 - 4) / 8]);
    for (const [x, y] of points) expect(pointInOutline(outline, x, y), `${x}, ${y}`).toBe(booleanPointInPolygon([x, y], shape));
  });

  it('turns outer rings counter-clockwise and holes clockwise', () => {
    const outline = zoneOutline(polygons);
    const ringArea2 = (r: number) => {
      let sum = 0;
      for (let i = outline.ringStart[r]; i < outline.ringStart[r + 1]; i++) sum += outline.x[i] * outline.y[outline.next[i]] - outline.x[outline.next[i]] * outline.y[i];
      return sum;
    };
    expect([ringArea2(0), ringArea2(1), ringArea2(2)]).toEqual([32, -8, 4]);
  });
});
