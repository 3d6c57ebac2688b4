// Command-line wiring only: parse options, call the commands, map failures to exit codes
// (0 done, 1 bad data, 2 bad usage, 3 internal error). Tests call main() or run it as a child process.
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander';
import { DataError } from '../io/data-error.js';
import { checkCommand, type CheckOptions } from './check-command.js';
import { UsageError, VERSION } from './common.js';
import { initConfigCommand, type InitConfigOptions } from './init-config-command.js';
import { InputProblems, problemLines } from './load-district.js';
import { registerProfileCommand } from './profile-command.js';
import { progressReporter } from './progress.js';
import { screenCommand, type CliIo, type ScreenOptions } from './screen-command.js';

function positiveNumber(value: string): number {
  const number = Number(value);
  if (value.trim() === '' || !Number.isFinite(number) || number <= 0) throw new InvalidArgumentError(`expected a positive number, got "${value}"`);
  return number;
}

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
      .option('--input-crs <crs>', 'CRS of the input files (EPSG:<code>, proj4 or WKT); overrides .prj and "crs" members')
      .option('--debug', 'show stack traces of internal errors');
  inputCommand('screen', 'pair parallel reaches, solve every strip between them, and write GIS layers, a ranked table and a run record')
    .requiredOption('--out <dir>', 'output folder (created if missing)')
    .option('--config <file>', 'JSON config (comments allowed): settings, risk thresholds, field names and units')
    .option('--step <m>', 'station spacing along each line, m (default 100)', positiveNumber)
    .option('--max-gap <m>', 'longest transect, m (default 3000)', positiveNumber)
    .option('--max-angle <deg>', 'largest angle from parallel for a partner, degrees (default 20)', positiveNumber)
    .option('--crs <crs>', 'work CRS: EPSG:326xx/327xx or a +proj string (default: UTM zone of the data centre)')
    .addOption(new Option('--rank-by <key>', 'rank strips by loss per km or by smallest depth (default loss)').choices(['loss', 'risk']))
    .option('--transects', 'also write the transects layer, every transect with its inputs and results')
    .option('--seq', 'write the layers as GeoJSON text sequences (RFC 8142, .geojsons) instead of FeatureCollections')
    .option('--skip-invalid', 'leave out invalid features instead of stopping; run.json lists them')
    .option('--quiet', 'print only errors and the caution line')
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
    .action(async (options: CheckOptions) => {
      exitCode = await checkCommand(options, io);
    });
  inputCommand('init-config', 'write a commented starting config from the attributes found in your files')
    .requiredOption('--out <file>', 'config file to write (not overwritten unless --force)')
    .option('--force', 'replace an existing config file')
    .action(async (options: InitConfigOptions) => {
      exitCode = await initConfigCommand(options, io);
    });
  registerProfileCommand(program, io, (code) => {
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
      io.err(problemLines(error.problems));
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
