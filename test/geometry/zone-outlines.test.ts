import { booleanPointInPolygon } from '@turf/boolean-point-in-polygon';
import { multiPolygon } from '@turf/helpers';
import { describe, expect, it } from 'vitest';
import { edgeList, edgesNear, pointInOutline, zoneOutline } from '../../src/geometry/zone-outlines.js';
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

// a wobbly circle of 10,000 vertices with a square hole: many index nodes and bands, edges in every direction
const wobbly: number[][] = [];
for (let i = 0; i < 10_000; i++) {
  const a = (2 * Math.PI * i) / 10_000, r = 1 + 0.1 * Math.sin(17 * a);
  wobbly.push([Math.round(r * Math.cos(a) * 4096) / 4096, Math.round(r * Math.sin(a) * 4096) / 4096]);
}
wobbly.push(wobbly[0]);
const detailed = [[wobbly, [[-0.25, -0.25], [0.25, -0.25], [0.25, 0.25], [-0.25, 0.25], [-0.25, -0.25]]]];

describe('pointInOutline on a detailed zone', () => {
  it('answers as turf booleanPointInPolygon at vertices, edge midpoints and anywhere', () => {
    const outline = zoneOutline(detailed);
    const shape = multiPolygon(detailed);
    const rnd = seededRandom(5);
    const points: number[][] = [];
    for (let i = 0; i < 3000; i++) {
      const v = wobbly[Math.floor(rnd() * 10_000)], w = wobbly[Math.floor(rnd() * 10_000)];
      points.push(v, [(v[0] + w[0]) / 2, v[1]], [rnd() * 2.4 - 1.2, rnd() * 2.4 - 1.2]);
    }
    for (let i = 0; i < 10_000; i += 7) points.push([(wobbly[i][0] + wobbly[i + 1][0]) / 2, (wobbly[i][1] + wobbly[i + 1][1]) / 2]);
    points.push([0, 0], [0.25, 0], [0.25, 0.25], [0.3, 0], [-1.2, 0]);
    let inside = 0;
    for (const [x, y] of points) {
      const expected = booleanPointInPolygon([x, y], shape);
      expect(pointInOutline(outline, x, y), `${x}, ${y}`).toBe(expected);
      if (expected) inside++;
    }
    expect(inside).toBeGreaterThan(points.length / 3);
  });
});

describe('edgesNear', () => {
  it('finds every edge whose box meets the box, once, and no other', () => {
    const outline = zoneOutline(detailed);
    const found = edgeList();
    const rnd = seededRandom(7);
    for (let q = 0; q < 300; q++) {
      const x0 = rnd() * 2.4 - 1.2, y0 = rnd() * 2.4 - 1.2, size = q % 3 === 0 ? 0 : rnd() * 0.05;
      const count = edgesNear(outline, x0, y0, x0 + size, y0 + size * 2, found);
      const expected: number[] = [];
      for (let i = 0; i < outline.x.length; i++) {
        const j = outline.next[i];
        if (Math.min(outline.x[i], outline.x[j]) <= x0 + size && Math.max(outline.x[i], outline.x[j]) >= x0 &&
          Math.min(outline.y[i], outline.y[j]) <= y0 + size * 2 && Math.max(outline.y[i], outline.y[j]) >= y0) expected.push(i);
      }
      expect([...found.ids.subarray(0, count)].sort((a, b) => a - b)).toEqual(expected);
    }
  });

  it('writes after `start` and answers one past the last id', () => {
    const outline = zoneOutline([[[[0, 0], [2, 0], [2, 2], [0, 2], [0, 0]]]]);
    const found = edgeList();
    found.ids[0] = 99;
    expect(edgesNear(outline, 0.5, -1, 0.5, 1, found, 1)).toBe(2);
    expect([...found.ids.subarray(0, 2)]).toEqual([99, 0]);
    expect(edgesNear(outline, 3, 3, 4, 4, found, 1)).toBe(1);
  });
});
