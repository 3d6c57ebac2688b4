// `doab screen`: read, validate, screen, write all outputs or none, print the summary.
import { linesLayer, rankingTable, stripsLayer, transectsLayer } from '../io/layers.js';
import { writeAllOrNothing, type OutputFile } from '../io/atomic-write.js';
import { readGeoJsonFile } from '../io/read-geojson.js';
import { runRecord, summaryText, CAUTION } from '../io/run-record.js';
import { readLines, readZones } from '../screening/district-inputs.js';
import { screenDistrict } from '../screening/screen.js';
import { DEFAULT_SETTINGS, settingsFromConfig, type RankBy, type ScreenSettings } from '../screening/settings.js';
import { readJsonFile, UsageError, VERSION } from './common.js';

export interface ScreenOptions {
  canals: string;
  aquifer: string;
  out: string;
  config?: string;
  step?: number;
  maxGap?: number;
  maxAngle?: number;
  crs?: string;
  rankBy?: RankBy;
  transects?: boolean;
  quiet?: boolean;
  debug?: boolean;
}

export function screenSettings(options: ScreenOptions): ScreenSettings {
  const base = options.config ? settingsFromConfig(options.config, readJsonFile(options.config)) : DEFAULT_SETTINGS;
  const settings: ScreenSettings = { ...base, risk: { ...base.risk } };
  if (options.step !== undefined) settings.stepM = options.step;
  if (options.maxGap !== undefined) settings.maxGapM = options.maxGap;
  if (options.maxAngle !== undefined) {
    if (options.maxAngle >= 90) throw new UsageError(`--max-angle must be below 90 degrees, got ${options.maxAngle}`);
    settings.maxAngleDeg = options.maxAngle;
  }
  if (options.crs !== undefined) settings.crs = options.crs;
  if (options.rankBy !== undefined) settings.rankBy = options.rankBy;
  if (options.transects) settings.writeTransects = true;
  return settings;
}

export function screenCommand(
  options: ScreenOptions,
  argv: string[],
  io: { out: (text: string) => void; err: (text: string) => void },
): number {
  const log = options.quiet ? () => {} : (text: string) => io.err(`${text}\n`);
  const settings = screenSettings(options);
  const canalsFile = readGeoJsonFile(options.canals);
  const aquiferFile = readGeoJsonFile(options.aquifer);
  const lines = readLines(options.canals, canalsFile.features);
  const zones = readZones(options.aquifer, aquiferFile.features);
  log(`read ${lines.length} lines from ${options.canals} and ${zones.length} zones from ${options.aquifer}`);
  let result;
  try {
    result = screenDistrict(lines, zones, settings);
  } catch (error) {
    // an unusable --crs is the user's to fix, not an internal failure
    if (options.crs !== undefined && /CRS/.test((error as Error).message)) throw new UsageError((error as Error).message);
    throw error;
  }
  for (const warning of result.warnings) log(`warning: ${warning}`);
  log(`solved ${result.counts.facingsByReason.paired} paired transect sides into ${result.counts.strips} strips`);

  const files: OutputFile[] = [
    { name: 'strips.geojson', content: stripsLayer(result) },
    { name: 'canals.geojson', content: linesLayer(result) },
    { name: 'ranking.csv', content: rankingTable(result) },
  ];
  if (settings.writeTransects) files.push({ name: 'transects.geojson', content: transectsLayer(result) });
  const outputs = [...files.map((file) => file.name), 'run.json'];
  files.push({
    name: 'run.json',
    content: runRecord(result, { version: VERSION, commandLine: ['doab', ...argv], canals: canalsFile, aquifer: aquiferFile, config: options.config ?? null, outputs }),
  });
  writeAllOrNothing(options.out, files);
  log(`wrote ${outputs.join(', ')} to ${options.out}`);
  if (!options.quiet) io.out(summaryText(result));
  else io.err(`${CAUTION}\n`);
  return 0;
}
