import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildZoneIndex, cutTransect, zonePolygons, type TransectCut } from '../../src/geometry/index.js';
import { densifiedRect, type Box } from '../../bench/zone-grid.js';

/** The plain inside test: every vertex of every ring, even-odd towards +x. */
function insidePlain(rings: Float64Array[], x: number, y: number): boolean {
  let inside = false;
  for (const r of rings) {
    const n = r.length / 2;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const xi = r[2 * i], yi = r[2 * i + 1], xj = r[2 * j], yj = r[2 * j + 1];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}

/** Each piece's zone by the plain test at the piece's midpoint, lowest zone index winning. */
function zonesByPlainScan(list: { zone: number; rings: Float64Array[] }[], x0: number, y0: number, x1: number, y1: number, cut: TransectCut): number[] {
  const total = Math.hypot(x1 - x0, y1 - y0);
  const out: number[] = [];
  let from = 0;
  for (let k = 0; k < cut.count; k++) {
    const mid = (from + cut.lengthM[k] / 2) / total;
    from += cut.lengthM[k];
    let best = -1;
    for (const p of list) if (insidePlain(p.rings, x0 + mid * (x1 - x0), y0 + mid * (y1 - y0)) && (best < 0 || p.zone < best)) best = p.zone;
    out.push(best);
  }
  return out;
}

/** A star-shaped ring of n vertices round (cx, cy), radii from the generator: concave, never crossing. */
function star(cx: number, cy: number, radii: number[]): Float64Array {
  const n = radii.length;
  return Float64Array.from(radii.flatMap((r, i) => [cx + r * Math.cos((2 * Math.PI * i) / n), cy + r * Math.sin((2 * Math.PI * i) / n)]));
}

describe('cutTransect on detailed zones', () => {
  it('gives each piece the zone the plain vertex scan gives (property)', () => {
    const radii = fc.array(fc.double({ min: 20, max: 100, noNaN: true }), { minLength: 3, maxLength: 60 });
    const xy = fc.double({ min: -150, max: 350, noNaN: true });
    fc.assert(
      fc.property(radii, radii, radii, xy, xy, xy, xy, (a, b, hole, x0, y0, x1, y1) => {
        const list = [
          { zone: 1, rings: [star(0, 0, a), star(0, 0, hole.map((r) => r / 6))] },
          { zone: 0, rings: [star(120, 60, b)] },
          { zone: 1, rings: [star(200, 200, b)] },
        ];
        const cut = cutTransect(buildZoneIndex(zonePolygons(list)), x0, y0, x1, y1);
        expect(Array.from(cut.zone)).toEqual(zonesByPlainScan(list, x0, y0, x1, y1, cut));
      }),
      { seed: 14, numRuns: 400 },
    );
  });

  it('cuts the same pieces through rectangles of 4 and of 10,000 vertices', () => {
    const boxes: Box[] = [];
    for (let j = 0; j < 3; j++) for (let i = 0; i < 3; i++) boxes.push([i * 1000, j * 800, (i + 1) * 1000, (j + 1) * 800]);
    const plain = buildZoneIndex(zonePolygons(boxes.map((b, zone) => ({ zone, rings: [densifiedRect(b, 4)] }))));
    const dense = buildZoneIndex(zonePolygons(boxes.map((b, zone) => ({ zone, rings: [densifiedRect(b, 10_000)] }))));
    // on a tenth-metre grid, so transects often run along a boundary or through a corner; sub-ulp
    // offsets from a boundary (a denormal y) split differently where the densified edges' ends lie
    const xy = fc.tuple(fc.integer({ min: -1000, max: 31_000 }), fc.integer({ min: -1000, max: 25_000 })).map(([x, y]) => [x / 10, y / 10]);
    // transects along a boundary and through corners, where a piece's end meets many short edges
    const along = [[1000, 100, 1000, 700], [0, 800, 3000, 800], [500, 400, 1500, 1200], [-50, -40, 3050, 2440]];
    for (const [x0, y0, x1, y1] of along) expectSameCut(cutTransect(plain, x0, y0, x1, y1), cutTransect(dense, x0, y0, x1, y1));
    fc.assert(
      fc.property(xy, xy, ([x0, y0], [x1, y1]) => expectSameCut(cutTransect(plain, x0, y0, x1, y1), cutTransect(dense, x0, y0, x1, y1))),
      { seed: 14, numRuns: 500 },
    );
  });
});

function expectSameCut(a: TransectCut, b: TransectCut): void {
  expect(Array.from(b.zone)).toEqual(Array.from(a.zone));
  for (let k = 0; k < a.count; k++) expect(Math.abs(b.lengthM[k] - a.lengthM[k])).toBeLessThan(1e-9 * (1 + a.lengthM[k]));
  expect(b.uncoveredM).toBeCloseTo(a.uncoveredM, 9);
  expect(b.overlapM).toBeCloseTo(a.overlapM, 9);
}
