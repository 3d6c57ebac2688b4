// Command-line wiring only: parse options, call the commands, map failures to exit codes
// (0 done, 1 bad data, 2 bad usage, 3 internal error). Tests call main() or run it as a child process.
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander';
import { DataError, InputProblems, problemLines, PROBLEMS_SHOWN, SETTINGS, SETTING_KEYS, UsageError, VERSION, type SettingSpec } from '../index.js';
import { checkCommand, type CheckOptions } from './check-command.js';
import { gatherCommand, type GatherOptions } from './gather-command.js';
import { initConfigCommand, type InitConfigOptions } from './init-config-command.js';
import { registerLiningCommand } from './lining-command.js';
import type { CliIo } from './io.js';
import { registerProfileCommand } from './profile-command.js';
import { progressReporter } from './progress.js';
import { screenCommand, type ScreenOptions } from './screen-command.js';

function number(value: string): number {
  const parsed = Number(value);
  if (value.trim() === '' || !Number.isFinite(parsed)) throw new InvalidArgumentError(`expected a number, got "${value}"`);
  return parsed;
}

/** A setting's option, from the settings table: its flag, doc, unit, default and parser. */
function settingOption(spec: SettingSpec): Option {
  const unit = spec.unit && spec.unit !== 'fraction' ? `, ${spec.unit}` : '';
  const fallback = spec.type === 'boolean' ? '' : ` (default ${spec.default === null ? 'none' : spec.default})`;
  const option = new Option(spec.flag as string, `${spec.doc}${unit}${fallback}`);
  if (spec.type === 'number') option.argParser(number);
  if (spec.choices) option.choices(spec.choices);
  return option;
}

const flagged = (scope: (spec: SettingSpec) => boolean) => SETTING_KEYS.map((key) => SETTINGS[key]).filter((spec) => spec.flag !== undefined && scope(spec));

const defaultIo: CliIo = {
  out: (text: string) => process.stdout.write(text),
  err: (text: string) => process.stderr.write(text),
};

export async function main(argv: string[], io: CliIo = defaultIo): Promise<number> {
  const program = new Command('doab')
    .description("Screen an irrigation district's canals and drains for seepage losses and waterlogging risk.")
    .version(VERSION)
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err });
  let exitCode = 0;
  // the two inputs, with their CRS, as every command that reads a district takes them
  const inputCommand = (name: string, description: string) =>
    program
      .command(name)
      .description(description)
      .requiredOption('--canals <file>', 'canal and drain lines (GeoJSON, GeoJSON text sequence, .shp or zipped shapefile)')
      .requiredOption('--aquifer <file>', 'aquifer zones (polygons; same formats)')
      .addOption(settingOption(SETTINGS.inputCrs))
      .option('--debug', 'show stack traces of internal errors');
  const screen = inputCommand('screen', 'pair parallel reaches, solve every strip between them, and write GIS layers, a ranked table and a run record')
    .requiredOption('--out <dir>', 'output folder (created if missing)')
    .option('--config <file>', 'JSON config (comments allowed): settings, risk thresholds, field names and units');
  for (const spec of flagged((spec) => spec !== SETTINGS.inputCrs)) screen.addOption(settingOption(spec));
  screen
    .option('--seq', 'write the layers as GeoJSON text sequences (RFC 8142, .geojsons) instead of FeatureCollections')
    .option('--skip-invalid', 'leave out invalid features instead of stopping; run.json lists them')
    .option('--to-postgis <url>', 'also write the layers, ranking and run record into PostGIS (connection string; password from PGPASSWORD or ~/.pgpass)')
    .option('--pg-schema <name>', 'schema to write into (created if missing; default doab)')
    .option('--pg-if-exists <mode>', 'a run of the same id already in the schema: replace or refuse (default refuse)')
    .option('--quiet', 'print only errors and the caution line')
    .option('--dem <file>', 'ground elevations (GeoTIFF, one band): depths and risk follow it instead of each zone\'s ground_m')
    .option('--dem-crs <crs>', 'the DEM\'s CRS when its GeoKeys name none (EPSG:<code>, proj4 or WKT)')
    .option('--wells <file>', 'piezometers (points with an observed water-table elevation): compare, and suggest a K multiplier per zone')
    .option('--apply-k-fit', 'screen with the K multipliers fitted to --wells (recorded in run.json and the report)')
    .option('--samples <n>', 'draws of each zone\'s K from its range (k_low_m_d/k_high_m_d or k_log_sd) for the spread of losses and risk')
    .option('--seed <s>', 'seed of the draws (default 1): one seed, one answer')
    .option('--correlated-k', 'draw all zones\' K together (fully correlated) instead of independently')
    .option('--tile <i/n>', 'screen only tile I of N (counted from 1) and write its tile file into --out for doab gather; N alone takes the index from JOB_COMPLETION_INDEX, SLURM_ARRAY_TASK_ID or AWS_BATCH_JOB_ARRAY_INDEX (counted from 0)')
    .action(async (options: ScreenOptions) => {
      const progress = progressReporter({ quiet: Boolean(options.quiet), stream: process.stderr });
      try {
        exitCode = await screenCommand(options, argv, io, progress.onProgress);
      } finally {
        progress.stop();
      }
    });
  inputCommand('check', 'check the inputs without computing: every problem with file, feature and field')
    .option('--config <file>', 'JSON config (field names, units, defaults)')
    .option('--dem <file>', 'the DEM screen will use: checked too, and zones may then leave out ground_m')
    .option('--dem-crs <crs>', 'the DEM\'s CRS when its GeoKeys name none')
    .action(async (options: CheckOptions) => {
      exitCode = await checkCommand(options, io);
    });
  inputCommand('init-config', 'write a commented starting config from the attributes found in your files')
    .requiredOption('--out <file>', 'config file to write (not overwritten unless --force)')
    .option('--force', 'replace an existing config file')
    .action(async (options: InitConfigOptions) => {
      exitCode = await initConfigCommand(options, io);
    });
  const gather = program
    .command('gather')
    .description('gather the tile files of doab screen --tile I/N (every tile 1 to N) into the outputs of one run')
    .requiredOption('--tiles <dir>', 'the folder the tiles wrote into (their --out)')
    .requiredOption('--out <dir>', 'output folder (created if missing)')
    .addOption(settingOption(SETTINGS.workers))
    .option('--to-postgis <url>', 'also write the layers, ranking and run record into PostGIS (connection string; password from PGPASSWORD or ~/.pgpass)')
    .option('--pg-schema <name>', 'schema to write into (created if missing; default doab)')
    .option('--pg-if-exists <mode>', 'a run of the same id already in the schema: replace or refuse (default refuse)')
    .option('--quiet', 'print only errors and the caution line')
    .option('--debug', 'show stack traces of internal errors');
  gather.action(async (options: GatherOptions) => {
    const progress = progressReporter({ quiet: Boolean(options.quiet), stream: process.stderr });
    try {
      exitCode = await gatherCommand(options, argv, io, progress.onProgress);
    } finally {
      progress.stop();
    }
  });
  registerProfileCommand(program, io, (code) => {
    exitCode = code;
  });
  registerLiningCommand(program, io, argv, (code) => {
    exitCode = code;
  });
  if (argv.length === 0) {
    io.err(program.helpInformation());
    return 2;
  }
  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (error) {
    if (error instanceof CommanderError) {
      return error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.code === 'commander.help' ? 0 : 2;
    }
    if (error instanceof InputProblems) {
      io.err(problemLines(error.problems, PROBLEMS_SHOWN));
      io.err(`doab: stopped: ${error.message}; nothing was written\n`);
      return 1;
    }
    if (error instanceof DataError) {
      io.err(`doab: error: ${error.message}\n`);
      return 1;
    }
    if (error instanceof UsageError) {
      io.err(`doab: usage error: ${error.message}\n`);
      return 2;
    }
    const debug = argv.includes('--debug');
    io.err(`doab: internal error: ${(error as Error).message}\n${debug ? `${(error as Error).stack}\n` : 'Run again with --debug for details, and please report it.\n'}`);
    return 3;
  }
  return exitCode;
}
