// Reads a digital elevation model from a GeoTIFF (one band of ground elevations) with geotiff.js:
// its grid, its nodata value, and its CRS from the GeoKeys (an EPSG code) or as the user names it.
import { statSync, readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { DataError, UsageError } from '../shared/errors.js';
import type { DemGrid } from '../geometry/dem.js';
import { lonLatToCrs, resolveSourceCrs } from './source-crs.js';

export interface Dem {
  path: string;
  sha256: string;
  grid: DemGrid;
  /** How the CRS was named ("EPSG:32642"), and lon/lat into it (null: the DEM is in lon/lat). */
  crsLabel: string;
  fromLonLat: ((lon: number, lat: number) => [number, number]) | null;
  /** About a pixel's size in metres. */
  pixelM: number;
  /** Pixels without data. */
  nodataPixels: number;
}

// GeoTIFF 1.0 specification (N. Ritter, M. Ruth, 1995) [published]: 32767 user-defined; raster type 2 pixel-is-point
const USER_DEFINED = 32767;
const PIXEL_IS_POINT = 2;
/** The most pixels doab reads from a DEM (4 bytes each in memory). */
export const MAX_DEM_PIXELS = 200_000_000;

export async function readDem(path: string, options: { demCrs?: string | null; maxInputMB: number }): Promise<Dem> {
  let bytes: Buffer;
  try {
    const stats = statSync(path);
    if (!stats.isFile()) throw new DataError({ file: path }, 'not a regular file; give a GeoTIFF');
    if (stats.size > options.maxInputMB * 1024 * 1024) throw new DataError({ file: path }, `is ${(stats.size / 2 ** 20).toFixed(0)} MB, more than maxInputMB (${options.maxInputMB} MB)`);
    bytes = readFileSync(path);
  } catch (error) {
    if (error instanceof DataError) throw error;
    throw new DataError({ file: path }, (error as NodeJS.ErrnoException).code === 'ENOENT' ? 'file not found' : `cannot be read (${(error as Error).message})`);
  }
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  let image;
  try {
    // loaded when a DEM is read, not at every start of the command
    const { fromArrayBuffer } = await import('geotiff');
    const tiff = await fromArrayBuffer(Uint8Array.from(bytes).buffer);
    image = await tiff.getImage();
  } catch (error) {
    throw new DataError({ file: path }, `not a GeoTIFF that can be read (${(error as Error).message.slice(0, 120)})`);
  }
  const width = image.getWidth(), height = image.getHeight();
  if (!(width >= 1 && height >= 1) || width * height > MAX_DEM_PIXELS) throw new DataError({ file: path }, `${width} x ${height} pixels: at most ${MAX_DEM_PIXELS} pixels are read`);
  if (image.getSamplesPerPixel() !== 1) throw new DataError({ file: path }, `has ${image.getSamplesPerPixel()} bands; a DEM has one, of ground elevations`);
  let origin: number[], resolution: number[];
  try {
    origin = image.getOrigin();
    resolution = image.getResolution();
  } catch {
    throw new DataError({ file: path }, 'has no georeferencing (no tie point and pixel scale, nor a transformation)');
  }
  const keys = image.getGeoKeys() ?? {};
  const code = (keys.ProjectedCSTypeGeoKey ?? keys.GeographicTypeGeoKey) as number | undefined;
  let spec = options.demCrs ?? null;
  if (spec === null) {
    if (code === undefined || code === USER_DEFINED) {
      throw new UsageError(`${path}: the DEM names no EPSG code in its GeoKeys${code === USER_DEFINED ? ' (its CRS is user-defined)' : ''}; give its CRS with --dem-crs`, 'dem');
    }
    spec = `EPSG:${code}`;
  }
  let fromLonLat: Dem['fromLonLat'];
  let crsLabel: string;
  try {
    crsLabel = resolveSourceCrs(spec).label;
    fromLonLat = lonLatToCrs(spec);
  } catch (error) {
    throw new UsageError(`${path}: the DEM's CRS ${spec}: ${(error as Error).message}`, 'dem');
  }
  const pixelX = Math.abs(resolution[0]), pixelY = Math.abs(resolution[1]);
  let westX = origin[0], northY = origin[1];
  if (keys.GTRasterTypeGeoKey === PIXEL_IS_POINT) {
    westX -= pixelX / 2;
    northY += pixelY / 2;
  }
  const raster = (await image.readRasters({ interleave: true })) as unknown as ArrayLike<number>;
  const nodata = image.getGDALNoData();
  const values = new Float32Array(width * height);
  let nodataPixels = 0;
  for (let i = 0; i < values.length; i++) {
    const v = raster[i];
    if (!Number.isFinite(v) || (nodata !== null && v === nodata)) { values[i] = NaN; nodataPixels++; } else values[i] = v;
  }
  // a pixel in degrees is about 111 km a degree north-south (common practice)
  const pixelM = fromLonLat === null ? pixelY * 111_000 : Math.min(pixelX, pixelY);
  return { path, sha256, grid: { width, height, westX, northY, pixelX, pixelY, values }, crsLabel, fromLonLat, pixelM, nodataPixels };
}
