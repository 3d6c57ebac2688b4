// A real round trip through GDAL: the good district goes out through ogr2ogr as a shapefile in
// UTM zone 36N, a zipped shapefile, a GeoJSON with a legacy "crs" member and a GeoJSON text
// sequence, and comes back through doab's readers. GDAL (with PROJ) is the independent reference:
// it projects with its own code, doab's readers undo it with proj4js.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { zipSync } from 'fflate';
import { beforeAll, describe, expect, it } from 'vitest';
import { readFeatureFile, type InputFile } from '../../src/input/read-features.js';
import { freshDir, readJson, ROOT, runCli } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const hasOgr = spawnSync('ogr2ogr', ['--version']).status === 0;
const hasZip = spawnSync('zip', ['-v']).status === 0;
// an invented name with a letter outside ASCII, to show that the .cpg is honoured
const NON_ASCII_NAME = 'Kanal Süd-Ost';
// 1e-6 degrees is about 0.11 m of latitude (~111 km per degree [from memory]): far below what a
// screening at 100 m stations can notice, and far above the rounding of a double
const DEGREES_TOLERANCE = 1e-6;

it('has ogr2ogr under CI (Debian gdal-bin, installed by .ci/run)', () => {
  // elsewhere the round trip is skipped, and this test says why
  expect(hasOgr || !process.env.CI, 'ogr2ogr is missing').toBe(true);
});

function ogr(args: string[]): void {
  execFileSync('ogr2ogr', args, { stdio: ['ignore', 'ignore', 'pipe'] });
}

type Feature = { properties: Record<string, unknown>; geometry: { type: string; coordinates: any } };

/** A closed ring counter-clockwise, without its closing vertex, starting at a fixed corner. */
function normalisedRing(ring: number[][]): number[][] {
  let twiceArea = 0;
  for (let i = 0; i + 1 < ring.length; i++) twiceArea += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  // shapefiles store outer rings clockwise (ESRI Shapefile Technical Description, 1998 [published]), GeoJSON counter-clockwise
  const open = (twiceArea < 0 ? [...ring].reverse() : ring).slice(0, -1);
  // any weights without ties on these corners pick the same corner in both rings
  const key = ([lon, lat]: number[]) => lon + 0.37 * lat;
  const start = open.reduce((best, v, i) => (key(v) < key(open[best]) ? i : best), 0);
  return [...open.slice(start), ...open.slice(0, start)];
}

function positionsOf(feature: Feature): number[][][] {
  const g = feature.geometry;
  if (g.type === 'LineString') return [g.coordinates];
  if (g.type === 'Polygon') return g.coordinates.map(normalisedRing);
  throw new Error(`unexpected geometry ${g.type}`);
}

function expectSameGeometry(back: Feature, original: Feature): void {
  const a = positionsOf(back), b = positionsOf(original);
  expect(a.length).toBe(b.length);
  a.forEach((part, p) => {
    expect(part.length).toBe(b[p].length);
    part.forEach((position, v) => {
      expect(Math.abs(position[0] - b[p][v][0]), `part ${p} vertex ${v} lon`).toBeLessThan(DEGREES_TOLERANCE);
      expect(Math.abs(position[1] - b[p][v][1]), `part ${p} vertex ${v} lat`).toBeLessThan(DEGREES_TOLERANCE);
    });
  });
}

/** The DBF format keeps at most 10 characters of a field name (dBASE III [from memory]); GDAL truncates longer ones. */
const dbfName = (name: string) => name.slice(0, 10);

describe.skipIf(!hasOgr)('round trip through GDAL', () => {
  let dir: string;
  let source: { canals: string; aquifer: string };
  let original: { canals: Feature[]; aquifer: Feature[] };

  beforeAll(() => {
    dir = freshDir('roundtrip');
    const canals = readJson(join(PAIR, 'canals.geojson'));
    canals.features[0].properties.name = NON_ASCII_NAME;
    const aquifer = readJson(join(PAIR, 'aquifer.geojson'));
    source = { canals: join(dir, 'canals.geojson'), aquifer: join(dir, 'aquifer.geojson') };
    writeFileSync(source.canals, JSON.stringify(canals));
    writeFileSync(source.aquifer, JSON.stringify(aquifer));
    original = { canals: canals.features, aquifer: aquifer.features };
    mkdirSync(join(dir, 'shp'));
    for (const layer of ['canals', 'aquifer'] as const) {
      ogr(['-f', 'ESRI Shapefile', '-t_srs', 'EPSG:32636', '-lco', 'ENCODING=UTF-8', join(dir, 'shp', `${layer}.shp`), source[layer]]);
    }
  });

  describe('a shapefile in UTM zone 36N', () => {
    let back: { canals: InputFile; aquifer: InputFile };
    beforeAll(async () => {
      back = { canals: await readFeatureFile(join(dir, 'shp/canals.shp')), aquifer: await readFeatureFile(join(dir, 'shp/aquifer.shp')) };
    });

    it('was written with a .prj in metres and a UTF-8 .cpg', () => {
      expect(readFileSync(join(dir, 'shp/canals.cpg'), 'utf8').trim()).toBe('UTF-8');
      expect(readFileSync(join(dir, 'shp/canals.prj'), 'utf8')).toMatch(/UTM_Zone_36N/i);
      // the .shp holds metres: its header's Xmin (bytes 36-43, little-endian double: ESRI Shapefile Technical
      // Description, 1998 [published]) is an easting, far outside +-180
      expect(readFileSync(join(dir, 'shp/canals.shp')).readDoubleLE(36)).toBeGreaterThan(100_000);
      expect(back.canals.format).toBe('shapefile');
      expect(back.canals.sourceCrs).not.toBeNull();
      expect(back.canals.warnings).toEqual([]);
    });

    it('gives the same features and attributes (names cut to 10 characters by the DBF format)', () => {
      for (const layer of ['canals', 'aquifer'] as const) {
        const features = back[layer].features as Feature[];
        expect(features).toHaveLength(original[layer].length);
        features.forEach((feature, i) => {
          const expected = Object.fromEntries(Object.entries(original[layer][i].properties).map(([key, value]) => [dbfName(key), value]));
          expect(feature.properties).toEqual(expected);
        });
      }
      expect((back.canals.features[0] as Feature).properties.name).toBe(NON_ASCII_NAME);
      // recharge_mm_yr comes back as recharge_m: a shapefile user maps it with the config's fields.zones.recharge
      expect((back.aquifer.features[0] as Feature).properties).toHaveProperty('recharge_m', 0);
    });

    it('gives the geometry back in lon/lat within 1e-6 degrees', () => {
      for (const layer of ['canals', 'aquifer'] as const) {
        (back[layer].features as Feature[]).forEach((feature, i) => expectSameGeometry(feature, original[layer][i]));
      }
    });

    it('screens to the same seepage as the GeoJSON, within 0.1%', () => {
      const runs = [
        [source.canals, source.aquifer],
        [join(dir, 'shp/canals.shp'), join(dir, 'shp/aquifer.shp')],
      ].map(([canals, aquifer]) => {
        const out = freshDir('roundtrip-out');
        const run = runCli(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--quiet']);
        expect(run.status, run.stderr).toBe(0);
        return readJson(join(out, 'strips.geojson')).features.map((f: Feature) => f.properties);
      });
      const [fromGeoJson, fromShapefile] = runs;
      expect(fromShapefile).toHaveLength(fromGeoJson.length);
      expect(fromGeoJson.length).toBeGreaterThan(0);
      fromGeoJson.forEach((strip: Record<string, number>, i: number) => {
        expect(fromShapefile[i].line_a).toBe(strip.line_a);
        expect(Math.abs(fromShapefile[i].q_a_m2_d / strip.q_a_m2_d - 1)).toBeLessThan(0.001);
        expect(Math.abs(fromShapefile[i].loss_a_m3_d / strip.loss_a_m3_d - 1)).toBeLessThan(0.001);
      });
    });
  });

  it('reads a zipped shapefile like the shapefile itself', async () => {
    const zipPath = join(dir, 'canals.zip');
    const parts = readdirSync(join(dir, 'shp')).filter((name) => name.startsWith('canals.'));
    expect(parts.sort()).toEqual(['canals.cpg', 'canals.dbf', 'canals.prj', 'canals.shp', 'canals.shx']);
    if (hasZip) execFileSync('zip', ['-q', '-j', '-X', zipPath, ...parts.map((name) => join(dir, 'shp', name))]);
    else writeFileSync(zipPath, zipSync(Object.fromEntries(parts.map((name) => [name, new Uint8Array(readFileSync(join(dir, 'shp', name)))]))));
    const zipped = await readFeatureFile(zipPath);
    const plain = await readFeatureFile(join(dir, 'shp/canals.shp'));
    expect(zipped.format).toBe('zipped-shapefile');
    expect(zipped.features).toEqual(plain.features);
    expect(zipped.sourceCrs).toBe(plain.sourceCrs);
    // the same parts hashed in the same order, whatever holds them
    expect(zipped.sha256).toBe(plain.sha256);
  });

  it('reads a GeoJSON with a legacy "crs" member (EPSG:32636) back to lon/lat', async () => {
    const path = join(dir, 'canals-utm.geojson');
    ogr(['-f', 'GeoJSON', '-t_srs', 'EPSG:32636', path, source.canals]);
    const written = readJson(path);
    // GDAL writes the 2008 GeoJSON draft's named CRS for anything but lon/lat
    expect(written.crs).toEqual({ type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32636' } });
    expect(Math.abs(written.features[0].geometry.coordinates[0][0])).toBeGreaterThan(1000);
    const back = await readFeatureFile(path);
    expect(back.format).toBe('geojson');
    expect(back.sourceCrs).toBe('EPSG:32636');
    expect(back.features).toHaveLength(original.canals.length);
    (back.features as Feature[]).forEach((feature, i) => {
      expect(feature.properties).toEqual(original.canals[i].properties);
      expectSameGeometry(feature, original.canals[i]);
    });
  });

  it('reads a GeoJSON text sequence written by GDAL', async () => {
    const path = join(dir, 'canals.geojsons');
    ogr(['-f', 'GeoJSONSeq', path, source.canals]);
    // RFC 8142: each record starts with the record separator
    expect(readFileSync(path, 'utf8').startsWith('\u001e')).toBe(true);
    const back = await readFeatureFile(path);
    expect(back.format).toBe('geojson-seq');
    expect(back.features).toHaveLength(original.canals.length);
    (back.features as Feature[]).forEach((feature, i) => {
      expect(feature.properties).toEqual(original.canals[i].properties);
      expectSameGeometry(feature, original.canals[i]);
    });
  });
});
