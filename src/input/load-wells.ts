// Reads and checks a wells file (piezometers: points with an observed water-table elevation), in
// any format and CRS the line and zone inputs may have.
import { DataError, describePlace, type Problem } from '../shared/errors.js';
import { checkWells, type WellRecord } from '../screening/wells.js';
import type { RunConfig } from './config.js';
import { readFeatureFile, type InputFile } from './read-features.js';

export interface LoadedWells {
  file: InputFile | null;
  wells: WellRecord[];
  problems: Problem[];
}

export async function loadWells(path: string, config: RunConfig): Promise<LoadedWells> {
  const { inputCrs, maxInputMB, maxUnzippedMB, maxZipRatio } = config.settings;
  const problems: Problem[] = [];
  let file: InputFile | null = null;
  try {
    file = await readFeatureFile(path, { inputCrs: inputCrs ?? undefined, maxInputMB, maxUnzippedMB, maxZipRatio });
    for (const warning of file.warnings) problems.push({ severity: 'warning', place: { file: path }, message: warning });
  } catch (error) {
    if (!(error instanceof DataError)) throw error;
    problems.push({ severity: 'error', place: error.place, message: error.message.slice(describePlace(error.place).length + 2) });
    return { file: null, wells: [], problems };
  }
  const checked = checkWells(path, file.features, config.rules);
  problems.push(...checked.problems);
  return { file, wells: checked.records, problems };
}
