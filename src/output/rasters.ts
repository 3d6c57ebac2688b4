// The district solve's rasters as GeoTIFF in the work CRS: the water table (m) and its depth below
// ground (m), one band of 32-bit floats, north-up, nodata outside the aquifer. Same result in,
// same bytes out (geotiff.js writes no date).
import { writeArrayBuffer } from 'geotiff';
import type { DistrictResult } from '../screening/district.js';
import type { WorkCrs } from '../geometry/work-crs.js';

/** Written where a cell holds no aquifer (GDAL_NODATA). */
export const RASTER_NODATA = -9999;
export const RASTER_NAMES = { waterTable: 'water-table.tif', depth: 'depth.tif' } as const;

// GeoTIFF 1.0 specification (N. Ritter, M. Ruth, 1995) [published]: model type 1 projected,
// raster type 1 pixel-is-area, 32767 user-defined, linear unit 9001 metre (EPSG).
const MODEL_PROJECTED = 1;
const RASTER_PIXEL_IS_AREA = 1;
const USER_DEFINED = 32767;
const LINEAR_METRE = 9001;

/** Rows from north to south as TIFF stores them (the grid's row 0 is the southernmost). */
function northUp(values: Float64Array, columns: number, rows: number): Float32Array {
  const out = new Float32Array(columns * rows);
  for (let row = 0; row < rows; row++) {
    const from = (rows - 1 - row) * columns;
    for (let col = 0; col < columns; col++) {
      const v = values[from + col];
      out[row * columns + col] = Number.isFinite(v) ? v : RASTER_NODATA;
    }
  }
  return out;
}

/** One raster as GeoTIFF bytes. A work CRS without an EPSG code (a proj4 string) is written user-defined, with the proj4 text as its citation. */
export function geoTiff(values: Float64Array, district: DistrictResult, crs: WorkCrs): Uint8Array {
  const { columns, rows, originX, originY, cellM } = district.grid;
  const crsKeys = crs.epsg !== null
    ? { ProjectedCSTypeGeoKey: crs.epsg }
    : { ProjectedCSTypeGeoKey: USER_DEFINED, GTCitationGeoKey: `user-defined work CRS, no EPSG code: ${crs.proj4Def}` };
  const pixelBytes = columns * rows * 4;
  // geotiff.js writes every pixel through a DataView of its own (about half a second a million
  // pixels), so it writes the tags, sized for the whole image, around one pixel, and the pixels go
  // after them here: one strip, big-endian 32-bit floats, as its header declares
  const buffer = writeArrayBuffer(Float32Array.of(0), {
    width: columns,
    height: rows,
    BitsPerSample: [32],
    SampleFormat: [3],
    SamplesPerPixel: [1],
    StripByteCounts: [pixelBytes],
    ModelPixelScale: [cellM, cellM, 0],
    ModelTiepoint: [0, 0, 0, originX, originY + rows * cellM, 0],
    GTModelTypeGeoKey: MODEL_PROJECTED,
    GTRasterTypeGeoKey: RASTER_PIXEL_IS_AREA,
    ProjLinearUnitsGeoKey: LINEAR_METRE,
    ...crsKeys,
    GDAL_NODATA: `${RASTER_NODATA}`,
  // geotiff.js writes every GeoKey it knows by name; its type lists only some of them
  } as unknown as Parameters<typeof writeArrayBuffer>[1]);
  const header = new Uint8Array(buffer, 0, buffer.byteLength - 4);
  if (header[0] !== 0x4d || header[1] !== 0x4d || new DataView(buffer).getUint32(4) !== 8) throw new Error('Unexpected TIFF header from geotiff.js: not big-endian with the first directory at byte 8.');
  const out = new Uint8Array(header.length + pixelBytes);
  out.set(header);
  const view = new DataView(out.buffer, header.length);
  const pixels = northUp(values, columns, rows);
  for (let i = 0; i < pixels.length; i++) view.setFloat32(4 * i, pixels[i], false);
  return out;
}

/** The two rasters of a run with the district solve, by file name. */
export function districtRasters(district: DistrictResult, crs: WorkCrs): { name: string; content: Uint8Array }[] {
  return [
    { name: RASTER_NAMES.waterTable, content: geoTiff(district.waterTableM, district, crs) },
    { name: RASTER_NAMES.depth, content: geoTiff(district.depthM, district, crs) },
  ];
}
