// `doab check`: validate both inputs without computing; print every problem, errors first.
import { errorsOf, loadDistrict, problemLines, PROBLEMS_SHOWN, readDem } from '../index.js';
import type { CliIo } from './io.js';
import { runConfig } from './screen-command.js';

export interface CheckOptions {
  canals: string;
  aquifer: string;
  config?: string;
  inputCrs?: string;
  /** A DEM the screen will take its ground from: zones may then leave out ground_m, as screen allows. */
  dem?: string;
  demCrs?: string;
  debug?: boolean;
}

export async function checkCommand(options: CheckOptions, io: CliIo): Promise<number> {
  const config = runConfig(options as unknown as Record<string, unknown>);
  // the DEM is read as screen reads it (a bad one is named), and lets zones leave out their ground
  if (options.dem) await readDem(options.dem, { demCrs: options.demCrs ?? null, maxInputMB: config.settings.maxInputMB });
  const district = await loadDistrict(options.canals, options.aquifer, config, { groundFromDem: Boolean(options.dem) });
  const errors = errorsOf(district.problems);
  const warnings = district.problems.filter((problem) => problem.severity === 'warning');
  io.out(problemLines([...errors, ...warnings], PROBLEMS_SHOWN));
  io.out(
    `${options.canals}: ${district.canals?.featureCount ?? 0} features (${district.lines.length} valid lines); ` +
      `${options.aquifer}: ${district.aquifer?.featureCount ?? 0} features (${district.zones.length} valid zones)\n`,
  );
  io.out(`${errors.length} error${errors.length === 1 ? '' : 's'}, ${warnings.length} warning${warnings.length === 1 ? '' : 's'}\n`);
  return errors.length > 0 ? 1 : 0;
}
