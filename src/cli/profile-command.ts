// `doab profile --run DIR --strip ID [--out DIR]`: the cross-section of one strip of an earlier
// run, as an SVG drawing and a CSV of the water table.
import type { Command } from 'commander';
import { checkOutputFolder, peakLabelText, profileFileName, profileFromRun, profileText, writeProfile } from '../index.js';
import type { CliIo } from './io.js';

export interface ProfileOptions {
  run: string;
  strip: string;
  out?: string;
}

export async function profileCommand(options: ProfileOptions, io: CliIo): Promise<number> {
  const out = options.out ?? options.run;
  // before any screening: the folder can take the two files, and they replace nothing but earlier profiles
  const name = profileFileName(options.strip);
  const names = new Set([`${name}.svg`, `${name}.csv`]);
  checkOutputFolder(out, [], names, options.out === undefined ? '--run' : '--out', names);
  const profile = await profileFromRun(options.run, options.strip);
  const written = await writeProfile(out, profile);
  io.err(`wrote ${written.join(', ')} to ${out}\n`);
  io.out(profileText(profile, peakLabelText));
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
