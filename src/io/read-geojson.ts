// Reads a GeoJSON file as given: the bytes (for the run record's SHA-256) and the parsed
// FeatureCollection. Nothing here interprets attributes; that is the validation stage's job.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { DataError } from './data-error.js';

export interface InputFile {
  path: string;
  sha256: string;
  bytes: number;
  features: unknown[];
  /** The collection's own members other than `features` (a legacy `crs`, say). */
  members: Record<string, unknown>;
}

export function readGeoJsonFile(path: string): InputFile {
  let buffer: Buffer;
  try {
    buffer = readFileSync(path);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'file not found' : code === 'EISDIR' ? 'is a folder, not a file' : `cannot be read (${code ?? String(error)})`;
    throw new DataError({ file: path }, why);
  }
  if (buffer.length === 0) throw new DataError({ file: path }, 'the file is empty (0 bytes)');
  let parsed: unknown;
  try {
    parsed = JSON.parse(buffer.toString('utf8'));
  } catch (error) {
    throw new DataError({ file: path }, `not valid JSON (${(error as Error).message}); is the file complete?`);
  }
  if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) {
    throw new DataError({ file: path }, 'expected a GeoJSON FeatureCollection object');
  }
  const object = parsed as Record<string, unknown>;
  if (object.type !== 'FeatureCollection' || !Array.isArray(object.features)) {
    throw new DataError({ file: path }, `expected a GeoJSON FeatureCollection, found type ${JSON.stringify(object.type)}`);
  }
  const members: Record<string, unknown> = Object.create(null);
  for (const key of Object.keys(object)) if (key !== 'features') members[key] = object[key];
  return {
    path,
    sha256: createHash('sha256').update(buffer).digest('hex'),
    bytes: buffer.length,
    features: object.features,
    members,
  };
}
