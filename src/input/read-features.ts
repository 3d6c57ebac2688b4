// The reading stage: one input file, whatever its format, to GeoJSON features in lon/lat (WGS 84)
// with the bytes' SHA-256 for the run record. GeoJSON, GeoJSON text sequences, shapefiles and
// zipped shapefiles; the source CRS from the .prj, a legacy `crs` member or --input-crs.
import { createHash } from 'node:crypto';
import { closeSync, existsSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { basename, dirname, extname, join } from 'node:path';
import { unzipSync } from 'fflate';
import * as shapefile from 'shapefile';
import { DataError } from '../shared/errors.js';
import { DEFAULT_SETTINGS } from '../shared/settings.js';
import { geoJsonReader, looksLikeSequence, type FeatureSink, type GeoJsonReader } from './read-geojson.js';
import { refuseUtf16, Utf8Pieces } from './read-text.js';
import { resolveSourceCrs, type SourceCrs } from './source-crs.js';

export type InputFormat = 'geojson' | 'geojson-seq' | 'shapefile' | 'zipped-shapefile';

export interface InputFile {
  path: string;
  format: InputFormat;
  /** SHA-256 of the file's bytes; for a shapefile, of its .shp, .dbf, .prj and .cpg in that order. */
  sha256: string;
  bytes: number;
  features: unknown[];
  /** How many features the file held (loadDistrict lets the lines' features go once checked; this stays). */
  featureCount: number;
  /** The CRS the file was written in, or null for lon/lat as RFC 7946 asks. */
  sourceCrs: string | null;
  warnings: string[];
}

export interface ReadOptions {
  /** Overrides whatever the file declares. */
  inputCrs?: string;
  /** Budgets checked before anything is allocated for a file (defaults: the settings table's). */
  maxInputMB?: number;
  maxUnzippedMB?: number;
  maxZipRatio?: number;
}

const MB = 1024 * 1024;

/** Every file an input path stands for: a shapefile's .shp with the sidecars beside it, or the file itself. */
export function filesOfInput(path: string): string[] {
  if (extname(path).toLowerCase() !== '.shp') return [path];
  return [path, ...['.shx', '.dbf', '.prj', '.cpg', '.qix', '.sbn', '.sbx'].map((extension) => sidecar(path, extension)).filter((file): file is string => file !== null)];
}

/** The size of an input, checked before a byte of it is read: a regular file within the budget. */
function statInput(path: string, what: string, maxInputMB: number): number {
  let size: number;
  try {
    const stats = statSync(path);
    // /dev/zero, a pipe or a socket never ends, or ends where it likes: only regular files are inputs
    if (stats.isDirectory()) throw Object.assign(new Error(), { code: 'EISDIR' });
    if (!stats.isFile()) throw new DataError({ file: path }, 'not a regular file (a device, pipe or socket); give a file');
    size = stats.size;
  } catch (error) {
    throw unreadable(path, what, error);
  }
  if (size > maxInputMB * MB) {
    throw new DataError({ file: path }, `is ${(size / MB).toFixed(0)} MB, more than the ${maxInputMB} MB an input may be (setting maxInputMB, --max-input-mb)`);
  }
  return size;
}

function unreadable(path: string, what: string, error: unknown): DataError {
  if (error instanceof DataError) return error;
  const code = (error as NodeJS.ErrnoException).code;
  const why = code === 'ENOENT' ? `${what} not found` : code === 'EISDIR' ? 'is a folder, not a file' : `cannot be read (${code ?? String(error)})`;
  return new DataError({ file: path }, why);
}

function readBytes(path: string, what = 'file', maxInputMB = DEFAULT_SETTINGS.maxInputMB): Buffer {
  statInput(path, what, maxInputMB);
  try {
    return readFileSync(path);
  } catch (error) {
    throw unreadable(path, what, error);
  }
}

// pieces a file is read in: large enough that a piece costs little, small enough to hold many of
const PIECE_BYTES = 4 * MB;

/** Calls `use` with each piece of a file, in order, synchronously; nothing else is held. */
function eachPiece(path: string, use: (piece: Buffer) => void): void {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    throw unreadable(path, 'file', error);
  }
  try {
    for (;;) {
      // a fresh buffer each time: a piece may be kept by whoever it is handed to
      const piece = Buffer.allocUnsafe(PIECE_BYTES);
      let got: number;
      try {
        got = readSync(fd, piece, 0, PIECE_BYTES, null);
      } catch (error) {
        throw unreadable(path, 'file', error);
      }
      if (got === 0) return;
      use(got === PIECE_BYTES ? piece : piece.subarray(0, got));
    }
  } finally {
    closeSync(fd);
  }
}

export interface StreamedGeoJson {
  format: 'geojson' | 'geojson-seq';
  sha256: string;
  bytes: number;
  /** The CRS named by a legacy `crs` member, or null. */
  declaredCrs: string | null;
  featureCount: number;
}

/**
 * Reads a GeoJSON FeatureCollection or text sequence piece by piece, handing each feature to
 * `onFeature` as soon as it is whole: the file is never one string, so its size is bounded only by
 * `maxInputMB` (checked before reading). Refuses what parseGeoJsonText refuses, with the same words.
 */
export function streamGeoJsonFile(path: string, onFeature: FeatureSink, options: Pick<ReadOptions, 'maxInputMB'> = {}): StreamedGeoJson {
  const bytes = statInput(path, 'file', options.maxInputMB ?? DEFAULT_SETTINGS.maxInputMB);
  if (bytes === 0) throw new DataError({ file: path }, 'the file is empty (0 bytes)');
  const hash = createHash('sha256');
  const utf8 = new Utf8Pieces();
  let reader: GeoJsonReader | null = null;
  let read = 0;
  eachPiece(path, (piece) => {
    hash.update(piece);
    read += piece.length;
    if (!reader) {
      // the first piece holds the first 512 bytes (or the whole file): enough to tell UTF-16 and a sequence
      const start = refuseUtf16(path, piece);
      piece = piece.subarray(start);
      reader = geoJsonReader(path, looksLikeSequence(path, piece.subarray(0, 4096)), onFeature);
    }
    reader.write(utf8.mend(piece));
  });
  // a file that grew or shrank while being read is not the file that was checked
  if (read !== bytes) throw new DataError({ file: path }, `changed while being read (${bytes} bytes, then ${read})`);
  const rest = utf8.finish();
  if (rest) reader!.write(rest);
  const parsed = (reader as GeoJsonReader | null)!.end();
  return { format: parsed.sequence ? 'geojson-seq' : 'geojson', sha256: hash.digest('hex'), bytes, declaredCrs: parsed.declaredCrs, featureCount: parsed.featureCount };
}

export async function readFeatureFile(path: string, options: ReadOptions = {}): Promise<InputFile> {
  const extension = extname(path).toLowerCase();
  const raw =
    extension === '.shp' ? readShapefileFromDisk(path, options) : extension === '.zip' ? readZippedShapefile(path, options) : null;
  let file: Omit<InputFile, 'features' | 'featureCount' | 'sourceCrs' | 'warnings'> & { features: unknown[]; declaredCrs: string | null };
  if (raw) {
    const features = await parseShapefile(raw.label, raw.shp, raw.dbf, raw.encoding);
    file = { path, format: raw.format, sha256: raw.sha256, bytes: raw.bytes, features, declaredCrs: raw.prj };
  } else {
    const features: unknown[] = [];
    const streamed = streamGeoJsonFile(path, (feature) => void features.push(feature), options);
    file = { path, format: streamed.format, sha256: streamed.sha256, bytes: streamed.bytes, features, declaredCrs: streamed.declaredCrs };
  }
  const spec = options.inputCrs ?? file.declaredCrs;
  const warnings: string[] = [];
  let crs: SourceCrs | null = null;
  if (spec) {
    try {
      crs = resolveSourceCrs(spec);
    } catch (error) {
      const source = options.inputCrs ? '--input-crs' : raw ? `${raw.label.replace(/\.(shp|zip)$/i, '')}.prj` : 'the "crs" member';
      throw new DataError({ file: path, field: options.inputCrs ? undefined : raw ? undefined : 'crs' }, `${source}: ${(error as Error).message}`);
    }
    warnings.push(...crs.warnings);
    if (crs.toLonLat) reproject(file.features, crs.toLonLat);
  }
  return {
    path: file.path,
    format: file.format,
    sha256: file.sha256,
    bytes: file.bytes,
    features: file.features,
    featureCount: file.features.length,
    sourceCrs: crs ? crs.label : null,
    warnings,
  };
}

/** The SHA-256 an input file would be recorded with, from its bytes alone: nothing is parsed or quoted. */
export function hashInput(path: string, options: ReadOptions = {}): string {
  const extension = extname(path).toLowerCase();
  if (extension === '.shp') return readShapefileFromDisk(path, options).sha256;
  if (extension === '.zip') return readZippedShapefile(path, options).sha256;
  statInput(path, 'file', options.maxInputMB ?? DEFAULT_SETTINGS.maxInputMB);
  const hash = createHash('sha256');
  eachPiece(path, (piece) => void hash.update(piece));
  return hash.digest('hex');
}

interface RawShapefile {
  label: string;
  format: InputFormat;
  shp: Uint8Array;
  dbf: Uint8Array;
  prj: string | null;
  encoding: string | undefined;
  sha256: string;
  bytes: number;
}

function sidecar(shpPath: string, extension: string): string | null {
  const stem = join(dirname(shpPath), basename(shpPath, extname(shpPath)));
  for (const candidate of [extension, extension.toUpperCase()]) {
    if (existsSync(stem + candidate)) return stem + candidate;
  }
  return null;
}

function readShapefileFromDisk(path: string, options: ReadOptions): RawShapefile {
  const shp = readBytes(path, 'file', options.maxInputMB);
  const dbfPath = sidecar(path, '.dbf');
  if (!dbfPath) throw new DataError({ file: path }, 'the .dbf file with the attributes is missing beside the .shp (a shapefile needs .shp, .shx and .dbf)');
  const dbf = readBytes(dbfPath, 'file', options.maxInputMB);
  const prjPath = sidecar(path, '.prj');
  const cpgPath = sidecar(path, '.cpg');
  const prj = prjPath ? readText(prjPath, readBytes(prjPath)) : null;
  const cpg = cpgPath ? readBytes(cpgPath) : null;
  return finish(path, 'shapefile', shp, dbf, prj, cpg, cpgPath ?? path);
}

function readZippedShapefile(path: string, options: ReadOptions): RawShapefile {
  const buffer = readBytes(path, 'file', options.maxInputMB);
  const maxUnzippedMB = options.maxUnzippedMB ?? DEFAULT_SETTINGS.maxUnzippedMB;
  const maxRatio = options.maxZipRatio ?? DEFAULT_SETTINGS.maxZipRatio;
  let entries: Record<string, Uint8Array>;
  let declaredBytes = 0;
  let refused: string | null = null;
  try {
    // the archive's own directory says what each member expands to: checked before any is expanded
    entries = unzipSync(new Uint8Array(buffer), {
      filter: (member) => {
        if (member.name.startsWith('__MACOSX/') || refused) return false;
        declaredBytes += member.originalSize;
        const ratio = member.originalSize / Math.max(member.size, 1);
        if (ratio > maxRatio) refused = `${member.name} would expand ${ratio.toFixed(0)} times (${(member.originalSize / MB).toFixed(0)} MB from ${member.size} bytes), more than the ${maxRatio} times a member may (setting maxZipRatio): a zip bomb?`;
        else if (declaredBytes > maxUnzippedMB * MB) refused = `its members would expand to more than the ${maxUnzippedMB} MB an archive may (setting maxUnzippedMB)`;
        return !refused;
      },
    });
  } catch (error) {
    if (refused) throw new DataError({ file: path }, `refused: ${refused}`);
    throw new DataError({ file: path }, `not a readable zip archive (${(error as Error).message})`);
  }
  if (refused) throw new DataError({ file: path }, `refused: ${refused}`);
  // a member whose directory entry lies about its size is bounded by what it declared; check what came out too
  const expanded = Object.values(entries).reduce((sum, bytes) => sum + bytes.length, 0);
  if (expanded > maxUnzippedMB * MB) throw new DataError({ file: path }, `refused: its members expand to ${(expanded / MB).toFixed(0)} MB, more than the ${maxUnzippedMB} MB an archive may (setting maxUnzippedMB)`);
  const names = Object.keys(entries).filter((name) => !name.startsWith('__MACOSX/'));
  const shps = names.filter((name) => /\.shp$/i.test(name));
  if (shps.length === 0) throw new DataError({ file: path }, 'the zip archive holds no .shp file');
  if (shps.length > 1) throw new DataError({ file: path }, `the zip archive holds ${shps.length} shapefiles (${shps.join(', ')}); give one shapefile per input`);
  const stem = shps[0].slice(0, -4);
  const find = (extension: string) => names.find((name) => name.toLowerCase() === `${stem}${extension}`.toLowerCase());
  const dbfName = find('.dbf');
  if (!dbfName) throw new DataError({ file: path }, `the zip archive has ${shps[0]} but no ${stem}.dbf with the attributes`);
  const prjName = find('.prj');
  const cpgName = find('.cpg');
  const prj = prjName ? readText(`${path}:${prjName}`, entries[prjName]) : null;
  return finish(path, 'zipped-shapefile', entries[shps[0]], entries[dbfName], prj, cpgName ? entries[cpgName] : null, `${path}:${cpgName}`, buffer.length);
}

function readText(label: string, bytes: Uint8Array): string {
  const text = new TextDecoder('utf-8').decode(bytes).replace(/^\uFEFF/, '').trim();
  if (text === '') throw new DataError({ file: label }, 'the .prj file is empty: it cannot say which CRS the shapefile uses');
  return text;
}

// .cpg holds a code page name such as "UTF-8", "1252" or "ISO-8859-1"
function encodingOf(label: string, cpg: Uint8Array | null): string | undefined {
  if (!cpg) return undefined;
  const name = new TextDecoder('ascii').decode(cpg).trim();
  const candidate = /^\d+$/.test(name) ? (name === '65001' ? 'utf-8' : `windows-${name}`) : name;
  try {
    new TextDecoder(candidate);
  } catch {
    throw new DataError({ file: label }, `unknown text encoding "${name}" in the .cpg file`);
  }
  return candidate;
}

function finish(label: string, format: InputFormat, shp: Uint8Array, dbf: Uint8Array, prj: string | null, cpg: Uint8Array | null, cpgLabel: string, bytes?: number): RawShapefile {
  const hash = createHash('sha256').update(shp).update(dbf);
  if (prj) hash.update(prj);
  if (cpg) hash.update(cpg);
  return { label, format, shp, dbf, prj, encoding: encodingOf(cpgLabel, cpg), sha256: hash.digest('hex'), bytes: bytes ?? shp.length + dbf.length };
}

async function parseShapefile(label: string, shp: Uint8Array, dbf: Uint8Array, encoding: string | undefined): Promise<unknown[]> {
  if (shp.length < 100) throw new DataError({ file: label }, `not a shapefile: ${shp.length} bytes is shorter than the 100-byte header`);
  try {
    const collection = await shapefile.read(shp, dbf, encoding ? { encoding } : undefined);
    return collection.features;
  } catch (error) {
    throw new DataError({ file: label }, `not a readable shapefile (${(error as Error).message})`);
  }
}

function reproject(features: unknown[], toLonLat: (x: number, y: number) => [number, number]): void {
  const walk = (coordinates: unknown): unknown => {
    if (!Array.isArray(coordinates)) return coordinates;
    if (coordinates.length >= 2 && typeof coordinates[0] === 'number' && typeof coordinates[1] === 'number') {
      const [lon, lat] = toLonLat(coordinates[0], coordinates[1]);
      return [lon, lat, ...coordinates.slice(2)];
    }
    return coordinates.map(walk);
  };
  for (const feature of features) {
    const geometry = (feature as { geometry?: { coordinates?: unknown } } | null)?.geometry;
    if (geometry && typeof geometry === 'object' && 'coordinates' in geometry) geometry.coordinates = walk(geometry.coordinates);
  }
}
