import { describe, expect, it } from 'vitest';
import { syntheticNetwork } from '../../bench/network.js';
import {
  buildStrips,
  castTransects,
  FACING_OUTSIDE_AQUIFER,
  FACING_PAIRED,
  placeStations,
  type LineGeometry,
} from '../../src/geometry/index.js';
import { convexHull, ringIsSimple } from '../../src/geometry/rings.js';
import { expectPairedFacingsOnce, expectValidRing, signedArea2 } from './checks.js';

const line = (id: string, ...parts: number[][]): LineGeometry => ({ id, parts: parts.map((p) => Float64Array.from(p)) });
const run = (lines: LineGeometry[], opts = { stepM: 100, maxGapM: 1000, maxAngleDeg: 20 }, spacingJump?: number) => {
  const stations = placeStations(lines, opts.stepM);
  const facings = castTransects(lines, stations, opts);
  return { stations, facings, strips: buildStrips(lines, stations, facings, { spacingJump }) };
};
const summary = (strips: ReturnType<typeof buildStrips>) => strips.map((s) => [s.id, s.sideA, s.stationsA.length, s.stationsB.length]);

describe('buildStrips', () => {
  it('ends a strip where the spacing jumps by more than spacingJump', () => {
    // b steps from 200 m to 300 m away at x = 500: a 50% jump
    const lines = [line('a', [0, 0, 1000, 0]), line('b', [0, 200, 500, 200, 500, 300, 1000, 300])];
    const split = run(lines);
    expect(summary(split.strips).map((s) => s.slice(0, 3))).toEqual([
      ['a|b|0', 0, 5],
      ['a|b|1', 0, 5],
    ]);
    expect([split.strips[0].spacingMeanM, split.strips[1].spacingMeanM]).toEqual([200, 300]);
    expectPairedFacingsOnce(split.stations, split.facings, split.strips);
    const joined = run(lines, undefined, 0.6);
    expect(summary(joined.strips).map((s) => s.slice(0, 3))).toEqual([['a|b|0', 0, 10]]);
    expect([joined.strips[0].spacingMinM, joined.strips[0].spacingMaxM]).toEqual([200, 300]);
  });

  it('keeps a partner on both sides apart: a inside a U-shaped b', () => {
    const lines = [line('a', [0, 0, 1000, 0]), line('b', [0, 300, 1000, 300, 1000, -300, 0, -300])];
    const r = run(lines);
    expect(summary(r.strips)).toEqual([
      ['a|b|0', 0, 10, 10],
      ['a|b|1', 1, 10, 10],
    ]);
    expect(r.strips.map((s) => s.sideB)).toEqual([1, 1]);
    expectPairedFacingsOnce(r.stations, r.facings, r.strips);
  });

  it("gives b's facings no a-run claims a strip of their own", () => {
    const lines = [line('a', [0, 0, 1000, 0]), line('b', [0, 300, 1000, 300])];
    const stations = placeStations(lines, 100);
    const facings = castTransects(lines, stations, { maxGapM: 1000, maxAngleDeg: 20 });
    // the pipeline drops a's facings at x = 350-650 (say outside the aquifer); b's still pair
    for (let s = 3; s <= 6; s++) facings.reason[2 * s] = FACING_OUTSIDE_AQUIFER;
    const strips = buildStrips(lines, stations, facings);
    // b's stations at 350 and 650 land within one interval of a's runs and join them; 450 and 550 stay alone
    expect(summary(strips)).toEqual([
      ['a|b|0', 0, 3, 4],
      ['a|b|1', 0, 3, 4],
      ['b|a|0', 1, 2, 0],
    ]);
    expect(strips[2].chainageA).toEqual([400, 600]);
    expectPairedFacingsOnce(stations, facings, strips);
  });

  it('gives the same strips and ids whatever the order or the names of the lines (line a lies further west, then south)', () => {
    const lines = [line('n', [0, 600, 1000, 600]), line('m', [0, 250, 1000, 250]), line('s', [0, 0, 1000, 0])];
    const ids = (ls: LineGeometry[]) => run(ls).strips.map((s) => `${s.id}:${ls[s.lineA].id}-${ls[s.lineB].id}:${s.stationsA.length}`).sort();
    // all start at x = 0: the southern line is a
    expect(ids(lines)).toEqual(['m|n|0:m-n:10', 's|m|0:s-m:10']);
    expect(ids([lines[2], lines[0], lines[1]])).toEqual(ids(lines));
    // renamed so that the ids sort the other way: the same strips, under the new names
    const renamed = lines.map((l) => ({ ...l, id: { n: 'a', m: 'b', s: 'c' }[l.id]! }));
    expect(ids(renamed)).toEqual(['b|a|0:b-a:10', 'c|b|0:c-b:10']);
  });

  it('falls back to a valid ring where transects cross inside a tight bend', () => {
    // a: a half-circle of radius 200 around the origin, straight line s 150 m below its centre;
    // a's inward transects cross at the centre before reaching s, so the naive ring is a bow tie
    const pts: number[] = [];
    for (let d = 30; d <= 150; d += 2) pts.push(200 * Math.cos((d * Math.PI) / 180), 200 * Math.sin((d * Math.PI) / 180));
    const r = run([line('bend', pts), line('straight', [-600, -150, 600, -150])], { stepM: 20, maxGapM: 1000, maxAngleDeg: 30 });
    // the straight line starts further west, so it is line a and the bend's transects are b's
    const strip = r.strips.find((s) => s.id === 'straight|bend|0');
    expect(strip).toBeDefined();
    expect(strip!.stationsB.length).toBeGreaterThan(5);
    expectValidRing(strip!.ringM);
    for (const s of r.strips) expectValidRing(s.ringM);
    expectPairedFacingsOnce(r.stations, r.facings, r.strips);
  });

  it('holds every paired facing once and valid rings on a synthetic network', () => {
    const lines = syntheticNetwork(120, 42);
    const r = run(lines, { stepM: 50, maxGapM: 800, maxAngleDeg: 20 });
    expect(r.strips.length).toBeGreaterThan(50);
    let paired = 0;
    for (let k = 0; k < r.facings.count; k++) if (r.facings.reason[k] === FACING_PAIRED) paired++;
    expect(paired).toBeGreaterThan(r.facings.count / 4);
    expectPairedFacingsOnce(r.stations, r.facings, r.strips);
    for (const s of r.strips) {
      expectValidRing(s.ringM);
      expect(s.spacingMinM).toBeLessThanOrEqual(s.spacingMeanM);
      expect(s.spacingMeanM).toBeLessThanOrEqual(s.spacingMaxM);
    }
    expect(new Set(r.strips.map((s) => s.id)).size).toBe(r.strips.length);
  });
});

describe('ring helpers', () => {
  it('tells a bow tie and a spike from a simple ring', () => {
    expect(ringIsSimple(Float64Array.from([0, 0, 10, 0, 10, 10, 0, 10]))).toBe(true);
    expect(ringIsSimple(Float64Array.from([0, 0, 10, 10, 10, 0, 0, 10]))).toBe(false);
    expect(ringIsSimple(Float64Array.from([0, 0, 10, 0, 5, 0, 5, 10]))).toBe(false);
    expect(ringIsSimple(Float64Array.from([0, 0, 10, 0, 20, 0]))).toBe(false);
  });

  it('builds a counter-clockwise convex hull', () => {
    const hull = convexHull(Float64Array.from([0, 0, 10, 10, 10, 0, 0, 10, 5, 5, 5, 0]));
    expect(Array.from(hull)).toEqual([0, 0, 10, 0, 10, 10, 0, 10]);
    expect(signedArea2(Float64Array.from([...hull, hull[0], hull[1]]))).toBe(200);
  });
});
