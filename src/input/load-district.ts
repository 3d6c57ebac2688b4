// Read and validate both inputs, collecting every problem: what `doab check` prints and what
// `doab screen` refuses to go on with (unless told to skip the bad features).
import { DataError, describePlace, type Problem } from '../shared/errors.js';
import { readFeatureFile, type InputFile, type ReadOptions } from './read-features.js';
import type { RunConfig } from './config.js';
import { crossCheck } from '../screening/cross-checks.js';
import { checkLines, checkZones, type LineRecord, type ZoneRecord } from '../screening/district-inputs.js';

export interface LoadedDistrict {
  /**
   * The lines' file. Its features are let go once checked (each entry undefined, the length kept
   * for now): the records hold all a run needs, and a large district's features would double what
   * it holds. featureCount says how many there were.
   */
  canals: InputFile | null;
  aquifer: InputFile | null;
  lines: LineRecord[];
  zones: ZoneRecord[];
  problems: Problem[];
}

async function readOrProblem(path: string, options: ReadOptions, problems: Problem[]): Promise<InputFile | null> {
  try {
    const file = await readFeatureFile(path, options);
    for (const warning of file.warnings) problems.push({ severity: 'warning', place: { file: path }, message: warning });
    return file;
  } catch (error) {
    if (!(error instanceof DataError)) throw error;
    problems.push({ severity: 'error', place: error.place, message: error.message.slice(describePlace(error.place).length + 2) });
    return null;
  }
}

export async function loadDistrict(canalsPath: string, aquiferPath: string, config: RunConfig, checks: { groundFromDem?: boolean } = {}): Promise<LoadedDistrict> {
  const problems: Problem[] = [];
  const { inputCrs, maxInputMB, maxUnzippedMB, maxZipRatio } = config.settings;
  const options: ReadOptions = { inputCrs: inputCrs ?? undefined, maxInputMB, maxUnzippedMB, maxZipRatio };
  const canals = await readOrProblem(canalsPath, options, problems);
  const aquifer = await readOrProblem(aquiferPath, options, problems);
  let lines: LineRecord[] = [];
  let zones: ZoneRecord[] = [];
  if (canals) {
    const checked = checkLines(canalsPath, canals.features, config.rules);
    lines = checked.records;
    for (const item of checked.problems) problems.push(item);
    canals.features.fill(undefined);
  }
  if (aquifer) {
    const checked = checkZones(aquiferPath, aquifer.features, config.rules, checks);
    zones = checked.records;
    for (const item of checked.problems) problems.push(item);
  }
  // positions wrapped at longitude 180 (as RFC 7946 asks) would put one district at both ends of
  // the map: every distance, overlap and projection would be wrong, so refuse before any geometry
  const straddle = straddlesAntimeridian([...lines.flatMap((line) => line.partsLonLat), ...zones.flatMap((zone) => zone.polygonsLonLat.flat())]);
  if (straddle) {
    problems.push({
      severity: 'error',
      place: { file: `${canalsPath} and ${aquiferPath}` },
      message: `the lines and zones straddle longitude 180 (longitudes from ${straddle.west.toFixed(3)} to 180 and from -180 to ${straddle.east.toFixed(3)}); doab cannot screen across it: split the district at longitude 180 and screen each part`,
    });
    return { canals, aquifer, lines: [], zones: [], problems };
  }
  const cross = crossCheck(lines, zones, { lines: canalsPath, zones: aquiferPath }, config.settings.crs);
  for (const item of cross.problems) problems.push(item);
  lines = lines.filter((_, i) => !cross.badLines.has(i));
  return { canals, aquifer, lines, zones, problems };
}

/**
 * Whether positions wrapped at longitude 180 lie on both sides of it: the span of longitudes is
 * shorter going across 180 than going round the other way. Gives the western and eastern edges.
 */
export function straddlesAntimeridian(parts: readonly ((readonly (readonly number[])[]) | Float64Array)[]): { west: number; east: number } | null {
  let westOfDateLine = Infinity, eastMost = -Infinity, westMost = Infinity, eastOfDateLine = -Infinity;
  const see = (lon: number) => {
    if (lon >= 0) { westOfDateLine = Math.min(westOfDateLine, lon); eastMost = Math.max(eastMost, lon); }
    else { westMost = Math.min(westMost, lon); eastOfDateLine = Math.max(eastOfDateLine, lon); }
  };
  for (const part of parts) {
    // a line's part is interleaved (lon0, lat0, lon1, lat1, ...), a zone's ring a list of [lon, lat]
    if (part instanceof Float64Array) for (let i = 0; i < part.length; i += 2) see(part[i]);
    else for (const [lon] of part) see(lon);
  }
  if (!Number.isFinite(westOfDateLine) || !Number.isFinite(westMost)) return null;
  const spanAround = eastMost - westMost;
  const spanAcross = 360 + eastOfDateLine - westOfDateLine;
  return spanAcross < spanAround ? { west: westOfDateLine, east: eastOfDateLine } : null;
}
