// Cross-sections made by hand where labels crowd: a narrow drawing with two long line ids, stages
// nearly level and the peak just above the waterlogging depth between them, or the peak at line b
// right on a threshold. For the label placement tests (in Node and in Chromium).
import type { Profile } from '../../src/screening/profile.js';

interface Crafted {
  name: string;
  profile: Profile;
  widthPx: number;
  heightPx: number;
}

function profile(lengthM: number, stageAM: number, stageBM: number, groundM: number, peakOffsetM: number, peakM: number): Profile {
  const n = 41;
  const xM = Float64Array.from({ length: n }, (_, i) => (i * lengthM) / (n - 1));
  // a water table through both stages and the peak: a parabola each side of the peak
  const waterTableM = xM.map((x) => {
    if (x <= peakOffsetM) return peakOffsetM === 0 ? peakM : peakM - (peakM - stageAM) * ((peakOffsetM - x) / peakOffsetM) ** 2;
    return peakM - (peakM - stageBM) * ((x - peakOffsetM) / (lengthM - peakOffsetM)) ** 2;
  });
  return {
    stripId: 'CANAL-NORTH-07|DRAIN-SOUTH-12|0',
    lineA: 'CANAL-NORTH-07',
    lineB: 'DRAIN-SOUTH-12',
    transectLengthM: lengthM,
    stageAM,
    stageBM,
    baseM: groundM - 7,
    zones: [
      { id: 'loam', fromM: 0, toM: lengthM / 2, groundM, kMPerDay: 0.8 },
      { id: 'sand', fromM: lengthM / 2, toM: lengthM, groundM, kMPerDay: 12 },
    ],
    xM,
    waterTableM,
    groundM: new Float64Array(n).fill(groundM),
    peakWaterTableM: peakM,
    peakOffsetM,
    minDepthM: groundM - peakM,
    seepageAM2PerDay: 0.012,
    seepageBM2PerDay: -0.034,
    // clean beds: the water table meets each line at its stage
    bankHeadAM: stageAM,
    bankHeadBM: stageBM,
    waterloggedDepthM: 2,
    potentialDepthM: 3,
  };
}

export const CRAFTED_PROFILES: Crafted[] = [
  // stages level within 5 cm, the peak 2 cm above the 2 m depth line, midway: every label wants the same band
  { name: 'narrow, peak midway just above a threshold', profile: profile(60, 100, 100.05, 102.1, 30, 100.12), widthPx: 420, heightPx: 300 },
  // the highest water table is line b's stage, right on the 2 m depth line
  { name: 'narrow, peak at line b on a threshold', profile: profile(80, 99.5, 100.1, 102.1, 80, 100.1), widthPx: 420, heightPx: 300 },
  // a short drawing: the depth lines, ground and water table labels crowd the right margin
  { name: 'short, every line near the ground', profile: profile(200, 101.0, 101.1, 101.4, 100, 101.3), widthPx: 560, heightPx: 220 },
];
