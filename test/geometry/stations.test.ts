import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { lineLengthM, placeStations, type LineGeometry } from '../../src/geometry/index.js';

const line = (id: string, ...parts: number[][]): LineGeometry => ({ id, parts: parts.map((p) => Float64Array.from(p)) });

function lengthsOf(lines: LineGeometry[], stepM: number): number[] {
  const s = placeStations(lines, stepM);
  const sums = lines.map(() => 0);
  for (let i = 0; i < s.count; i++) sums[s.line[i]] += s.lengthM[i];
  return sums;
}

describe('placeStations', () => {
  it('places a station at the middle of every step of chainage', () => {
    const s = placeStations([line('c', [0, 0, 250, 0])], 100);
    expect(s.count).toBe(3);
    expect(Array.from(s.chainageM)).toEqual([50, 150, 225]);
    expect(Array.from(s.lengthM)).toEqual([100, 100, 50]);
    expect(Array.from(s.x)).toEqual([50, 150, 225]);
    expect(Array.from(s.dirX)).toEqual([1, 1, 1]);
    expect(Array.from(s.dirY)).toEqual([0, 0, 0]);
  });

  it('runs chainage on across parts and restarts the intervals at each part', () => {
    // part 1 is 150 m long going north, part 2 is 120 m going east
    const s = placeStations([line('m', [0, 0, 0, 150], [10, 200, 130, 200])], 100);
    expect(Array.from(s.part)).toEqual([0, 0, 1, 1]);
    expect(Array.from(s.chainageM)).toEqual([50, 125, 200, 260]);
    expect(Array.from(s.lengthM)).toEqual([100, 50, 100, 20]);
    expect([s.x[2], s.y[2]]).toEqual([60, 200]);
    expect([s.dirX[0], s.dirY[0], s.dirX[3], s.dirY[3]]).toEqual([0, 1, 1, 0]);
  });

  it('takes repeated vertices, zero-length segments and empty parts in its stride', () => {
    const l = line('r', [0, 0, 0, 0, 30, 40, 30, 40, 30, 40, 60, 80], [5, 5, 5, 5], [60, 80, 60, 80, 160, 80]);
    expect(lineLengthM(l)).toBe(200);
    const s = placeStations([l], 30);
    expect(Array.from(s.part)).toEqual([0, 0, 0, 0, 2, 2, 2, 2]);
    expect(lengthsOf([l], 30)[0]).toBeCloseTo(200, 12);
    for (let i = 0; i < s.count; i++) expect(Math.hypot(s.dirX[i], s.dirY[i])).toBeCloseTo(1, 12);
    expect(Array.from(s.x).every(Number.isFinite)).toBe(true);
  });

  it('represented lengths add up to the line length (property)', () => {
    const coord = fc.double({ min: -5000, max: 5000, noNaN: true });
    const part = fc.array(fc.tuple(coord, coord), { minLength: 2, maxLength: 30 }).chain((pts) =>
      // repeat some vertices on purpose: zero-length segments must be harmless
      fc.array(fc.boolean(), { minLength: pts.length, maxLength: pts.length }).map((rep) => pts.flatMap((p, i) => (rep[i] ? [...p, ...p] : p))),
    );
    fc.assert(
      fc.property(fc.array(part, { minLength: 1, maxLength: 4 }), fc.double({ min: 1, max: 500, noNaN: true }), (parts, step) => {
        const l = line('p', ...parts);
        const [sum] = lengthsOf([l], step);
        expect(Math.abs(sum - lineLengthM(l))).toBeLessThanOrEqual(1e-9 * Math.max(1, lineLengthM(l)));
      }),
      { seed: 20240601, numRuns: 300 },
    );
  });

  it('smooths the direction over a step, so digitising jitter does not swing it', () => {
    // a straight east-west line digitised every 5 m with +-1 m zigzag: raw segments swing 22 degrees
    const pts: number[] = [];
    for (let i = 0; i <= 200; i++) pts.push(5 * i, i % 2 ? 1 : -1);
    const s = placeStations([line('z', pts)], 100);
    // the 100 m chord spans at least 100 * 5 / hypot(5, 2) = 92.8 m east with ends at most 1 m off
    // the axis: atan(2 / 92.8) = 1.23 degrees at worst
    const worst = (Math.atan(2 / ((100 * 5) / Math.hypot(5, 2))) * 180) / Math.PI;
    for (let i = 0; i < s.count; i++) expect(Math.abs(Math.atan2(s.dirY[i], s.dirX[i]) * 180) / Math.PI).toBeLessThanOrEqual(worst + 1e-9);
  });

  it('rejects a bad step or bad coordinates with the value in the message', () => {
    expect(() => placeStations([line('c', [0, 0, 1, 0])], 0)).toThrow('Unexpected stepM value: 0.');
    expect(() => placeStations([line('c', [0, 0, 1, 0])], NaN)).toThrow('NaN');
    expect(() => placeStations([line('c', [0, 0, 1])], 10)).toThrow(/"c".*odd number/);
    expect(() => placeStations([line('c', [0, 0, Infinity, 0])], 10)).toThrow('Infinity');
  });
});
