// Command-line wiring only: parse options, call the stages, map failures to exit codes
// (0 done, 1 bad data, 2 bad usage). Tests call main() directly or run it as a child process.
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander';
import { DataError } from '../io/data-error.js';
import { UsageError, VERSION } from './common.js';
import { screenCommand, type ScreenOptions } from './screen-command.js';

function positiveNumber(value: string): number {
  const number = Number(value);
  if (value.trim() === '' || !Number.isFinite(number) || number <= 0) throw new InvalidArgumentError(`expected a positive number, got "${value}"`);
  return number;
}

export async function main(argv: string[], io: { out: (text: string) => void; err: (text: string) => void } = defaultIo): Promise<number> {
  const program = new Command('doab')
    .description('Screen an irrigation district\'s canals and drains for seepage losses and waterlogging risk.')
    .version(VERSION)
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err });
  let exitCode = 0;
  program
    .command('screen')
    .description('pair parallel reaches, solve every strip between them, and write GIS layers, a ranked table and a run record')
    .requiredOption('--canals <file>', 'canal and drain lines (GeoJSON)')
    .requiredOption('--aquifer <file>', 'aquifer zones (GeoJSON polygons)')
    .requiredOption('--out <dir>', 'output folder (created if missing)')
    .option('--config <file>', 'JSON config with settings and risk thresholds')
    .option('--step <m>', 'station spacing along each line, m (default 100)', positiveNumber)
    .option('--max-gap <m>', 'longest transect, m (default 3000)', positiveNumber)
    .option('--max-angle <deg>', 'largest angle from parallel for a partner, degrees (default 20)', positiveNumber)
    .option('--crs <crs>', 'work CRS: EPSG:326xx/327xx or a +proj string (default: UTM zone of the data centre)')
    .addOption(new Option('--rank-by <key>', 'rank strips by loss per km or by smallest depth (default loss)').choices(['loss', 'risk']))
    .option('--transects', 'also write transects.geojson with every transect for inspection')
    .option('--quiet', 'print only errors and the caution line')
    .option('--debug', 'show stack traces of internal errors')
    .action((options: ScreenOptions) => {
      exitCode = screenCommand(options, argv, io);
    });
  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (error) {
    if (error instanceof CommanderError) {
      return error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.code === 'commander.help' ? 0 : 2;
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
  if (argv.length === 0) {
    io.err(program.helpInformation());
    return 2;
  }
  return exitCode;
}

const defaultIo = {
  out: (text: string) => process.stdout.write(text),
  err: (text: string) => process.stderr.write(text),
};
