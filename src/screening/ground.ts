// Ground from a DEM along every transect: the strips' smallest depth and shallow length follow the
// sampled ground instead of each zone's one ground level. Each solved transect is solved again (it
// is exact and cheap) and its water table compared with the DEM every sample spacing; where the DEM
// has no data the zone's ground is used and counted.
import { cutTransect, type FacingTable, type StationTable, type ZoneIndex } from '../geometry/index.js';
import type { GroundSampler } from '../geometry/dem.js';
import { SOLVE_NO_GROUND, SOLVE_OK, TransectSolver } from '../hydraulics/transect-solver.js';
import type { ScreenSettings } from '../shared/settings.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import { loadCut, setBeds, type FacingResults } from './solve-facings.js';

/** Samples along a transect: at most this many, and at least this far apart (m). */
const MAX_SAMPLES = 2000;
const MIN_SPACING_M = 1;

export interface GroundPass {
  /** Samples taken, and those where the DEM had no data (the zone's ground used instead). */
  samples: number;
  gapSamples: number;
  /** Transects with at least one such sample. */
  gapFacings: number;
  /** Transects with no ground at all (no DEM data and no zone ground): left unsolved. */
  noGroundFacings: number;
}

/** Spacing of ground samples along a transect of this length: half a DEM pixel, within bounds (m). */
export function sampleSpacingM(sampler: GroundSampler, lengthM: number): number {
  return Math.max(sampler.pixelM / 2, MIN_SPACING_M, lengthM / MAX_SAMPLES);
}

/** Overwrites each solved facing's smallest depth and shallow length with those over the sampled ground. */
export function groundFromDem(
  sampler: GroundSampler,
  lines: LineRecord[],
  zones: ZoneRecord[],
  zoneIndex: ZoneIndex,
  stations: StationTable,
  facings: FacingTable,
  results: FacingResults,
  settings: ScreenSettings,
): GroundPass {
  const solver = new TransectSolver(64);
  const loaded = new Float64Array(3);
  const pass: GroundPass = { samples: 0, gapSamples: 0, gapFacings: 0, noGroundFacings: 0 };
  for (let i = 0; i < facings.count; i++) {
    if (results.status[i] !== SOLVE_OK) continue;
    const station = i >> 1;
    const sx = stations.x[station], sy = stations.y[station], ex = facings.endX[i], ey = facings.endY[i];
    const pieces = loadCut(solver, cutTransect(zoneIndex, sx, sy, ex, ey), zones, loaded);
    setBeds(solver, lines[stations.line[station]], stations.chainageM[station], results.ownStageM[i], lines[facings.partner[i]], facings.partnerChainageM[i], results.partnerStageM[i]);
    if (solver.solve(results.ownStageM[i], results.partnerStageM[i], results.baseM[i], pieces) !== SOLVE_OK) continue;
    const length = solver.transectLengthM;
    const margin = Math.min(settings.bankWidthM, length / 2);
    const spacing = sampleSpacingM(sampler, length);
    const count = Math.max(1, Math.ceil((length - 2 * margin) / spacing));
    const step = (length - 2 * margin) / count;
    let minDepth = Infinity, shallow = 0, gaps = 0, known = 0;
    for (let k = 0; k <= count; k++) {
      const x = margin + k * step, t = x / length;
      let ground = sampler.at(sx + t * (ex - sx), sy + t * (ey - sy));
      if (!Number.isFinite(ground)) { ground = solver.groundAt(x); gaps++; }
      // neither the DEM nor the zone knows the ground here
      if (!Number.isFinite(ground)) continue;
      known++;
      const depth = ground - solver.headAt(x);
      if (depth < minDepth) minDepth = depth;
      // each sample stands for its share of the line between the banks (the end samples half)
      if (depth < settings.risk.waterloggedDepthM) shallow += k === 0 || k === count ? step / 2 : step;
    }
    if (known === 0) {
      // no ground anywhere along it: the side is left unsolved, with its reason
      results.status[i] = SOLVE_NO_GROUND;
      pass.noGroundFacings++;
      continue;
    }
    results.minDepthM[i] = minDepth;
    results.shallowM[i] = count === 0 ? 0 : shallow;
    pass.samples += count + 1;
    pass.gapSamples += gaps;
    if (gaps > 0) pass.gapFacings++;
  }
  return pass;
}
