import { describe, expect, it } from 'vitest';
import {
  castTransects,
  FACING_NO_PARTNER,
  FACING_NOT_PARALLEL,
  FACING_PAIRED,
  placeStations,
  type LineGeometry,
} from '../../src/geometry/index.js';

const line = (id: string, ...parts: number[][]): LineGeometry => ({ id, parts: parts.map((p) => Float64Array.from(p)) });
const cast = (lines: LineGeometry[], maxGapM = 1000, maxAngleDeg = 20, stepM = 100) => {
  const stations = placeStations(lines, stepM);
  return { stations, facings: castTransects(lines, stations, { maxGapM, maxAngleDeg }) };
};

describe('castTransects', () => {
  it('pairs with a partner digitised the other way and reads chainage on the partner', () => {
    const { stations, facings } = cast([line('a', [0, 0, 1000, 0]), line('b', [1000, 300, 0, 300])]);
    // station 2 of a at x = 250; b starts at x = 1000 so its chainage there is 750
    expect(facings.reason[4]).toBe(FACING_PAIRED);
    expect(facings.partner[4]).toBe(1);
    expect(facings.transectLengthM[4]).toBeCloseTo(300, 12);
    expect([facings.endX[4], facings.endY[4]]).toEqual([250, 300]);
    expect(facings.partnerChainageM[4]).toBeCloseTo(750, 9);
    expect(facings.angleDeg[4]).toBeCloseTo(0, 6);
    // b runs west, so a (south of it) is on b's left
    expect(facings.partnerSide[4]).toBe(0);
    // and b's left transects come down onto a from a's left
    const firstB = stations.count / 2;
    expect(facings.reason[2 * firstB]).toBe(FACING_PAIRED);
    expect(facings.partnerSide[2 * firstB]).toBe(0);
    expect(facings.reason[2 * firstB + 1]).toBe(FACING_NO_PARTNER);
  });

  it('calls a line at 15 degrees parallel or not by maxAngleDeg', () => {
    const t = Math.tan((15 * Math.PI) / 180);
    const lines = [line('a', [0, 0, 1000, 0]), line('b', [0, 300, 1000, 300 + 1000 * t])];
    const loose = cast(lines, 1000, 20).facings;
    const strict = cast(lines, 1000, 10).facings;
    expect(loose.reason[0]).toBe(FACING_PAIRED);
    expect(strict.reason[0]).toBe(FACING_NOT_PARALLEL);
    expect(strict.partner[0]).toBe(-1);
    expect(strict.hitLine[0]).toBe(1);
    expect(strict.angleDeg[0]).toBeCloseTo(15, 9);
    expect(strict.transectLengthM[0]).toBeCloseTo(300 + 50 * t, 9);
  });

  it('reports no partner beyond maxGapM, with the far end of the cast', () => {
    const lines = [line('a', [0, 0, 1000, 0]), line('b', [0, 500, 1000, 500])];
    const short = cast(lines, 400).facings;
    expect(short.reason[0]).toBe(FACING_NO_PARTNER);
    expect([short.partner[0], short.hitLine[0], short.transectLengthM[0], short.endX[0], short.endY[0]]).toEqual([-1, -1, 400, 50, 400]);
    expect(Number.isNaN(short.partnerChainageM[0])).toBe(true);
    expect(cast(lines, 600).facings.reason[0]).toBe(FACING_PAIRED);
  });

  it('looks through its own meanders and stops at the nearest other line', () => {
    // a hairpin: east along y = 0, up, back west along y = 200; b at y = 400, c at y = 600
    const lines = [line('a', [0, 0, 1000, 0, 1000, 200, 0, 200]), line('b', [0, 400, 1000, 400]), line('c', [0, 600, 1000, 600])];
    const { stations, facings } = cast(lines);
    expect(facings.partner[0]).toBe(1);
    expect(facings.transectLengthM[0]).toBeCloseTo(400, 9);
    // the westward leg faces b on its right
    const back = Array.from(stations.chainageM).findIndex((c, s) => stations.line[s] === 0 && c > 1200);
    expect(facings.partner[2 * back + 1]).toBe(1);
    expect(facings.transectLengthM[2 * back + 1]).toBeCloseTo(200, 9);
  });

  it('ignores a line that touches the station itself but not one a metre away', () => {
    // t leaves a at 120 degrees (up and back west), from a's station at x = 150 or 1 m east of it
    const c = Math.cos(Math.PI / 3), s = Math.sin(Math.PI / 3);
    const touching = [line('a', [0, 0, 1000, 0]), line('b', [0, 300, 1000, 300]), line('t', [150, 0, 150 - 200 * c, 200 * s])];
    const near = [line('a', [0, 0, 1000, 0]), line('b', [0, 300, 1000, 300]), line('t', [151, 0, 151 - 200 * c, 200 * s])];
    expect(cast(touching).facings.partner[2]).toBe(1);
    const blocked = cast(near).facings;
    expect(blocked.reason[2]).toBe(FACING_NOT_PARALLEL);
    expect(blocked.hitLine[2]).toBe(2);
    expect(blocked.transectLengthM[2]).toBeCloseTo(Math.tan(Math.PI / 3), 9);
  });

  it('handles no lines and lines without length', () => {
    expect(cast([]).facings.count).toBe(0);
    expect(cast([line('p', [5, 5, 5, 5])]).facings.count).toBe(0);
  });

  it('rejects bad options with the value in the message', () => {
    const lines = [line('a', [0, 0, 1, 0])];
    const stations = placeStations(lines, 1);
    expect(() => castTransects(lines, stations, { maxGapM: -1, maxAngleDeg: 10 })).toThrow('Unexpected maxGapM value: -1.');
    expect(() => castTransects(lines, stations, { maxGapM: 10, maxAngleDeg: 95 })).toThrow('95');
  });
});
