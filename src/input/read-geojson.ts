// Parses GeoJSON text as given: a FeatureCollection (RFC 7946, with or without a legacy `crs`
// member) or a GeoJSON text sequence (RFC 8142: records led by RS, or one feature per line).
// Nothing here interprets attributes; that is the validation stage's job.
import { DataError } from '../shared/errors.js';
import { duplicateKeys } from './read-text.js';

export interface ParsedGeoJson {
  features: unknown[];
  /** The CRS named by a legacy `crs` member, or null. */
  declaredCrs: string | null;
  sequence: boolean;
}

const RS = '\u001e';

/** True when the text is a GeoJSON text sequence rather than one JSON document. */
export function looksLikeSequence(path: string, text: string): boolean {
  if (/\.(geojsons|geojsonl|geojsonseq|ndjson|jsonl)$/i.test(path)) return true;
  return text.trimStart().startsWith(RS);
}

export function parseGeoJsonText(path: string, rawText: string): ParsedGeoJson {
  // RFC 8259 section 8.1: a parser may ignore a leading byte order mark, which Windows exports write
  const text = rawText.replace(/^\uFEFF/, '');
  if (text.trim() === '') throw new DataError({ file: path }, 'the file is empty');
  if (looksLikeSequence(path, text)) return { features: parseSequence(path, text), declaredCrs: null, sequence: true };
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (error) {
    throw new DataError({ file: path }, `not valid JSON (${(error as Error).message}); is the file complete?`);
  }
  if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) {
    throw new DataError({ file: path }, 'expected a GeoJSON FeatureCollection object');
  }
  const object = parsed as Record<string, unknown>;
  if (object.type !== 'FeatureCollection' || !Array.isArray(object.features)) {
    throw new DataError({ file: path }, `expected a GeoJSON FeatureCollection with a "features" array, found type ${JSON.stringify(String(object.type)).slice(0, 80)}`);
  }
  refuseDuplicateKeys(path, text, (where) => (where[0] === 'features' && typeof where[1] === 'number' ? where[1] : undefined));
  return { features: object.features, declaredCrs: legacyCrsName(path, object.crs), sequence: false };
}

// The 2008 GeoJSON draft's named CRS, still written by many desktop exports of projected data:
// {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32643"}}
function legacyCrsName(path: string, crs: unknown): string | null {
  if (crs === undefined || crs === null) return null;
  const member = crs as { type?: unknown; properties?: { name?: unknown } };
  if (member.type === 'name' && typeof member.properties?.name === 'string') return member.properties.name;
  throw new DataError({ file: path, field: 'crs' }, `unsupported "crs" member ${JSON.stringify(crs).slice(0, 120)}; expected {"type":"name","properties":{"name":"EPSG:<code>"}}`);
}

/** A key an object holds twice is an error naming it: JSON.parse would keep the last one without a word. */
function refuseDuplicateKeys(path: string, text: string, featureOf: (where: (string | number)[]) => number | undefined): void {
  const duplicates = duplicateKeys(text, 1);
  if (duplicates.length === 0) return;
  const [{ key, path: where }] = duplicates;
  const featureIndex = featureOf(where);
  const inside = where.length > 0 ? ` in ${where.map((part) => (typeof part === 'number' ? `[${part}]` : `.${part}`)).join('').replace(/^\./, '')}` : '';
  throw new DataError({ file: path, featureIndex, field: String(key).slice(0, 80) }, `the key "${String(key).slice(0, 80)}" appears twice${inside}; JSON keeps only one of them, so say which you mean`);
}

// Records are numbered from 0 in the order they stand, whichever way they are framed, like features.
function parseSequence(path: string, text: string): unknown[] {
  const records = (text.includes(RS) ? text.split(RS) : text.split('\n')).filter((record) => record.trim() !== '');
  const features: unknown[] = [];
  records.forEach((record, index) => {
    let value: unknown;
    try {
      value = JSON.parse(record);
    } catch (error) {
      throw new DataError({ file: path }, `record ${index} of the GeoJSON text sequence is not valid JSON (${(error as Error).message}); a truncated record?`);
    }
    const firstFeature = features.length;
    refuseDuplicateKeys(path, record, (where) => ((value as { type?: unknown } | null)?.type === 'FeatureCollection' ? (where[0] === 'features' && typeof where[1] === 'number' ? firstFeature + where[1] : undefined) : firstFeature));
    if (value !== null && typeof value === 'object' && (value as { type?: unknown }).type === 'FeatureCollection') {
      const inner = (value as { features?: unknown }).features;
      if (!Array.isArray(inner)) throw new DataError({ file: path }, `record ${index} of the GeoJSON text sequence is a FeatureCollection without a "features" list`);
      for (const item of inner) features.push(item);
    } else {
      features.push(value);
    }
  });
  return features;
}
