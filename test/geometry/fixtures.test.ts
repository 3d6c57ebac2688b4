// Golden fixtures: invented lines laid out in UTM metres near 30.5 E, 29.5 N (see
// test/fixtures/geometry/make-inputs.ts), so every expected number below follows from that layout.
import { describe, expect, it } from 'vitest';
import { FACING_REASON_NAMES, lineLengthM } from '../../src/geometry/index.js';
import { expectPairedFacingsOnce, expectValidRing, signedArea2 } from './checks.js';
import { golden, type GeometryRun } from './golden.js';

// a lon/lat round trip at 1e-9 degree keeps positions to about 0.1 mm
const MM = 1e-3;

function facingsOf(run: GeometryRun, lineId: string, side: 0 | 1) {
  const l = run.line[lineId];
  const out: { reason: string; partner: string | null; transectLengthM: number; angleDeg: number; chainageM: number }[] = [];
  for (let s = 0; s < run.stations.count; s++) {
    if (run.stations.line[s] !== l) continue;
    const k = 2 * s + side;
    const p = run.facings.partner[k];
    out.push({
      reason: FACING_REASON_NAMES[run.facings.reason[k]],
      partner: p >= 0 ? run.lines[p].id : null,
      transectLengthM: run.facings.transectLengthM[k],
      angleDeg: run.facings.angleDeg[k],
      chainageM: run.stations.chainageM[s],
    });
  }
  return out;
}

function expectInvariants(run: GeometryRun): void {
  expectPairedFacingsOnce(run.stations, run.facings, run.strips);
  for (const s of run.strips) expectValidRing(s.ringM);
}

const reasons = (run: GeometryRun, id: string, side: 0 | 1) => facingsOf(run, id, side).map((f) => f.reason);
const gaps = (run: GeometryRun, id: string, side: 0 | 1) => facingsOf(run, id, side).filter((f) => f.reason === 'paired').map((f) => f.transectLengthM);
const repeat = (v: string, n: number) => Array<string>(n).fill(v);

describe('geometry fixtures', () => {
  it('two straight parallel canals 300 m apart make one 2000 x 300 m strip', () => {
    const run = golden('parallel-straight');
    expectInvariants(run);
    expect(run.stations.count).toBe(40);
    expect(reasons(run, 'a', 0)).toEqual(repeat('paired', 20));
    expect(reasons(run, 'a', 1)).toEqual(repeat('no-partner', 20));
    expect(reasons(run, 'b', 1)).toEqual(repeat('paired', 20));
    for (const g of gaps(run, 'a', 0)) expect(g).toBeCloseTo(300, 3);
    expect(run.strips).toHaveLength(1);
    const [s] = run.strips;
    expect(s.id).toBe('a|b|0');
    expect([s.sideA, s.sideB, s.stationsA.length, s.stationsB.length]).toEqual([0, 1, 20, 20]);
    expect(s.chainageA[0]).toBeCloseTo(0, 3);
    expect(s.chainageA[1]).toBeCloseTo(2000, 3);
    expect(s.spacingMinM).toBeCloseTo(300, 3);
    expect(s.spacingMaxM).toBeCloseTo(300, 3);
    expect(Math.abs(signedArea2(s.ringM) / 2 - 2000 * 300)).toBeLessThan(2000 * MM + 300 * MM);
  });

  it('parallel canals of different lengths pair only over the overlap', () => {
    const run = golden('parallel-lengths');
    expectInvariants(run);
    // long: stations at 50, 150, ... 2950; short spans chainage 1000-2000 of long
    expect(reasons(run, 'long', 0)).toEqual([...repeat('no-partner', 10), ...repeat('paired', 10), ...repeat('no-partner', 10)]);
    expect(reasons(run, 'short', 1)).toEqual(repeat('paired', 10));
    for (const g of gaps(run, 'long', 0)) expect(g).toBeCloseTo(250, 3);
    expect(run.strips.map((s) => [s.id, s.stationsA.length, s.stationsB.length])).toEqual([['long|short|0', 10, 10]]);
    expect(run.strips[0].chainageA[0]).toBeCloseTo(1000, 3);
    expect(run.strips[0].chainageA[1]).toBeCloseTo(2000, 3);
  });

  it('converging canals: spacing follows the geometry along the strip', () => {
    const run = golden('converging');
    expectInvariants(run);
    // b runs from (0, 400) to (2000, 100): a's transect at x meets it at 400 - 0.15 x
    const expected = Array.from({ length: 20 }, (_, i) => 400 - 0.15 * (50 + 100 * i));
    const got = gaps(run, 'a', 0);
    expect(got).toHaveLength(20);
    got.forEach((g, i) => expect(g).toBeCloseTo(expected[i], 3));
    expect(run.strips).toHaveLength(1);
    const [s] = run.strips;
    expect(s.spacingMaxM).toBeCloseTo(392.5, 3);
    expect(s.spacingMinM).toBeCloseTo(107.5, 3);
    expect(s.spacingMeanM).toBeCloseTo(250, 3);
    // b's first station casts past a's start (it lands at x = -9.4 m); the other 20 pair
    expect(reasons(run, 'b', 1)).toEqual(['no-partner', ...repeat('paired', 20)]);
    expect(s.stationsB.length).toBe(20);
    // the two canals meet at atan(300 / 2000)
    expect(facingsOf(run, 'a', 0)[5].angleDeg).toBeCloseTo((Math.atan(0.15) * 180) / Math.PI, 4);
  });

  it('a canal crossing between two parallel ones blocks them as not-parallel', () => {
    const run = golden('crossing');
    expectInvariants(run);
    // x runs from (700, -200) to (1300, 500): above a and below b for 871 < x < 1129
    const aLeft = reasons(run, 'a', 0);
    expect(aLeft.map((r, i) => (r === 'not-parallel' ? i : -1)).filter((i) => i >= 0)).toEqual([9, 10]);
    expect(reasons(run, 'a', 1).map((r, i) => (r === 'not-parallel' ? i : -1)).filter((i) => i >= 0)).toEqual([7, 8]);
    expect(reasons(run, 'b', 1).map((r, i) => (r === 'not-parallel' ? i : -1)).filter((i) => i >= 0)).toEqual([9, 10]);
    expect(facingsOf(run, 'a', 0)[9].transectLengthM).toBeCloseTo(-200 + (250 * 7) / 6, 3);
    // x meets the others at atan2(700, 600)
    expect(facingsOf(run, 'a', 0)[9].angleDeg).toBeCloseTo((Math.atan2(700, 600) * 180) / Math.PI, 4);
    expect(facingsOf(run, 'x', 0).filter((f) => f.reason === 'paired')).toHaveLength(0);
    expect(facingsOf(run, 'x', 1).filter((f) => f.reason === 'paired')).toHaveLength(0);
    expect(run.strips.map((s) => [s.id, s.stationsA.length, s.stationsB.length])).toEqual([
      ['a|b|0', 9, 9],
      ['a|b|1', 9, 9],
    ]);
  });

  it('a branch leaving a at one of its stations does not block that station', () => {
    const run = golden('t-junction');
    expectInvariants(run);
    const aLeft = facingsOf(run, 'a', 0);
    // station 10 of a sits on the branch's first vertex: the touch at 0 m is ignored
    expect(aLeft[10]).toMatchObject({ reason: 'paired', partner: 'b' });
    expect(aLeft[10].transectLengthM).toBeCloseTo(300, 3);
    expect(aLeft.map((f) => f.reason)).toEqual([...repeat('paired', 11), 'not-parallel', 'not-parallel', ...repeat('paired', 7)]);
    expect(aLeft[11].transectLengthM).toBeCloseTo(100, 3);
    expect(aLeft[12].transectLengthM).toBeCloseTo(200, 3);
    const bRight = facingsOf(run, 'b', 1);
    expect(bRight[11].transectLengthM).toBeCloseTo(230, 3);
    expect(bRight[12].transectLengthM).toBeCloseTo(130, 3);
    // the branch meets both at 45 degrees; its own right transects run back to a over chainage
    const tRight = facingsOf(run, 't', 1);
    expect(tRight.map((f) => f.transectLengthM)).toEqual(tRight.map((f) => expect.closeTo(f.chainageM, 3)));
    expect(tRight.every((f) => f.reason === 'not-parallel' && Math.abs(f.angleDeg - 45) < 1e-4)).toBe(true);
    expect(run.strips.map((s) => [s.id, s.stationsA.length, s.stationsB.length])).toEqual([
      // b starts further west than a, so b is the strips' line a (geometry, not ids)
      ['b|a|0', 11, 11],
      ['b|a|1', 7, 7],
    ]);
  });

  it('two concentric arcs are 300 m apart all along', () => {
    const run = golden('concentric-arcs');
    expectInvariants(run);
    // inner runs anticlockwise, so the outer arc is on its right
    expect(reasons(run, 'inner', 1)).toEqual(repeat('paired', 16));
    expect(reasons(run, 'outer', 0)).toEqual(repeat('paired', 19));
    expect(run.strips).toHaveLength(1);
    const [s] = run.strips;
    expect([s.id, s.sideA, s.stationsA.length, s.stationsB.length]).toEqual(['inner|outer|0', 1, 16, 19]);
    // radii 1800 - 1500; the chords of 1-degree digitising sit at most R(1 - cos 0.5 deg) = 0.07 m inside
    for (const v of [s.spacingMinM, s.spacingMaxM, s.spacingMeanM]) expect(Math.abs(v / 300 - 1)).toBeLessThan(0.005);
  });

  it('a canal between two others pairs on both sides and blocks the outer pair', () => {
    const run = golden('canal-between');
    expectInvariants(run);
    expect(reasons(run, 'middle', 0)).toEqual(repeat('paired', 20));
    expect(reasons(run, 'middle', 1)).toEqual(repeat('paired', 20));
    expect(facingsOf(run, 'south', 0).every((f) => f.partner === 'middle')).toBe(true);
    expect(facingsOf(run, 'north', 1).every((f) => f.partner === 'middle')).toBe(true);
    expect(run.strips.map((s) => [s.id, s.sideA, s.stationsA.length, s.stationsB.length, Math.round(s.spacingMeanM * 1000) / 1000])).toEqual([
      ['south|middle|0', 0, 20, 20, 250],
      ['north|middle|0', 1, 20, 20, 350],
    ]);
  });

  it('a canal and a drain digitised the other way still pair', () => {
    const run = golden('canal-drain');
    expectInvariants(run);
    // the drain runs west, so its left is south, towards the canal
    expect(reasons(run, 'c1', 0)).toEqual(repeat('paired', 20));
    expect(reasons(run, 'd1', 0)).toEqual(repeat('paired', 20));
    expect(facingsOf(run, 'c1', 0)[0].angleDeg).toBeLessThan(1e-4);
    expect(run.strips.map((s) => [s.id, s.sideA, s.sideB, s.stationsA.length, s.stationsB.length])).toEqual([['c1|d1|0', 0, 0, 20, 20]]);
    expect(run.strips[0].spacingMeanM).toBeCloseTo(400, 3);
  });

  it('a MultiLineString canal: chainage runs on across parts, its own parts never block', () => {
    const run = golden('multilinestring');
    expectInvariants(run);
    expect(lineLengthM(run.lines[run.line.m])).toBeCloseTo(2100, 3);
    const mLeft = facingsOf(run, 'm', 0);
    expect(mLeft.map((f) => f.chainageM.toFixed(3))).toEqual([...Array.from({ length: 10 }, (_, i) => `${50 + 100 * i}.000`), ...Array.from({ length: 11 }, (_, i) => `${1050 + 100 * i}.000`)]);
    // station 9 of part 1 (x = 950) passes under part 2 of its own line on its way to p
    expect(mLeft.every((f) => f.partner === 'p')).toBe(true);
    expect(mLeft[9].transectLengthM).toBeCloseTo(300, 3);
    expect(mLeft[10].transectLengthM).toBeCloseTo(270, 3);
    expect(run.strips.map((s) => [s.id, s.stationsA.length, s.stationsB.length, Math.round(s.spacingMeanM * 1000) / 1000])).toEqual([
      ['m|p|0', 10, 9, 300],
      ['m|p|1', 11, 11, 270],
    ]);
    expect(run.strips[1].chainageA[0]).toBeCloseTo(1000, 3);
    expect(run.strips[1].chainageA[1]).toBeCloseTo(2100, 3);
  });

  it('jagged digitising of a straight canal keeps the spacing within 1%', () => {
    const run = golden('jagged');
    expectInvariants(run);
    const jLeft = facingsOf(run, 'j', 0);
    expect(jLeft.every((f) => f.reason === 'paired')).toBe(true);
    // the digitised segments swing by up to atan(3 / 10) = 17 degrees; the smoothed transects must not
    for (const f of jLeft) {
      expect(Math.abs(f.transectLengthM / 250 - 1)).toBeLessThan(0.01);
      expect(f.angleDeg).toBeLessThan(2);
    }
    expect(Math.abs(run.strips[0].spacingMeanM / 250 - 1)).toBeLessThan(0.01);
    expect(run.strips).toHaveLength(1);
  });
});
