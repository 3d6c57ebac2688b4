// Reading a DEM (GeoTIFF) and sampling it: a synthetic tilted plane written in the test reads back
// exactly (bilinear is exact on a plane), in the work CRS and in lon/lat; GDAL's gdallocationinfo
// reads the same pixel values (an independent reader); nodata, no georeferencing and no CRS are named.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeArrayBuffer } from 'geotiff';
import { describe, expect, it } from 'vitest';
import { groundSampler, sampleDem } from '../../src/geometry/dem.js';
import { readDem } from '../../src/input/read-dem.js';
import { DataError, UsageError } from '../../src/shared/errors.js';

const hasGdal = spawnSync('gdallocationinfo', ['--version']).status === 0;
const dir = mkdtempSync(join(tmpdir(), 'doab-dem-'));

/** A north-up GeoTIFF of `f(x, y)` at pixel centres; GeoKeys as the GeoTIFF 1.0 specification (Ritter and Ruth, 1995) names them [published]. */
function writeDem(name: string, width: number, height: number, west: number, north: number, pixel: number, f: (x: number, y: number) => number, keys: Record<string, unknown>): string {
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) values[r * width + c] = f(west + (c + 0.5) * pixel, north - (r + 0.5) * pixel);
  const buffer = writeArrayBuffer(values, {
    width,
    height,
    BitsPerSample: [32],
    SampleFormat: [3],
    ModelPixelScale: [pixel, pixel, 0],
    ModelTiepoint: [0, 0, 0, west, north, 0],
    GTRasterTypeGeoKey: 1,
    GDAL_NODATA: '-9999',
    ...keys,
  } as unknown as Parameters<typeof writeArrayBuffer>[1]);
  const path = join(dir, name);
  writeFileSync(path, new Uint8Array(buffer));
  return path;
}

const E0 = 300_000, N0 = 3_265_000;
const plane = (x: number, y: number) => 150 + 0.002 * (x - E0) - 0.001 * (y - N0);

describe('a DEM', () => {
  const path = writeDem('plane-utm.tif', 60, 40, E0 - 100, N0 + 300, 10, plane, { GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32636, ProjLinearUnitsGeoKey: 9001 });

  it('reads a tilted plane back exactly anywhere between pixel centres', async () => {
    const dem = await readDem(path, { maxInputMB: 100 });
    expect(dem.crsLabel).toBe('EPSG:32636');
    expect(dem.grid.width).toBe(60);
    for (const [x, y] of [[E0, N0], [E0 + 123.4, N0 + 56.7], [E0 + 400, N0 - 50]]) {
      // the plane at float32 precision
      expect(sampleDem(dem.grid, x, y)).toBeCloseTo(plane(x, y), 4);
    }
    expect(sampleDem(dem.grid, E0 - 500, N0)).toBeNaN();
  });

  it('reads the same pixel values as GDAL', async () => {
    if (!hasGdal) {
      expect(process.env.CI, 'gdallocationinfo (Debian gdal-bin) is missing').toBeFalsy();
      return;
    }
    const dem = await readDem(path, { maxInputMB: 100 });
    for (const [c, r] of [[0, 0], [17, 5], [59, 39]]) {
      const gdal = Number(execFileSync('gdallocationinfo', ['-valonly', path, String(c), String(r)], { encoding: 'utf8' }).trim());
      const x = dem.grid.westX + (c + 0.5) * dem.grid.pixelX, y = dem.grid.northY - (r + 0.5) * dem.grid.pixelY;
      // GDAL prints 15 significant digits of the float32 pixel
      expect(sampleDem(dem.grid, x, y)).toBeCloseTo(gdal, 9);
    }
  });

  it('in lon/lat, samples the same ground at a work-CRS point as the projected one', async () => {
    // a plane in lon/lat degrees, read where a point of UTM zone 36N falls
    const proj4 = (await import('proj4')).default;
    const toLonLat = proj4('+proj=utm +zone=36 +datum=WGS84 +units=m +no_defs', '+proj=longlat +datum=WGS84 +no_defs');
    const [lon, lat] = toLonLat.forward([E0 + 250, N0 - 120]);
    const lonLatPlane = (lo: number, la: number) => 150 + 200 * (lo - lon) - 100 * (la - lat);
    const geographic = writeDem('plane-lonlat.tif', 80, 80, lon - 0.04, lat + 0.04, 0.001, lonLatPlane, { GTModelTypeGeoKey: 2, GeographicTypeGeoKey: 4326 });
    const dem = await readDem(geographic, { maxInputMB: 100 });
    expect(dem.fromLonLat).toBeNull();
    const sampler = groundSampler(dem.grid, (x, y) => toLonLat.forward([x, y]) as [number, number], dem.pixelM);
    expect(sampler.at(E0 + 250, N0 - 120)).toBeCloseTo(lonLatPlane(lon, lat), 3);
    expect(sampler.at(E0 + 900, N0 + 700)).toBeCloseTo(lonLatPlane(...(toLonLat.forward([E0 + 900, N0 + 700]) as [number, number])), 3);
  });

  it('names a DEM with no CRS, one without georeferencing, and one that is no GeoTIFF', async () => {
    // user-defined (32767): a CRS the GeoKeys describe without a code (GeoTIFF 1.0 specification, Ritter and Ruth, 1995 [published])
    const noCrs = writeDem('no-crs.tif', 4, 4, E0, N0, 10, plane, { GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32767 });
    await expect(readDem(noCrs, { maxInputMB: 100 })).rejects.toThrow(UsageError);
    await expect(readDem(noCrs, { maxInputMB: 100 })).rejects.toThrow(/no-crs\.tif: the DEM names no EPSG code in its GeoKeys \(its CRS is user-defined\); give its CRS with --dem-crs/);
    const withCrs = await readDem(noCrs, { maxInputMB: 100, demCrs: 'EPSG:32636' });
    expect(withCrs.crsLabel).toBe('EPSG:32636');
    const text = join(dir, 'not.tif');
    writeFileSync(text, 'hello');
    await expect(readDem(text, { maxInputMB: 100 })).rejects.toThrow(DataError);
    await expect(readDem(text, { maxInputMB: 100 })).rejects.toThrow(/not\.tif: not a GeoTIFF that can be read/);
  });

  it('leaves nodata pixels out: NaN next to them', async () => {
    const holed = writeDem('holed.tif', 10, 10, E0, N0 + 100, 10, (x, y) => (x > E0 + 40 && x < E0 + 60 && y > N0 + 40 && y < N0 + 60 ? -9999 : plane(x, y)), { GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32636 });
    const dem = await readDem(holed, { maxInputMB: 100 });
    expect(dem.nodataPixels).toBe(4);
    expect(sampleDem(dem.grid, E0 + 50, N0 + 50)).toBeNaN();
    expect(sampleDem(dem.grid, E0 + 15, N0 + 15)).toBeCloseTo(plane(E0 + 15, N0 + 15), 4);
  });
});
