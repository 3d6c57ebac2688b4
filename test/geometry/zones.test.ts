import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildZoneIndex, cutTransect, zonePolygons } from '../../src/geometry/index.js';

const rect = (x0: number, y0: number, x1: number, y1: number): Float64Array => Float64Array.from([x0, y0, x1, y0, x1, y1, x0, y1, x0, y0]);
const pieces = (cut: ReturnType<typeof cutTransect>) => Array.from(cut.zone, (z, i) => [z, Math.round(cut.lengthM[i] * 1e9) / 1e9]);

describe('cutTransect', () => {
  it('cuts a transect into ordered pieces at zone boundaries', () => {
    const index = buildZoneIndex(zonePolygons([{ zone: 0, rings: [rect(0, 0, 100, 100)] }, { zone: 1, rings: [rect(100, 0, 300, 100)] }]));
    const cut = cutTransect(index, 50, 50, 250, 50);
    expect(pieces(cut)).toEqual([[0, 50], [1, 150]]);
    expect([cut.uncoveredM, cut.overlapM]).toEqual([0, 0]);
    // the same transect cast the other way
    expect(pieces(cutTransect(index, 250, 50, 50, 50))).toEqual([[1, 150], [0, 50]]);
  });

  it('honours holes and reports what lies outside every zone', () => {
    const index = buildZoneIndex(
      zonePolygons([
        { zone: 0, rings: [rect(0, 0, 200, 200), rect(50, 50, 150, 150)] },
        { zone: 1, rings: [rect(50, 50, 150, 150)] },
      ]),
    );
    const cut = cutTransect(index, -10, 100, 210, 100);
    expect(pieces(cut)).toEqual([[-1, 10], [0, 50], [1, 100], [0, 50], [-1, 10]]);
    expect(cut.uncoveredM).toBeCloseTo(20, 9);
  });

  it('gives overlaps to the lowest zone index and reports their length', () => {
    const index = buildZoneIndex(zonePolygons([{ zone: 2, rings: [rect(0, 0, 100, 100)] }, { zone: 1, rings: [rect(50, 0, 150, 100)] }]));
    const cut = cutTransect(index, 10, 50, 140, 50);
    expect(pieces(cut)).toEqual([[2, 40], [1, 90]]);
    expect(cut.overlapM).toBeCloseTo(50, 9);
  });

  it('treats the polygons of one zone (a MultiPolygon) as one zone', () => {
    const index = buildZoneIndex(zonePolygons([{ zone: 0, rings: [rect(0, 0, 100, 100)] }, { zone: 0, rings: [rect(200, 0, 300, 100)] }, { zone: 0, rings: [rect(90, 0, 210, 100)] }]));
    const cut = cutTransect(index, 10, 50, 290, 50);
    // the third polygon overlaps the other two but belongs to the same zone: no overlap to report
    expect(pieces(cut)).toEqual([[0, 280]]);
    expect(cut.overlapM).toBe(0);
  });

  it('covers a transect that runs along a shared boundary', () => {
    const index = buildZoneIndex(zonePolygons([{ zone: 0, rings: [rect(0, 0, 100, 100)] }, { zone: 1, rings: [rect(100, 0, 300, 100)] }]));
    const cut = cutTransect(index, 100, 10, 100, 90);
    expect(cut.count).toBe(1);
    expect(cut.uncoveredM).toBe(0);
    expect(cut.lengthM[0]).toBeCloseTo(80, 9);
  });

  it('is all uncovered with no zones', () => {
    const cut = cutTransect(buildZoneIndex(zonePolygons([])), 0, 0, 30, 40);
    expect(pieces(cut)).toEqual([[-1, 50]]);
    expect(cut.uncoveredM).toBe(50);
  });

  it('pieces add up to the transect, inside a grid of zones (property)', () => {
    // a 4 x 4 grid of 100 m cells, zone = cell number
    const list = [];
    for (let i = 0; i < 16; i++) list.push({ zone: i, rings: [rect((i % 4) * 100, Math.floor(i / 4) * 100, (i % 4) * 100 + 100, Math.floor(i / 4) * 100 + 100)] });
    const index = buildZoneIndex(zonePolygons(list));
    const xy = fc.double({ min: 0.001, max: 399.999, noNaN: true });
    fc.assert(
      fc.property(xy, xy, xy, xy, (x0, y0, x1, y1) => {
        const cut = cutTransect(index, x0, y0, x1, y1);
        const sum = Array.from(cut.lengthM).reduce((a, b) => a + b, 0);
        expect(sum).toBeCloseTo(Math.hypot(x1 - x0, y1 - y0), 6);
        expect(cut.uncoveredM).toBeLessThan(1e-9);
        expect(cut.zone[0]).toBe(Math.min(3, Math.floor(x0 / 100)) + 4 * Math.min(3, Math.floor(y0 / 100)));
        for (let i = 1; i < cut.count; i++) expect(cut.zone[i]).not.toBe(cut.zone[i - 1]);
      }),
      { seed: 7, numRuns: 300 },
    );
  });

  it('rejects malformed polygons with the value in the message', () => {
    expect(() => zonePolygons([{ zone: -1, rings: [rect(0, 0, 1, 1)] }])).toThrow('-1');
    expect(() => zonePolygons([{ zone: 0, rings: [Float64Array.from([0, 0, 1, 1])] }])).toThrow('3 vertices');
    expect(() => zonePolygons([{ zone: 0, rings: [Float64Array.from([0, 0, 1, 0, 1, NaN])] }])).toThrow('NaN');
  });
});
