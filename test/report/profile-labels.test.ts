// Labels of a cross-section keep apart: the peak's, the depth lines', the water table's, the
// stages' (line a and line b), the zones' and the axes'. Boxes are computed from the emitted SVG
// (position, anchor, size, weight and text) with the drawing's own measure of text, which the
// Chromium test checks against the browser's; here for the demo's top strips and for crafted
// crowded cases.
import { beforeAll, describe, expect, it } from 'vitest';
import { renderProfileSvg } from '../../src/report/profile-svg.js';
import { drawnTexts, overlaps } from './label-boxes.js';
import { keyFacing, profileOfFacing, type Profile } from '../../src/screening/profile.js';
import { orientFromLineA } from '../../src/report/profile-svg.js';
import { CRAFTED_PROFILES } from './crafted-profiles.js';
import { DEMO_AQUIFER, DEMO_CANALS, screenFiles } from './demo-result.js';

function checkLabels(profile: Profile, svg: string): void {
  const texts = drawnTexts(svg);
  // every label the brief names is drawn
  for (const pattern of [/^line a: /, /^line b: /, /^water table$/, /^ground$/, /m deep: waterlogged$/, /m deep: potential$/, /^aquifer base /, /^(peak|highest, at the line)$/]) {
    expect(texts.some((t) => pattern.test(t.text)), String(pattern)).toBe(true);
  }
  expect(overlaps(texts)).toEqual([]);
  // moved labels stay on their side of what they label: the peak's above the peak, the stages' below their markers
  const circle = /<circle cx="([\d.]+)" cy="([\d.]+)"/.exec(svg)!;
  const peak = texts.find((t) => / class="peak-label"/.test(t.element))!;
  expect(peak.box[3]).toBeLessThanOrEqual(Number(circle[2]));
  const stages = [...svg.matchAll(/<path class="profile-stage" d="M([\d.]+) ([\d.]+)/g)].map((m) => Number(m[2]));
  expect(texts.find((t) => t.text.startsWith('line a: '))!.box[1]).toBeGreaterThan(stages[0]);
  expect(texts.find((t) => t.text.startsWith('line b: '))!.box[1]).toBeGreaterThan(stages[1]);
  // every label is on the drawing
  const height = Number(/ height="(\d+)"/.exec(svg)![1]);
  for (const t of texts) {
    expect(t.box[1], t.text).toBeGreaterThanOrEqual(0);
    expect(t.box[3], t.text).toBeLessThanOrEqual(height);
  }
  expect(profile.stripId.length).toBeGreaterThan(0);
}

describe('cross-section labels', () => {
  let demo: Profile[];
  beforeAll(async () => {
    const { result } = await screenFiles(DEMO_CANALS, DEMO_AQUIFER, { stripsOnly: true });
    demo = result.strips.slice(0, 10).flatMap((strip) => {
      const profile = profileOfFacing(result, strip, keyFacing(result, strip));
      return profile ? [orientFromLineA(profile, strip.lineAId)] : [];
    });
  });

  it("keep apart on the demo's top strips", () => {
    expect(demo.length).toBeGreaterThan(0);
    for (const profile of demo) checkLabels(profile, renderProfileSvg(profile));
  });

  it.each(CRAFTED_PROFILES)('keep apart where they crowd: $name', ({ profile, widthPx, heightPx }) => {
    checkLabels(profile, renderProfileSvg(profile, { widthPx, heightPx }));
  });

  it('finds the overlap of two labels at one place (the check can fail)', () => {
    const svg = '<svg><text x="10" y="20">water table</text><text x="30" y="24">ground</text><text x="10" y="60">far</text></svg>';
    expect(overlaps(drawnTexts(svg))).toEqual(['"water table" meets "ground"']);
  });
});
