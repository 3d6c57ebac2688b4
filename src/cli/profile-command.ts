// `doab profile --run DIR --strip ID [--out DIR]`: the cross-section of one strip of an earlier
// run, as an SVG drawing and a CSV of the water table. It screens the recorded inputs again with
// the recorded settings, after checking that the inputs are still the files that run read.
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { Command } from 'commander';
import { writeAllOrNothing } from '../io/atomic-write.js';
import { DataError } from '../io/data-error.js';
import { roundNumber } from '../io/layers.js';
import { CAUTION } from '../io/run-record.js';
import { orientFromLineA, peakLabelText, renderProfileSvg } from '../report/profile-svg.js';
import { parseConfig, type RunConfig } from '../screening/config.js';
import { keyFacing, profileOfFacing, type Profile } from '../screening/profile.js';
import { screenDistrict } from '../screening/screen.js';
import { readTextFile } from './common.js';
import { errorsOf, InputProblems, loadDistrict } from './load-district.js';
import type { CliIo } from './screen-command.js';

export interface ProfileOptions {
  run: string;
  strip: string;
  out?: string;
}

interface RecordedInput {
  path: string;
  sha256: string;
}

// run.json's settings (snake case) and the config-file key each one came from; a setting missing
// here is an error, so that a new setting cannot be left out of a profile without a test noticing
const SETTING_KEYS: Record<string, string> = {
  step_m: 'stepM',
  max_gap_m: 'maxGapM',
  max_angle_deg: 'maxAngleDeg',
  crs: 'crs',
  rank_by: 'rankBy',
  transects: 'writeTransects',
  spacing_jump: 'spacingJump',
  dupuit_ratio_min: 'dupuitRatioMin',
  base_spread_fraction: 'baseSpreadFraction',
  bank_width_m: 'bankWidthM',
  input_crs: 'inputCrs',
  fields: 'fields',
  units: 'units',
  defaults: 'defaults',
  kind_words: 'kindWords',
};
const RISK_KEYS: Record<string, string> = { waterlogged_depth_m: 'waterloggedDepthM', potential_depth_m: 'potentialDepthM' };
// the config file's path: its contents are already in the settings above
const IGNORED_KEYS = new Set(['config']);

function isObject(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

/** The run's settings as a config, checked key by key as a config file is. */
export function configFromRecord(recordPath: string, settings: unknown): RunConfig {
  if (!isObject(settings)) throw new DataError({ file: recordPath, field: 'settings' }, 'missing or not an object');
  const config: Record<string, unknown> = {};
  const risk: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(settings)) {
    if (IGNORED_KEYS.has(key)) continue;
    if (Object.hasOwn(RISK_KEYS, key)) risk[RISK_KEYS[key]] = value;
    else if (Object.hasOwn(SETTING_KEYS, key)) config[SETTING_KEYS[key]] = value;
    else throw new DataError({ file: recordPath, field: `settings.${key}` }, 'a setting this version of doab profile does not know; profile it with the doab that made the run');
  }
  for (const key of [...Object.keys(SETTING_KEYS), ...Object.keys(RISK_KEYS)]) {
    if (!Object.hasOwn(settings, key)) throw new DataError({ file: recordPath, field: `settings.${key}` }, 'missing from the run record');
  }
  config.risk = risk;
  return parseConfig(recordPath, JSON.stringify(config));
}

function recordedInput(recordPath: string, inputs: unknown, label: string): RecordedInput {
  const input = isObject(inputs) ? inputs[label] : undefined;
  if (!isObject(input) || typeof input.path !== 'string' || typeof input.sha256 !== 'string' || !/^[0-9a-f]{64}$/.test(input.sha256)) {
    throw new DataError({ file: recordPath, field: `inputs.${label}` }, 'missing, or without a path and a SHA-256');
  }
  return { path: input.path, sha256: input.sha256 };
}

/** A strip id as part of a file name: letters, digits, dot, dash and underscore only. */
export function safeId(stripId: string): string {
  return stripId.replace(/[^A-Za-z0-9._-]/g, '_').slice(0, 120);
}

/** The profile's samples: x_m (from the strip's line a), water_table_m, ground_m, base_m; 6 significant digits. */
export function profileTable(profile: Profile): string {
  const rows = ['x_m,water_table_m,ground_m,base_m'];
  const base = roundNumber(profile.baseM);
  for (let i = 0; i < profile.xM.length; i++) {
    rows.push(`${roundNumber(profile.xM[i])},${roundNumber(profile.waterTableM[i])},${roundNumber(profile.groundM[i])},${base}`);
  }
  return `${rows.join('\n')}\n`;
}

function someIds(ids: string[], asked: string): string {
  // ids that share the asked id's first line are the likeliest meant; else the top-ranked
  const head = asked.split('|')[0];
  const near = head ? ids.filter((id) => id.split('|').includes(head)) : [];
  const shown = (near.length > 0 ? near : ids).slice(0, 5);
  return `${shown.map((id) => `"${id}"`).join(', ')}${ids.length > shown.length ? `, ... (${ids.length} strips in all; see ranking.csv)` : ''}`;
}

export async function profileCommand(options: ProfileOptions, io: CliIo): Promise<number> {
  const recordPath = join(options.run, 'run.json');
  if (!existsSync(recordPath)) throw new DataError({ file: recordPath }, `not found: is ${options.run} an output folder of doab screen?`);
  const text = readTextFile(recordPath);
  let record: unknown;
  try {
    record = JSON.parse(text);
  } catch (error) {
    throw new DataError({ file: recordPath }, `not valid JSON (${(error as Error).message})`);
  }
  if (!isObject(record) || record.tool !== 'doab') throw new DataError({ file: recordPath }, 'not a doab run record');
  const config = configFromRecord(recordPath, record.settings);
  const canals = recordedInput(recordPath, record.inputs, 'canals');
  const aquifer = recordedInput(recordPath, record.inputs, 'aquifer');
  for (const [label, input] of [['canals', canals], ['aquifer', aquifer]] as const) {
    if (!existsSync(input.path)) {
      throw new DataError(
        { file: input.path },
        `the ${label} input of the run in ${recordPath} is not found from ${process.cwd()}; run doab profile from the folder doab screen ran in`,
      );
    }
  }

  const district = await loadDistrict(canals.path, aquifer.path, config);
  for (const [input, file] of [[canals, district.canals], [aquifer, district.aquifer]] as const) {
    if (file && file.sha256 !== input.sha256) {
      throw new DataError(
        { file: input.path },
        `changed since the run in ${recordPath} (SHA-256 now ${file.sha256}, recorded ${input.sha256}); screen it again before drawing a profile`,
      );
    }
  }
  const errors = errorsOf(district.problems);
  const skipped = Array.isArray(record.skipped_features) ? record.skipped_features.length : 0;
  // the run itself stopped on these unless it skipped them (--skip-invalid)
  if (!district.canals || !district.aquifer || (errors.length > 0 && skipped === 0)) throw new InputProblems(errors);

  const result = screenDistrict(district.lines, district.zones, config.settings);
  const strip = result.strips.find((s) => s.stripId === options.strip);
  if (!strip) {
    throw new DataError({ file: recordPath }, `no strip "${options.strip}" in this run; its strips include ${someIds(result.strips.map((s) => s.stripId), options.strip)}`);
  }
  const solved = profileOfFacing(result, strip, keyFacing(result, strip));
  if (!solved) {
    throw new DataError({ file: recordPath }, `strip "${strip.stripId}" has no solved transect (flags: ${strip.flags.join(';') || 'none'}): there is no water table to draw`);
  }

  const profile = orientFromLineA(solved, strip.canalA);
  const out = options.out ?? options.run;
  const name = `profile-${safeId(strip.stripId)}`;
  writeAllOrNothing(out, [
    { name: `${name}.svg`, content: `${renderProfileSvg(profile)}\n` },
    { name: `${name}.csv`, content: profileTable(profile) },
  ]);
  io.err(`wrote ${name}.svg, ${name}.csv to ${out}\n`);
  io.out(
    `Strip ${strip.stripId}: key transect from ${profile.lineA} to ${profile.lineB}, ${roundNumber(profile.widthM)} m wide\n` +
      `Stages ${profile.stageAM.toFixed(2)} and ${profile.stageBM.toFixed(2)} m, base ${profile.baseM.toFixed(2)} m; ` +
      `peak water table ${peakLabelText(profile.peakHeadM)} at ${roundNumber(profile.peakOffsetM)} m from ${profile.lineA}; ` +
      `smallest depth ${profile.minDepthM.toFixed(2)} m\n\nCAUTION: ${CAUTION}\n`,
  );
  return 0;
}

/** Adds `doab profile` to the program; setExit receives the command's exit code. */
export function registerProfileCommand(program: Command, io: CliIo, setExit: (code: number) => void): Command {
  return program
    .command('profile')
    .description("draw one strip's cross-section from an earlier run: an SVG and a CSV of the water table")
    .requiredOption('--run <dir>', 'output folder of doab screen (holds run.json)')
    .requiredOption('--strip <id>', 'strip id, as in ranking.csv')
    .option('--out <dir>', 'folder for the profile files (default: the run folder)')
    .option('--debug', 'show stack traces of internal errors')
    .action(async (options: ProfileOptions) => {
      setExit(await profileCommand(options, io));
    });
}
