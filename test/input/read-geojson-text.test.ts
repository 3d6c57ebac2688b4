// GeoJSON text as files hold it: text sequences in both framings of RFC 8142 practice (records
// led by RS, or one feature per line), Windows line ends, a byte order mark, and broken records.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DataError } from '../../src/shared/errors.js';
import { readFeatureFile } from '../../src/input/read-features.js';
import { parseGeoJsonText } from '../../src/input/read-geojson.js';

const ROOT = join(import.meta.dirname, '../..');
const CANALS = readFileSync(join(ROOT, 'test/fixtures/screen/parallel-pair/canals.geojson'), 'utf8');
const FEATURES: unknown[] = JSON.parse(CANALS).features;
const RS = '\u001e';

/** The DataError message parseGeoJsonText throws, or null when it reads the text. */
function problemOf(path: string, text: string): string | null {
  try {
    parseGeoJsonText(path, text);
    return null;
  } catch (error) {
    expect(error).toBeInstanceOf(DataError);
    return (error as Error).message;
  }
}

describe('GeoJSON text sequences', () => {
  it('reads RS-led records and one feature per line alike, with LF or CRLF line ends', () => {
    const rs = FEATURES.map((f) => `${RS}${JSON.stringify(f)}\n`).join('');
    const lf = FEATURES.map((f) => `${JSON.stringify(f)}\n`).join('');
    const crlf = FEATURES.map((f) => `${JSON.stringify(f)}\r\n`).join('');
    for (const [path, text] of [['a.geojsons', rs], ['a.json', rs], ['a.geojsonl', lf], ['a.ndjson', crlf]]) {
      const parsed = parseGeoJsonText(path, text);
      expect(parsed.sequence, path).toBe(true);
      expect(parsed.features, path).toEqual(FEATURES);
    }
  });

  it('takes the features of a record that is a whole FeatureCollection', () => {
    const text = `${RS}${JSON.stringify({ type: 'FeatureCollection', features: FEATURES })}\n${RS}${JSON.stringify(FEATURES[0])}\n`;
    expect(parseGeoJsonText('a.geojsons', text).features).toEqual([...FEATURES, FEATURES[0]]);
  });

  it('names the file and a record number for a broken record', () => {
    const records = FEATURES.map((f) => JSON.stringify(f));
    records[1] = records[1].slice(0, 50);
    expect(problemOf('lines.geojsons', records.map((r) => `${RS}${r}\n`).join(''))).toMatch(/^lines\.geojsons: record \d+ of the GeoJSON text sequence is not valid JSON/);
    expect(problemOf('lines.geojsonl', records.map((r) => `${r}\n`).join(''))).toMatch(/^lines\.geojsonl: record \d+ of the GeoJSON text sequence is not valid JSON/);
  });

  // records count from 0 whichever way they are framed, as features do everywhere else
  it('gives the same broken record the same number in both framings', () => {
    const records = FEATURES.map((f) => JSON.stringify(f));
    records[1] = records[1].slice(0, 50);
    const number = (message: string | null) => /record (\d+)/.exec(message ?? '')?.[1];
    const rs = number(problemOf('lines.geojsons', records.map((r) => `${RS}${r}\n`).join('')));
    const lf = number(problemOf('lines.geojsonl', records.map((r) => `${r}\n`).join('')));
    expect(rs).toBeDefined();
    expect(rs).toBe(lf);
  });
});

describe('a UTF-8 byte order mark', () => {
  // RFC 8259 section 8.1: JSON text must not begin with a BOM, but a parser may ignore one
  // [published]; spreadsheet and desktop exports on Windows often write it
  it('is ignored at the start of a GeoJSON file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'doab-bom-'));
    const path = join(dir, 'canals.geojson');
    writeFileSync(path, Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(CANALS)]));
    const file = await readFeatureFile(path);
    expect(file.features).toEqual(FEATURES);
  });
});

describe('a source CRS written as WKT is named, with its EPSG code where it carries one', () => {
  it('reads the name and the authority of the whole CRS', async () => {
    const { wktLabel } = await import('../../src/input/source-crs.js');
    // an ESRI-style .prj (no authority) and an OGC WKT1 with one, as GDAL writes them (OGC 01-009, WKT1 [published])
    expect(wktLabel('PROJCS["WGS_1984_UTM_Zone_43N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]]],PROJECTION["Transverse_Mercator"],UNIT["Meter",1.0]]')).toBe('WKT: WGS_1984_UTM_Zone_43N');
    expect(wktLabel('PROJCS["WGS 84 / UTM zone 43N",GEOGCS["WGS 84",AUTHORITY["EPSG","4326"]],UNIT["metre",1,AUTHORITY["EPSG","9001"]],AUTHORITY["EPSG","32643"]]')).toBe('WKT: WGS 84 / UTM zone 43N (EPSG:32643)');
  });
});
