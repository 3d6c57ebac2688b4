// Parses GeoJSON as it streams in: a FeatureCollection (RFC 7946, with or without a legacy `crs`
// member) or a GeoJSON text sequence (RFC 8142: records led by RS, or one feature per line). The
// features are handed out one at a time as they are read; no file is ever one string or one tree.
// Nothing here interprets attributes; that is the validation stage's job.
import { DataError } from '../shared/errors.js';
import { JsonStream, JsonStreamError, type DuplicateKey } from './json-stream.js';

export interface ParsedGeoJson {
  features: unknown[];
  /** The CRS named by a legacy `crs` member, or null. */
  declaredCrs: string | null;
  sequence: boolean;
}

/** Takes a GeoJSON file's bytes in pieces (UTF-8, no byte-order mark) and hands out its features. */
export interface GeoJsonReader {
  write(bytes: Uint8Array): void;
  end(): { declaredCrs: string | null; sequence: boolean; featureCount: number };
}

export type FeatureSink = (feature: unknown, index: number) => void;

const RS = 0x1e;
const LF = 0x0a;
const isBlank = (byte: number) => byte === 0x20 || byte === 0x09 || byte === 0x0a || byte === 0x0d;

/** True when the file is a GeoJSON text sequence rather than one JSON document, from its name and first bytes. */
export function looksLikeSequence(path: string, head: Uint8Array): boolean {
  if (/\.(geojsons|geojsonl|geojsonseq|ndjson|jsonl)$/i.test(path)) return true;
  for (const byte of head) if (!isBlank(byte)) return byte === RS;
  return false;
}

export function geoJsonReader(path: string, sequence: boolean, onFeature: FeatureSink): GeoJsonReader {
  return sequence ? sequenceReader(path, onFeature) : collectionReader(path, onFeature);
}

/** The whole text at once (tests, and small texts): the same reader as a file's stream. */
export function parseGeoJsonText(path: string, rawText: string): ParsedGeoJson {
  // RFC 8259 section 8.1: a parser may ignore a leading byte order mark, which Windows exports write
  const text = rawText.replace(/^\uFEFF/, '');
  if (text.trim() === '') throw new DataError({ file: path }, 'the file is empty');
  const bytes = Buffer.from(text, 'utf8');
  const features: unknown[] = [];
  const reader = geoJsonReader(path, looksLikeSequence(path, bytes), (feature) => void features.push(feature));
  reader.write(bytes);
  const { declaredCrs, sequence } = reader.end();
  return { features, declaredCrs, sequence };
}

function collectionReader(path: string, onFeature: FeatureSink): GeoJsonReader {
  const json = new JsonStream({ streamKey: 'features', onMember: onFeature });
  const notJson = (error: unknown): never => {
    if (!(error instanceof JsonStreamError)) throw error;
    throw new DataError({ file: path }, `not valid JSON (${error.message}); is the file complete?`);
  };
  return {
    write(bytes) {
      try {
        json.write(bytes);
      } catch (error) {
        notJson(error);
      }
    },
    end() {
      let parsed: unknown;
      try {
        parsed = json.end();
      } catch (error) {
        notJson(error);
      }
      if (parsed === undefined) throw new DataError({ file: path }, 'the file is empty');
      if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) {
        throw new DataError({ file: path }, 'expected a GeoJSON FeatureCollection object');
      }
      const object = parsed as Record<string, unknown>;
      if (object.type !== 'FeatureCollection' || !json.streamedIsList) {
        throw new DataError({ file: path }, `expected a GeoJSON FeatureCollection with a "features" array, found type ${JSON.stringify(String(object.type)).slice(0, 80)}`);
      }
      refuseDuplicate(path, json.duplicate, (where) => (where[0] === 'features' && typeof where[1] === 'number' ? where[1] : undefined));
      return { declaredCrs: legacyCrsName(path, object.crs), sequence: false, featureCount: json.streamedCount };
    },
  };
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
function refuseDuplicate(path: string, duplicate: DuplicateKey | null, featureOf: (where: (string | number)[]) => number | undefined): void {
  if (!duplicate) return;
  const { key, path: where } = duplicate;
  const featureIndex = featureOf(where);
  const inside = where.length > 0 ? ` in ${where.map((part) => (typeof part === 'number' ? `[${part}]` : `.${part}`)).join('').replace(/^\./, '')}` : '';
  throw new DataError({ file: path, featureIndex, field: String(key).slice(0, 80) }, `the key "${String(key).slice(0, 80)}" appears twice${inside}; JSON keeps only one of them, so say which you mean`);
}

// Records are numbered from 0 in the order they stand, whichever way they are framed, like features.
// Framing: records led by RS when the first character is RS (a record may then span lines),
// otherwise one record per line (an RS there ends a record too).
function sequenceReader(path: string, onFeature: FeatureSink): GeoJsonReader {
  let framing: 'rs' | 'lines' | null = null;
  let record: JsonStream | null = null;
  let recordIndex = 0;
  let featureCount = 0;
  const broken = (error: unknown): never => {
    if (!(error instanceof JsonStreamError)) throw error;
    throw new DataError({ file: path }, `record ${recordIndex} of the GeoJSON text sequence is not valid JSON (${error.message}); a truncated record?`);
  };
  const finishRecord = () => {
    if (!record) return;
    let value: unknown;
    try {
      value = record.end();
    } catch (error) {
      broken(error);
    }
    const duplicate = record.duplicate;
    record = null;
    if (value === undefined) return; // only white space between two separators
    const firstFeature = featureCount;
    const isCollection = value !== null && typeof value === 'object' && (value as { type?: unknown }).type === 'FeatureCollection';
    refuseDuplicate(path, duplicate, (where) => (isCollection ? (where[0] === 'features' && typeof where[1] === 'number' ? firstFeature + where[1] : undefined) : firstFeature));
    if (isCollection) {
      const inner = (value as { features?: unknown }).features;
      if (!Array.isArray(inner)) throw new DataError({ file: path }, `record ${recordIndex} of the GeoJSON text sequence is a FeatureCollection without a "features" list`);
      for (const item of inner) onFeature(item, featureCount++);
    } else {
      onFeature(value, featureCount++);
    }
    recordIndex++;
  };
  // where the next separator stands from `from` on; each kind's last find is kept, so a chunk is searched once
  let chunk: Uint8Array | null = null;
  let nextRs = -1, nextLf = -1;
  const find = (byte: number, from: number) => {
    const at = chunk!.indexOf(byte, from);
    return at < 0 ? Infinity : at;
  };
  const nextSeparator = (from: number): number => {
    if (nextRs < from) nextRs = find(RS, from);
    if (framing === 'rs') return nextRs;
    if (nextLf < from) nextLf = find(LF, from);
    return Math.min(nextRs, nextLf);
  };
  return {
    write(bytes) {
      let from = 0;
      if (framing === null) {
        while (from < bytes.length && isBlank(bytes[from])) from++;
        if (from === bytes.length) return;
        framing = bytes[from] === RS ? 'rs' : 'lines';
      }
      chunk = bytes;
      nextRs = nextLf = -1;
      while (from < bytes.length) {
        const at = nextSeparator(from);
        const end = Math.min(at, bytes.length);
        if (end > from) {
          record ??= new JsonStream();
          try {
            record.write(bytes.subarray(from, end));
          } catch (error) {
            broken(error);
          }
        }
        if (at === Infinity) break;
        finishRecord();
        from = at + 1;
      }
      chunk = null;
    },
    end() {
      finishRecord();
      if (framing === null) throw new DataError({ file: path }, 'the file is empty');
      return { declaredCrs: null, sequence: true, featureCount };
    },
  };
}
