// `doab lining --run DIR --plan FILE --out DIR`: what lining the reaches of a plan would save, and
// the programme a budget allows, from an earlier run's inputs and settings.
import type { Command } from 'commander';
import { checkOutputFolder, LINING_OUTPUT_NAMES, liningFromRun, liningText, writeLining } from '../index.js';
import type { CliIo } from './io.js';

export interface LiningOptions {
  run: string;
  plan: string;
  out: string;
}

export async function liningCommand(options: LiningOptions, argv: string[], io: CliIo): Promise<number> {
  const startedAt = new Date().toISOString();
  // before any screening: the folder can take the files and they replace nothing of the user's
  checkOutputFolder(options.out, [options.plan], LINING_OUTPUT_NAMES);
  const lining = await liningFromRun(options.run, options.plan, (done, total) => {
    if (done < total) io.err(`screening ${done + 1} of ${total}\n`);
  });
  const written = await writeLining(options.out, lining, ['doab', ...argv], startedAt);
  io.err(`wrote ${written.join(', ')} to ${options.out}\n`);
  io.out(liningText(lining));
  return 0;
}

/** Adds `doab lining` to the program; setExit receives the command's exit code. */
export function registerLiningCommand(program: Command, io: CliIo, argv: string[], setExit: (code: number) => void): Command {
  return program
    .command('lining')
    .description('what lining the reaches of a plan would save, and the programme a budget allows, from an earlier run')
    .requiredOption('--run <dir>', 'output folder of doab screen (holds run.json)')
    .requiredOption('--plan <file>', 'lining plan (JSON): reaches, their lining, costs and a budget')
    .requiredOption('--out <dir>', 'folder for lining.csv, lining-programme.csv, lining.geojson, report.html and run.json')
    .option('--debug', 'show stack traces of internal errors')
    .action(async (options: LiningOptions) => {
      setExit(await liningCommand(options, argv, io));
    });
}
