// A problem with the user's data: it names the file, the feature and the field, so the user
// can find and fix it. The CLI turns it into a one-line message and exit code 1.

export interface DataProblemPlace {
  file: string;
  /** Zero-based index of the feature in its file. */
  featureIndex?: number;
  featureId?: string;
  field?: string;
}

export class DataError extends Error {
  readonly place: DataProblemPlace;

  constructor(place: DataProblemPlace, problem: string) {
    super(`${describePlace(place)}: ${problem}`);
    this.name = 'DataError';
    this.place = place;
  }
}

export function describePlace(place: DataProblemPlace): string {
  let text = place.file;
  if (place.featureIndex !== undefined) {
    text += `, feature ${place.featureIndex}`;
    if (place.featureId !== undefined) text += ` (id "${place.featureId}")`;
  }
  if (place.field !== undefined) text += `, field "${place.field}"`;
  return text;
}

/**
 * A command line, option or setting that cannot run as given (the CLI's exit code 2). `setting`
 * names the setting (its config key) when one is to blame, so a front end can name its own flag.
 */
export class UsageError extends Error {
  constructor(message: string, readonly setting?: string) {
    super(message);
    this.name = 'UsageError';
  }
}

/** One thing the checks found in the inputs: an error stops a run, a warning is said and kept. */
export interface Problem {
  severity: 'error' | 'warning';
  place: DataProblemPlace;
  message: string;
}

export function formatProblem(problem: Problem): string {
  return `${problem.severity}: ${describePlace(problem.place)}: ${problem.message}`;
}

/** Problems that stop a run; a front end prints each on its own line (the CLI exits 1). */
export class InputProblems extends Error {
  constructor(readonly problems: Problem[]) {
    super(`${problems.length} problem${problems.length === 1 ? '' : 's'} in the inputs`);
    this.name = 'InputProblems';
  }
}

export function errorsOf(problems: Problem[]): Problem[] {
  return problems.filter((problem) => problem.severity === 'error');
}

/** One line per problem, the first `limit` of them, then a line that counts the rest. */
export function problemLines(problems: Problem[], limit = Infinity): string {
  const shown = problems.length > limit ? problems.slice(0, limit) : problems;
  let text = shown.map((problem) => `${formatProblem(problem)}\n`).join('');
  if (problems.length > shown.length) text += `... and ${problems.length - shown.length} more problem${problems.length - shown.length === 1 ? '' : 's'} like these (the first ${shown.length} are listed)\n`;
  return text;
}

/** How many problems a terminal is shown before the rest are counted. */
export const PROBLEMS_SHOWN = 100;
