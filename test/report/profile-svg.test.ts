import { beforeAll, describe, expect, it } from 'vitest';
import { orientFromLineA, peakLabelText, renderProfileSvg } from '../../src/report/profile-svg.js';
import type { ScreenResult } from '../../src/screening/screen.js';
import { keyFacing, profileOfFacing, type Profile } from '../../src/screening/profile.js';
import { DEMO_AQUIFER, DEMO_CANALS, HOSTILE_ID, hostileDemoCopy, screenFiles } from './demo-result.js';

function attribute(element: string, name: string): number {
  const m = new RegExp(` ${name}="([^"]+)"`).exec(element);
  if (!m) throw new Error(`no ${name} in ${element}`);
  return Number(m[1]);
}

describe('renderProfileSvg', () => {
  let profile: Profile;
  let svg: string;
  beforeAll(async () => {
    const { result } = await screenFiles(DEMO_CANALS, DEMO_AQUIFER, { stripsOnly: true });
    const strip = result.strips[0];
    profile = profileOfFacing(result, strip, keyFacing(result, strip)) as Profile;
    svg = renderProfileSvg(profile);
  });

  it('is a standalone SVG with both stages, ground, water table, base and both depth lines', () => {
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg.endsWith('</svg>')).toBe(true);
    expect(svg).not.toMatch(/ id="/);
    expect([...svg.matchAll(/class="profile-stage"/g)]).toHaveLength(2);
    expect([...svg.matchAll(/class="profile-depth"/g)]).toHaveLength(2);
    for (const part of ['profile-ground', 'profile-water-table', 'profile-base']) expect(svg).toContain(`class="${part}"`);
    expect(svg).toContain(`line a: ${profile.lineA}, stage ${profile.stageAM.toFixed(2)} m`);
    expect(svg).toContain(`line b: ${profile.lineB}, stage ${profile.stageBM.toFixed(2)} m`);
    expect(svg).toContain('2.0 m deep: waterlogged');
    expect(svg).toContain('3.0 m deep: potential');
    expect(svg).toContain(`aquifer base ${profile.baseM.toFixed(2)} m`);
    expect(svg).toContain(`distance from line a (${profile.lineA}), m`);
    expect(svg).toMatch(/elevation, m/);
  });

  it('states its vertical exaggeration, as the ticks of its two axes measure it', () => {
    const stated = Number(/vertical exaggeration ([\d.]+) times/.exec(svg)?.[1]);
    // pixels per metre up the elevation axis (two neighbouring ticks) over pixels per metre along the distance axis
    const yTicks = [...svg.matchAll(/<path d="M[\d.]+ ([\d.]+)h-5" stroke="#333333"\/><text[^>]*>([\d.]+)<\/text>/g)].map((m) => [Number(m[1]), Number(m[2])]);
    const xTicks = [...svg.matchAll(/<path d="M([\d.]+) [\d.]+v5" stroke="#333333"\/><text[^>]*>([\d\u2009]+)<\/text>/g)].map((m) => [Number(m[1]), Number(m[2].replace(/\u2009/g, ''))]);
    const vertical = Math.abs((yTicks[1][0] - yTicks[0][0]) / (yTicks[1][1] - yTicks[0][1]));
    const horizontal = Math.abs((xTicks[1][0] - xTicks[0][0]) / (xTicks[1][1] - xTicks[0][1]));
    expect(stated / (vertical / horizontal)).toBeGreaterThan(0.97);
    expect(stated / (vertical / horizontal)).toBeLessThan(1.03);
  });

  it('labels the peak with its elevation, over the peak', () => {
    const label = svg.match(/<text class="peak-label"[^>]*>([^<]*)<\/text>/);
    expect(label?.[1]).toBe(peakLabelText(profile.peakWaterTableM));
    // change detector on the invented demo (the top strip's peak), not a reference value
    expect(label?.[1]).toBe('179.62 m');
    const circle = svg.match(/<circle [^>]*>/)![0];
    expect(attribute(label![0], 'y')).toBeLessThan(attribute(circle, 'cy'));
  });

  it('draws the water table from bank to bank: on the stage marker at a clean bed, below it where a losing line\'s bed resists', () => {
    const points = svg.match(/class="profile-water-table" points="([^"]*)"/)![1].split(' ').map((p) => p.split(',').map(Number));
    const stages = [...svg.matchAll(/<path class="profile-stage" d="M([\d.]+) ([\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
    // the profile's own banks: the water table starts and ends at the bank heads
    expect(profile.waterTableM[0]).toBeCloseTo(profile.bankHeadAM, 9);
    expect(profile.waterTableM[profile.waterTableM.length - 1]).toBeCloseTo(profile.bankHeadBM, 9);
    const ends = [
      { point: points[0], stage: stages[0], bankM: profile.bankHeadAM, stageM: profile.stageAM },
      { point: points[points.length - 1], stage: stages[1], bankM: profile.bankHeadBM, stageM: profile.stageBM },
    ];
    // change detector on the invented demo: its top strip has a clean drain on one side and a canal with a bed on the other
    expect(ends.some((end) => end.bankM === end.stageM)).toBe(true);
    expect(ends.some((end) => end.bankM < end.stageM - 0.01)).toBe(true);
    for (const end of ends) {
      expect(end.point[0]).toBe(end.stage[0]);
      // SVG y grows downwards: a bank head below the stage is drawn lower than the stage marker
      if (end.bankM === end.stageM) expect(end.point[1]).toBe(end.stage[1]);
      else expect(end.point[1]).toBeGreaterThan(end.stage[1]);
    }
  });

  it('says when the highest water table is a line\'s own stage, not a mound between the lines', () => {
    // the demo's top strip has no recharge mound: its highest water table is line a's stage
    expect(profile.peakOffsetM).toBe(0);
    expect(svg).toContain('>highest, at the line</text>');
    const mound = renderProfileSvg({ ...profile, peakOffsetM: profile.transectLengthM / 2 });
    expect(mound).toContain('>peak</text>');
    expect(mound).not.toContain('highest, at the line');
  });

  it('formats the peak label with two decimals and the unit', () => {
    expect(peakLabelText(179.999)).toBe('180.00 m');
    expect(peakLabelText(-0.001)).toBe('0.00 m');
    expect(peakLabelText(12.345678)).toBe('12.35 m');
  });
});

describe('orientFromLineA', () => {
  let result: ScreenResult;
  beforeAll(async () => {
    ({ result } = await screenFiles(DEMO_CANALS, DEMO_AQUIFER, { stripsOnly: true }));
  });

  it("mirrors a key transect cast from line b so that x runs from the strip's line a", () => {
    const strip = result.strips.find((s) => s.stripId === 'D-06|C-06|0')!;
    const cast = profileOfFacing(result, strip, keyFacing(result, strip))!;
    // in the demo this strip's highest water table is on a transect cast from the canal, its line b
    expect(cast.lineA).toBe('C-06');
    const seen = orientFromLineA(cast, strip.lineAId);
    expect([seen.lineA, seen.lineB]).toEqual(['D-06', 'C-06']);
    expect([seen.stageAM, seen.stageBM]).toEqual([cast.stageBM, cast.stageAM]);
    expect(seen.xM[0]).toBe(0);
    expect(seen.xM[seen.xM.length - 1]).toBeCloseTo(cast.transectLengthM, 9);
    for (let i = 1; i < seen.xM.length; i++) expect(seen.xM[i]).toBeGreaterThan(seen.xM[i - 1]);
    expect([seen.bankHeadAM, seen.bankHeadBM]).toEqual([cast.bankHeadBM, cast.bankHeadAM]);
    expect(seen.waterTableM[0]).toBeCloseTo(seen.bankHeadAM, 9);
    expect(seen.waterTableM[seen.xM.length - 1]).toBeCloseTo(seen.bankHeadBM, 9);
    // the peak's offset is now measured as strips.geojson measures it, from line a
    expect(seen.peakOffsetM).toBeCloseTo(strip.peakOffsetM, 6);
    expect(seen.zones[0].fromM).toBe(0);
    expect(seen.seepageAM2PerDay).toBe(cast.seepageBM2PerDay);
    expect(renderProfileSvg(seen)).toContain('distance from line a (D-06), m');
  });

  it('leaves a profile cast from line a as it is', () => {
    // in the demo this strip's highest water table is on a transect cast from its line a
    const strip = result.strips.find((s) => s.stripId === 'C-11|D-09|0')!;
    const cast = profileOfFacing(result, strip, keyFacing(result, strip))!;
    expect(cast.lineA).toBe(strip.lineAId);
    expect(orientFromLineA(cast, strip.lineAId)).toBe(cast);
  });
});

describe('renderProfileSvg on hostile ids', () => {
  it('escapes line and strip ids', async () => {
    const copy = hostileDemoCopy();
    const { result } = await screenFiles(copy.canals, copy.aquifer, { stripsOnly: true });
    const strip = result.strips.find((s) => s.lineAId === HOSTILE_ID || s.lineBId === HOSTILE_ID)!;
    const svg = renderProfileSvg(profileOfFacing(result, strip, keyFacing(result, strip))!);
    expect(svg).not.toContain(HOSTILE_ID);
    expect(svg).toContain('C-01&amp;&quot;&#39;&lt;&gt;');
  });
});
