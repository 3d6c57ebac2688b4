// The district solve's GeoTIFFs read back by GDAL, an independent reader: size, CRS, nodata, and
// the value doab holds at a cell; and a run's files byte for byte the same on a rerun.
import { execFileSync, spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, runCliInProcess } from '../cli/run-cli.js';
import { RASTER_NODATA } from '../../src/output/rasters.js';
import { BRANCHING_LINES, BRANCHING_ZONES } from '../screening/branching-district.js';
import { box, screenLocal } from '../screening/local-district.js';

// a zone apart from the others, which no line reaches: no water table there, nodata in the rasters
const WITH_ISLAND = [...BRANCHING_ZONES, box('island', { k_m_d: 5, base_m: 90, ground_m: 106, recharge_mm_yr: 0 }, [3400, 0, 3600, 400])];

const hasGdal = spawnSync('gdalinfo', ['--version']).status === 0;

async function screenBranching(dir: string, extra: string[] = [], zones = BRANCHING_ZONES) {
  const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson');
  writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: BRANCHING_LINES }));
  writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zones }));
  const out = join(dir, 'out');
  const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--crs', 'EPSG:32636', '--quiet', ...extra]);
  expect(run.status, run.stderr).toBe(0);
  return out;
}

describe('district rasters', () => {
  it('are the same bytes on a rerun, as every other file of the run', async () => {
    const dir = freshDir('rasters-rerun');
    const first = await screenBranching(dir);
    const files = readdirSync(first).sort();
    expect(files).toContain('depth.tif');
    expect(files).toContain('water-table.tif');
    // the run record, the report and the GeoPackage (which holds the record) say when the run
    // started: that and nothing else may differ (the GeoPackage's bytes read as latin1, one to one)
    const stamps = (text: string) => text.replace(/\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d+Z/g, 'START').replace(/\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/g, 'START');
    const unstamped = (name: string, bytes: Buffer) =>
      name === 'run.json' || name === 'report.html'
        ? Buffer.from(stamps(bytes.toString('utf8')))
        : name === 'doab.gpkg'
          ? Buffer.from(stamps(bytes.toString('latin1')), 'latin1')
          : bytes;
    const bytes = files.map((name) => unstamped(name, readFileSync(join(first, name))));
    const second = await screenBranching(dir);
    files.forEach((name, i) => expect(unstamped(name, readFileSync(join(second, name))).equals(bytes[i]), name).toBe(true));
    const record = JSON.parse(readFileSync(join(first, 'run.json'), 'utf8'));
    expect(record.outputs).toEqual(expect.arrayContaining(['depth.tif', 'water-table.tif']));
    expect(record.district_solve.ran).toBe(true);
    expect(Math.abs(record.district_solve.water_balance.residual_relative)).toBeLessThan(1e-6);
  });

  it('open in GDAL with the grid, the CRS and the nodata of the solve, and its value at a cell', async () => {
    if (!hasGdal) {
      // under CI the reader must be there (.ci/run installs gdal-bin); elsewhere say why it was skipped
      expect(process.env.CI, 'gdalinfo (Debian gdal-bin) is missing').toBeFalsy();
      console.warn('skipped: gdalinfo (Debian gdal-bin) is not installed');
      return;
    }
    const out = await screenBranching(freshDir('rasters-gdal'), [], WITH_ISLAND);
    const result = screenLocal(BRANCHING_LINES, WITH_ISLAND);
    expect(result.warnings.join('\n')).toMatch(/ha of aquifer reach no line and were left out/);
    const district = result.district!;
    const { grid } = district;
    for (const [name, values] of [['depth.tif', district.depthM], ['water-table.tif', district.waterTableM]] as const) {
      const info = JSON.parse(execFileSync('gdalinfo', ['-json', join(out, name)], { encoding: 'utf8' }));
      expect(info.size).toEqual([grid.columns, grid.rows]);
      expect(info.coordinateSystem.wkt).toMatch(/WGS 84 \/ UTM zone 36N/);
      expect(info.coordinateSystem.wkt).toMatch(/ID\["EPSG",32636\]\]$/);
      expect(info.bands[0].noDataValue).toBe(RASTER_NODATA);
      expect(info.bands[0].type).toBe('Float32');
      // north-up, the grid's west and north edges at the top-left corner
      expect(info.geoTransform).toEqual([grid.originX, grid.cellM, 0, grid.originY + grid.rows * grid.cellM, 0, -grid.cellM]);
      // a free cell a third of the way in, read at its centre in the work CRS
      const row = Math.floor(grid.rows / 3), col = Math.floor(grid.columns / 3);
      const x = grid.originX + (col + 0.5) * grid.cellM, y = grid.originY + (row + 0.5) * grid.cellM;
      const read = Number(execFileSync('gdallocationinfo', ['-valonly', '-geoloc', join(out, name), String(x), String(y)], { encoding: 'utf8' }).trim());
      expect(read).toBeCloseTo(Math.fround(values[row * grid.columns + col]), 4);
    }
    // between the zones and on the island no line reaches: nodata, as doab holds no water table there
    for (const xLocal of [3300, 3500]) {
      const x = 300_000 + xLocal, y = 3_265_000 + 200;
      const read = Number(execFileSync('gdallocationinfo', ['-valonly', '-geoloc', join(out, 'depth.tif'), String(x), String(y)], { encoding: 'utf8' }).trim());
      expect(read).toBe(RASTER_NODATA);
      const col = Math.floor((x - grid.originX) / grid.cellM), row = Math.floor((y - grid.originY) / grid.cellM);
      expect(district.depthM[row * grid.columns + col]).toBeNaN();
    }
  });

  it('are written without an EPSG code for a proj4 work CRS, and the run says so', async () => {
    const out = await screenBranching(freshDir('rasters-proj4'), ['--crs', '+proj=tmerc +lat_0=0 +lon_0=33 +k=0.9996 +x_0=500000 +y_0=0 +datum=WGS84 +units=m +no_defs']);
    const record = JSON.parse(readFileSync(join(out, 'run.json'), 'utf8'));
    expect(record.warnings.join('\n')).toMatch(/rasters .* no EPSG code/);
    if (!hasGdal) return;
    const info = JSON.parse(execFileSync('gdalinfo', ['-json', join(out, 'depth.tif')], { encoding: 'utf8' }));
    expect(info.size[0]).toBeGreaterThan(0);
    expect(info.coordinateSystem?.wkt ?? '').not.toMatch(/ID\["EPSG",\d+\]\]$/);
  });
});
