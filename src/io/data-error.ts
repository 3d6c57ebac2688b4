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
