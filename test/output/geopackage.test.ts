// The GeoPackage read back by GDAL, an independent reader: its layers, fields, feature counts and
// CRS, a layer converted back to GeoJSON with doab's own attributes, the R-tree indexes, GDAL's own
// validator; and the SLD styles parsed as XML, one rule per risk class, stored in layer_styles.
import Database from 'better-sqlite3';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { geopackageFile, writeGeopackage, GPKG_APPLICATION_ID, GPKG_USER_VERSION, type GeoPackageOptions } from '../../src/output/geopackage.js';
import { layerText, linesLayer, RANKING_COLUMNS, stripProperties, stripsLayer, transectsLayer } from '../../src/output/layers.js';
import { linesSld, stripsSld } from '../../src/output/sld.js';
import { LINE_COLOURS, STRIP_CLASSES, STRIP_STYLES } from '../../src/report/palette.js';
import { widthScaleTop } from '../../src/report/map-svg.js';
import type { ScreenResult } from '../../src/screening/screen.js';
import { DEMO_AQUIFER, DEMO_CANALS, screenFiles } from '../report/demo-result.js';
import { BRANCHING_LINES, BRANCHING_ZONES } from '../screening/branching-district.js';
import { screenLocal } from '../screening/local-district.js';

const hasGdal = spawnSync('ogrinfo', ['--version']).status === 0;
const VALIDATOR = '/usr/lib/python3/dist-packages/osgeo_utils/samples/validate_gpkg.py';

function gdalMissing(): boolean {
  if (hasGdal) return false;
  // under CI the reader must be there (.ci/run installs gdal-bin); elsewhere say why it was skipped
  expect(process.env.CI, 'ogrinfo (Debian gdal-bin) is missing').toBeFalsy();
  console.warn('skipped: ogrinfo (Debian gdal-bin) is not installed');
  return true;
}

function optionsFor(result: ScreenResult, runRecord = '{"tool":"doab","test":true}'): GeoPackageOptions {
  return {
    runRecord,
    startedAt: '2024-05-01T08:30:00.000Z',
    look: { strips: { classes: STRIP_CLASSES, styles: STRIP_STYLES }, lines: { colours: LINE_COLOURS, widthTopM3PerDayKm: widthScaleTop(result) } },
  };
}

function writeGpkg(result: ScreenResult, name: string): string {
  const path = join(mkdtempSync(join(tmpdir(), 'doab-gpkg-test-')), name);
  writeFileSync(path, '');
  writeGeopackage(path, result, optionsFor(result));
  return path;
}

const features = (pieces: Iterable<string>) => JSON.parse(layerText(pieces)).features as { properties: Record<string, unknown> }[];

/** ogrinfo's summary of every layer: feature count, fields and the CRS's EPSG code. */
function ogrSummary(path: string): Map<string, { count: number; fields: Map<string, string>; epsg: number | null }> {
  const text = execFileSync('ogrinfo', ['-ro', '-so', '-al', path], { encoding: 'utf8' });
  const layers = new Map<string, { count: number; fields: Map<string, string>; epsg: number | null }>();
  for (const block of text.split(/\nLayer name: /).slice(1)) {
    const name = block.split('\n')[0].trim();
    const count = Number(/Feature Count: (\d+)/.exec(block)?.[1]);
    const fields = new Map([...block.matchAll(/^(\S+): (\w+) \(/gm)].map((m) => [m[1], m[2]] as [string, string]).filter(([key]) => !/^(Geometry|Extent|Metadata|FID|Data)$/.test(key)));
    const ids = [...block.matchAll(/ID\["EPSG",(\d+)\]\]\s*$/gm)];
    layers.set(name, { count, fields, epsg: ids.length > 0 ? Number(ids[ids.length - 1][1]) : null });
  }
  return layers;
}

describe('GeoPackage of the demo (strips only, with transects)', () => {
  let result: ScreenResult;
  let path: string;
  beforeAll(async () => {
    ({ result } = await screenFiles(DEMO_CANALS, DEMO_AQUIFER, { stripsOnly: true, writeTransects: true }));
    path = writeGpkg(result, 'doab.gpkg');
  });

  it('is the same bytes when built again, and says it is a GeoPackage 1.3', () => {
    const again = writeGpkg(result, 'again.gpkg');
    expect(readFileSync(again).equals(readFileSync(path))).toBe(true);
    const db = new Database(path, { readonly: true });
    try {
      expect(db.pragma('application_id', { simple: true })).toBe(GPKG_APPLICATION_ID);
      expect(db.pragma('user_version', { simple: true })).toBe(GPKG_USER_VERSION);
      expect(readFileSync(path).subarray(68, 72).toString('latin1')).toBe('GPKG');
      // the run record as metadata of the whole GeoPackage
      const metadata = db.prepare('SELECT m.mime_type, m.metadata, r.reference_scope FROM gpkg_metadata m JOIN gpkg_metadata_reference r ON r.md_file_id = m.id').all();
      expect(metadata).toEqual([{ mime_type: 'application/json', metadata: '{"tool":"doab","test":true}', reference_scope: 'geopackage' }]);
      const srs = db.prepare('SELECT srs_id, organization, definition FROM gpkg_spatial_ref_sys ORDER BY srs_id').all() as { srs_id: number; definition: string }[];
      expect(srs.map((row) => row.srs_id)).toEqual([-1, 0, 4326, result.crs.epsg]);
      expect(srs[3].definition).toMatch(/^PROJCS\["WGS 84 \/ UTM zone \d+N"/);
    } finally {
      db.close();
    }
  });

  it('is built only when the writer reaches it, in the file it is given, with nothing beside it', () => {
    let built = 0;
    const counted = { ...optionsFor(result), get runRecord() {
      built++;
      return '{"tool":"doab","test":true}';
    } };
    const file = geopackageFile(result, counted);
    expect(built).toBe(0);
    const folder = mkdtempSync(join(tmpdir(), 'doab-gpkg-test-'));
    const target = join(folder, '.doab.gpkg.tmp');
    writeFileSync(target, '');
    file.buildAt(target);
    expect(built).toBe(1);
    expect(readFileSync(target).equals(readFileSync(path))).toBe(true);
    // no journal or other file of SQLite's left in the output folder
    expect(readdirSync(folder)).toEqual(['.doab.gpkg.tmp']);
  });

  it('opens in GDAL with the layers, fields, counts and CRS of the GeoJSON layers', () => {
    if (gdalMissing()) return;
    const layers = ogrSummary(path);
    expect([...layers.keys()].sort()).toEqual(['layer_styles', 'lines', 'ranking', 'strips', 'transects']);
    const expected = { strips: features(stripsLayer(result)), lines: features(linesLayer(result)), transects: features(transectsLayer(result)) };
    for (const [name, geojson] of Object.entries(expected)) {
      const layer = layers.get(name)!;
      expect(layer.count, name).toBe(geojson.length);
      expect(layer.count, name).toBeGreaterThan(0);
      const keys = new Set(geojson.flatMap((feature) => Object.keys(feature.properties)));
      expect(new Set([...layer.fields.keys()].filter((key) => key !== 'kind_used')), name).toEqual(keys);
      expect(layer.epsg, name).toBe(result.crs.epsg);
    }
    expect(layers.get('lines')!.fields.get('kind_used')).toBe('String');
    expect(layers.get('strips')!.fields.get('loss_a_m3_d')).toBe('Real');
    expect(layers.get('ranking')!.count).toBe(result.strips.length);
    expect([...layers.get('ranking')!.fields.keys()]).toEqual([...RANKING_COLUMNS]);
    expect(layers.get('ranking')!.fields.get('rank')).toBe('Integer64');
  });

  it('converts back to GeoJSON with doab\'s own attributes and positions', () => {
    if (gdalMissing()) return;
    const dir = mkdtempSync(join(tmpdir(), 'doab-gpkg-back-'));
    const strips = join(dir, 'strips.geojson'), lines = join(dir, 'lines.geojson');
    execFileSync('ogr2ogr', ['-f', 'GeoJSON', '-t_srs', 'EPSG:4326', '-lco', 'COORDINATE_PRECISION=7', strips, path, 'strips']);
    execFileSync('ogr2ogr', ['-f', 'GeoJSON', lines, path, 'lines']);
    const back = JSON.parse(readFileSync(strips, 'utf8')).features;
    const own = JSON.parse(layerText(stripsLayer(result))).features;
    expect(back.map((f: { properties: unknown }) => f.properties)).toEqual(result.strips.map(stripProperties));
    // back in lon/lat through GDAL's own projection, the rings lie where strips.geojson has them
    back.forEach((feature: { geometry: { coordinates: number[][][] } }, i: number) => {
      const ring = feature.geometry.coordinates[0], ownRing: number[][] = own[i].geometry.coordinates[0];
      expect(ring.length).toBe(ownRing.length);
      const ownSet = ownRing.map(([x, y]) => `${x.toFixed(5)},${y.toFixed(5)}`);
      for (const [x, y] of ring) expect(ownSet).toContain(`${x.toFixed(5)},${y.toFixed(5)}`);
    });
    const linesBack = JSON.parse(readFileSync(lines, 'utf8')).features.map((f: { properties: Record<string, unknown> }) => f.properties);
    const linesOwn: Record<string, unknown>[] = features(linesLayer(result)).map((f, i) => ({ ...f.properties, kind_used: result.lines[i].kind }));
    // a field some features lack comes back null on the others
    const withNulls = linesOwn.map((props) => Object.fromEntries(Object.keys(linesBack[0]).map((key) => [key, props[key] ?? null])));
    expect(linesBack).toEqual(withNulls);
  });

  it('has an R-tree per layer that GDAL finds, and passes GDAL\'s GeoPackage validator', () => {
    if (gdalMissing()) return;
    const summary = ogrSummary(path);
    for (const layer of ['strips', 'lines', 'transects']) {
      const sql = `SELECT HasSpatialIndex('${layer}', 'geom') AS has_index, (SELECT COUNT(*) FROM rtree_${layer}_geom) AS entries`;
      const text = execFileSync('ogrinfo', ['-ro', path, '-sql', sql], { encoding: 'utf8' });
      expect(text, layer).toMatch(/has_index \(Integer\) = 1/);
      expect(Number(/entries \(Integer\) = (\d+)/.exec(text)?.[1]), layer).toBe(summary.get(layer)!.count);
    }
    // a spatial filter (through the index) around one strip finds that strip
    const ring = result.strips[0].strip.ringM;
    const text = execFileSync('ogrinfo', ['-ro', '-q', path, 'strips', '-spat', String(ring[0] - 1), String(ring[1] - 1), String(ring[0] + 1), String(ring[1] + 1)], { encoding: 'utf8' });
    expect(text).toContain(`strip_id (String) = ${result.strips[0].stripId}`);
    if (existsSync(VALIDATOR)) {
      const check = spawnSync('/usr/bin/python3', [VALIDATOR, path], { encoding: 'utf8' });
      expect(check.status, check.stderr + check.stdout).toBe(0);
    }
  });

  it('holds the SLD styles, which parse as XML with one rule per risk class', () => {
    const look = optionsFor(result).look;
    const strips = stripsSld(look.strips), lines = linesSld(look.lines);
    expect(XMLValidator.validate(strips)).toBe(true);
    expect(XMLValidator.validate(lines)).toBe(true);
    const parser = new XMLParser({ ignoreAttributes: false, removeNSPrefix: true, isArray: (name) => ['Rule', 'PolygonSymbolizer', 'SvgParameter'].includes(name) });
    const stripRules = parser.parse(strips).StyledLayerDescriptor.NamedLayer.UserStyle.FeatureTypeStyle.Rule;
    expect(stripRules.map((rule: { Filter: { PropertyIsEqualTo: { Literal: string } } }) => rule.Filter.PropertyIsEqualTo.Literal)).toEqual([...STRIP_CLASSES]);
    stripRules.forEach((rule: { PolygonSymbolizer: { Fill: { SvgParameter?: { '#text': string }[] } }[] }, i: number) => {
      const style = STRIP_STYLES[STRIP_CLASSES[i]];
      expect(rule.PolygonSymbolizer[0].Fill.SvgParameter?.[0]['#text']).toBe(style.colour);
      // a hatch over the colour wherever the report draws one
      expect(rule.PolygonSymbolizer.length).toBe(style.hatch ? 2 : 1);
    });
    const lineRules = parser.parse(lines).StyledLayerDescriptor.NamedLayer.UserStyle.FeatureTypeStyle.Rule as object[];
    const dashed = lineRules.filter((rule) => JSON.stringify(rule).includes('stroke-dasharray'));
    expect(dashed.length).toBeGreaterThan(0);
    expect(dashed.every((rule) => JSON.stringify(rule).includes('"drain"'))).toBe(true);
    expect(lineRules.length - dashed.length).toBe(dashed.length);
    // the widths grow with loss per km
    const widths = (lineRules.slice(0, dashed.length) as { LineSymbolizer: { Stroke: { SvgParameter: { '@_name': string; '#text': number }[] } } }[])
      .map((rule) => rule.LineSymbolizer.Stroke.SvgParameter.find((p) => p['@_name'] === 'stroke-width')!['#text']);
    expect(widths).toEqual([...widths].sort((a, b) => a - b));
    expect(widths[widths.length - 1]).toBeGreaterThan(widths[0]);
    const db = new Database(path, { readonly: true });
    try {
      const rows = db.prepare('SELECT f_table_name, f_geometry_column, styleSLD, useAsDefault FROM layer_styles ORDER BY id').all();
      expect(rows).toEqual([
        { f_table_name: 'strips', f_geometry_column: 'geom', styleSLD: strips, useAsDefault: 1 },
        { f_table_name: 'lines', f_geometry_column: 'geom', styleSLD: lines, useAsDefault: 1 },
      ]);
    } finally {
      db.close();
    }
  });
});

describe('GeoPackage of a small local district', () => {
  it('has no transects unless asked, and the CRS of the layout', () => {
    const result = screenLocal(BRANCHING_LINES, BRANCHING_ZONES, { stripsOnly: true });
    const path = writeGpkg(result, 'local.gpkg');
    const db = new Database(path, { readonly: true });
    try {
      const tables = db.prepare("SELECT table_name, data_type, srs_id FROM gpkg_contents ORDER BY table_name").all();
      expect(tables).toEqual([
        { table_name: 'layer_styles', data_type: 'attributes', srs_id: null },
        { table_name: 'lines', data_type: 'features', srs_id: 32636 },
        { table_name: 'ranking', data_type: 'attributes', srs_id: null },
        { table_name: 'strips', data_type: 'features', srs_id: 32636 },
      ]);
      // the extent in gpkg_contents is the layer's, in metres of the work CRS
      const extent = db.prepare("SELECT min_x, max_x FROM gpkg_contents WHERE table_name = 'lines'").get() as { min_x: number; max_x: number };
      expect(extent.min_x).toBeCloseTo(300_000, 3);
      expect(extent.max_x).toBeCloseTo(303_000, 3);
    } finally {
      db.close();
    }
    if (gdalMissing()) return;
    const layers = ogrSummary(path);
    expect([...layers.keys()].sort()).toEqual(['layer_styles', 'lines', 'ranking', 'strips']);
    expect(layers.get('strips')!.count).toBe(features(stripsLayer(result)).length);
    expect(layers.get('lines')!.count).toBe(BRANCHING_LINES.length);
    expect(layers.get('lines')!.epsg).toBe(32636);
  });
});
