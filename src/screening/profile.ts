// Cross-section of one transect: the water table from line to line over ground and base, for
// the report and for `doab profile`. It solves the transect again from the same inputs.
import { cutTransect } from '../geometry/index.js';
import { SOLVE_OK, TransectSolver } from '../hydraulics/transect-solver.js';
import type { StripSummary } from './aggregate.js';
import { loadCut, setBeds } from './solve-facings.js';
import type { ScreenResult } from './screen.js';

export interface ProfileZone {
  id: string;
  fromM: number;
  toM: number;
  groundM: number;
  kMPerDay: number;
}

export interface Profile {
  stripId: string;
  /** The line at x = 0 and the line at x = transectLengthM. */
  lineA: string;
  lineB: string;
  transectLengthM: number;
  stageAM: number;
  stageBM: number;
  baseM: number;
  zones: ProfileZone[];
  xM: Float64Array;
  waterTableM: Float64Array;
  groundM: Float64Array;
  peakWaterTableM: number;
  peakOffsetM: number;
  minDepthM: number;
  seepageAM2PerDay: number;
  seepageBM2PerDay: number;
  /** Water table at each bank (m): the stage where the bed is clean, apart from it where the bed resists. */
  bankHeadAM: number;
  bankHeadBM: number;
  waterloggedDepthM: number;
  potentialDepthM: number;
}

/** The strip's key transect: the one holding its peak water table (peak_water_table_m), first found on ties. */
export function keyFacing(result: ScreenResult, strip: StripSummary): number {
  let best = -1, bestPeak = -Infinity;
  for (const list of [strip.facingsA, strip.facingsB]) {
    for (const facing of list) {
      const peak = result.results.peakWaterTableM[facing];
      if (peak > bestPeak) { bestPeak = peak; best = facing; }
    }
  }
  return best;
}

/** Samples the solved water table every ~transectLengthM/samples metres, plus zone edges and the peak. */
export function profileOfFacing(result: ScreenResult, strip: StripSummary, facing: number, samples = 200): Profile | null {
  const { stations, facings, zones, results } = result;
  if (facing < 0 || results.status[facing] !== SOLVE_OK) return null;
  const station = facing >> 1;
  const cut = cutTransect(result.zoneIndex, stations.x[station], stations.y[station], facings.endX[facing], facings.endY[facing]);
  const solver = new TransectSolver(64);
  const zoneOfPiece = new Int32Array(64);
  const n = loadCut(solver, cut, zones, new Float64Array(3), zoneOfPiece);
  const pieces: ProfileZone[] = [];
  let x = 0;
  for (let p = 0; p < n; p++) {
    const zone = zones[zoneOfPiece[p]];
    pieces.push({ id: zone.id, fromM: x, toM: x + solver.lengthM[p], groundM: zone.groundM, kMPerDay: zone.kMPerDay });
    x += solver.lengthM[p];
  }
  setBeds(
    solver,
    result.lines[stations.line[station]],
    stations.chainageM[station],
    results.ownStageM[facing],
    result.lines[facings.partner[facing]],
    facings.partnerChainageM[facing],
    results.partnerStageM[facing],
  );
  const status = solver.solve(results.ownStageM[facing], results.partnerStageM[facing], results.baseM[facing], n);
  if (status !== SOLVE_OK) return null;
  solver.scanDepth(result.settings.bankWidthM);
  const width = solver.transectLengthM;
  const xs = new Set<number>();
  for (let i = 0; i <= samples; i++) xs.add((width * i) / samples);
  for (const piece of pieces) { xs.add(piece.fromM); xs.add(piece.toM); }
  xs.add(solver.peakOffsetM);
  const xM = Float64Array.from([...xs].filter((v) => v >= 0 && v <= width).sort((a, b) => a - b));
  const ownLine = result.lines[stations.line[station]].id;
  const partner = result.lines[facings.partner[facing]].id;
  return {
    stripId: strip.stripId,
    lineA: ownLine,
    lineB: partner,
    transectLengthM: width,
    stageAM: results.ownStageM[facing],
    stageBM: results.partnerStageM[facing],
    baseM: results.baseM[facing],
    zones: pieces,
    xM,
    waterTableM: xM.map((v) => solver.headAt(v)),
    // the DEM's ground along the transect where a DEM was given (the zone's where it has none)
    groundM: xM.map((v) => {
      if (!result.ground) return solver.groundAt(v);
      const t = width > 0 ? v / width : 0;
      const sampled = result.ground.at(stations.x[station] + t * (facings.endX[facing] - stations.x[station]), stations.y[station] + t * (facings.endY[facing] - stations.y[station]));
      return Number.isFinite(sampled) ? sampled : solver.groundAt(v);
    }),
    peakWaterTableM: solver.peakWaterTableM,
    peakOffsetM: solver.peakOffsetM,
    minDepthM: result.ground ? results.minDepthM[facing] : solver.minDepthM,
    seepageAM2PerDay: solver.ownSeepageM2PerDay,
    seepageBM2PerDay: solver.partnerSeepageM2PerDay,
    bankHeadAM: solver.ownBankHeadM,
    bankHeadBM: solver.partnerBankHeadM,
    waterloggedDepthM: result.settings.risk.waterloggedDepthM,
    potentialDepthM: result.settings.risk.potentialDepthM,
  };
}
