// GeoJSON read as a stream: a FeatureCollection larger than the longest text JavaScript can hold
// (generated here, in a temporary folder, never committed), RFC 8142 sequences whose records and
// characters fall across the reader's pieces, and every GeoJSON file the project ships read exactly
// as JSON.parse reads it.
import { constants } from 'node:buffer';
import { createHash } from 'node:crypto';
import { closeSync, mkdtempSync, openSync, readdirSync, readFileSync, rmSync, statfsSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readFeatureFile, streamGeoJsonFile } from '../../src/input/read-features.js';
import { parseGeoJsonText } from '../../src/input/read-geojson.js';

const ROOT = join(import.meta.dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'doab-stream-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// just past what one JavaScript string can hold (2^29 - 24 UTF-16 units on Node 20's V8)
const LARGE_BYTES = constants.MAX_STRING_LENGTH + 8 * 1024 * 1024;
const freeBytes = (() => {
  const stats = statfsSync(dir);
  return stats.bavail * stats.bsize;
})();
const roomForLarge = freeBytes > LARGE_BYTES + 256 * 1024 * 1024;
if (!roomForLarge) console.warn(`skipped: the FeatureCollection past the string limit needs ${(LARGE_BYTES / 2 ** 20).toFixed(0)} MiB in ${tmpdir()}, which has ${(freeBytes / 2 ** 20).toFixed(0)} MiB free`);

// real lines, attributes and layout; the long note and the indentation keep the tokenizing (the
// slow part, ~20 MB/s for coordinates) to a few seconds
const POSITIONS = 40;
const NOTE = 'reach silted, lining planned after the kharif season; '.repeat(170);
// indentation as pretty-printing writers put it, between features
const INDENT = `\n${' '.repeat(8000)}`;

/** Feature i of the large collection, in three parts (the middle one the same for all): a line of 40 positions, an id, a stage and a long note. */
function featureParts(i: number): [string, string, string] {
  let coordinates = '';
  for (let k = 0; k < POSITIONS; k++) coordinates += `${k ? ',' : ''}[${(30 + i * 1e-4 + k * 1e-5).toFixed(7)},${(29 + k * 1e-5).toFixed(7)}]`;
  return [`{"type":"Feature","properties":{"id":"c${i}","kind":"canal","stage_m":${(100 + (i % 97) / 4).toFixed(2)},"notes":"`, NOTE, `"},"geometry":{"type":"LineString","coordinates":[${coordinates}]}}`];
}
const featureText = (i: number) => featureParts(i).join('');

/** Writes the collection until it passes `bytes`; gives its feature count and SHA-256. */
function writeLargeCollection(path: string, bytes: number): { count: number; sha256: string; size: number } {
  const fd = openSync(path, 'w');
  const hash = createHash('sha256');
  const between = Buffer.from(`${INDENT}`);
  const note = Buffer.from(NOTE);
  let size = 0, count = 0, pending: Buffer[] = [], pendingBytes = 0;
  const put = (buffer: Buffer) => {
    pending.push(buffer);
    pendingBytes += buffer.length;
    size += buffer.length;
  };
  const flush = () => {
    const block = Buffer.concat(pending, pendingBytes);
    writeSync(fd, block);
    hash.update(block);
    pending = [];
    pendingBytes = 0;
  };
  put(Buffer.from('{"type":"FeatureCollection","name":"canals","features":['));
  while (size < bytes) {
    const [head, , tail] = featureParts(count);
    put(Buffer.from(`${count++ ? ',' : ''}`));
    put(between);
    put(Buffer.from(head));
    put(note);
    put(Buffer.from(tail));
    if (pendingBytes > 8_000_000) flush();
  }
  put(Buffer.from('\n]}\n'));
  flush();
  closeSync(fd);
  return { count, sha256: hash.digest('hex'), size };
}

describe('a FeatureCollection larger than a JavaScript string', () => {
  it.skipIf(!roomForLarge)('is read feature by feature: count, values and hash as written', () => {
    const path = join(dir, 'large.geojson');
    const started = performance.now();
    const written = writeLargeCollection(path, LARGE_BYTES);
    const generatedMs = performance.now() - started;
    expect(statSync(path).size).toBe(written.size);
    expect(written.size).toBeGreaterThan(constants.MAX_STRING_LENGTH);

    const wanted = new Set([0, 1, Math.floor(written.count / 2), written.count - 1]);
    const seen = new Map<number, any>();
    let count = 0, lastIndex = -1, positions = 0;
    const read = streamGeoJsonFile(path, (feature: any, index) => {
      expect(index).toBe(lastIndex + 1);
      lastIndex = index;
      count++;
      positions += feature.geometry.coordinates.length;
      if (wanted.has(index)) seen.set(index, feature);
    }, { maxInputMB: 1024 });
    const readMs = performance.now() - started - generatedMs;
    console.log(`${(written.size / 2 ** 20).toFixed(0)} MiB, ${count} features: written in ${(generatedMs / 1000).toFixed(1)} s, read in ${(readMs / 1000).toFixed(1)} s`);

    expect(read).toEqual({ format: 'geojson', sha256: written.sha256, bytes: written.size, declaredCrs: null, featureCount: written.count });
    expect(count).toBe(written.count);
    expect(positions).toBe(written.count * POSITIONS);
    for (const index of wanted) expect(seen.get(index), `feature ${index}`).toEqual(JSON.parse(featureText(index)));
    const middle = seen.get(Math.floor(written.count / 2));
    expect(middle.properties.id).toBe(`c${Math.floor(written.count / 2)}`);
    expect(middle.geometry.coordinates[30][1]).toBeCloseTo(29.0003, 12);
  }, 120_000);

  it('is refused past the input budget before a byte is read', () => {
    const path = join(dir, 'budget.geojson');
    writeFileSync(path, `{"type":"FeatureCollection","features":[${featureText(0)}]}`);
    expect(() => streamGeoJsonFile(path, () => undefined, { maxInputMB: 0.001 })).toThrow(/is 0 MB, more than the 0\.001 MB an input may be/);
  });
});

describe('RFC 8142 sequences read record by record', () => {
  // names in several scripts, so that characters of two to four bytes fall across the 4 MiB pieces
  const names = ['Nahr al-Ḥasan', 'نهر الحسن', 'Kanal Süd', 'नहर', '運河 🌊'];
  const features = Array.from({ length: 30_000 }, (_, i) => ({
    type: 'Feature',
    properties: { id: `s${i}`, name: names[i % names.length], stage_m: 100 + (i % 13) / 8, note: 'x'.repeat(i % 500) },
    geometry: { type: 'LineString', coordinates: [[30 + i * 1e-4, 29], [30 + i * 1e-4, 29.01]] },
  }));

  it('RS-led records spanning lines, and a record that is a whole collection, across many pieces', () => {
    const path = join(dir, 'canals.geojsons');
    const records = features.slice(0, 20_000).map((feature, i) => `\u001e${JSON.stringify(feature, null, i % 3 === 0 ? 2 : undefined)}\n`);
    records.push(`\u001e${JSON.stringify({ type: 'FeatureCollection', features: features.slice(20_000) })}\n`);
    writeFileSync(path, records.join(''));
    expect(statSync(path).size).toBeGreaterThan(3 * 4 * 2 ** 20);
    const read: unknown[] = [];
    const result = streamGeoJsonFile(path, (feature) => void read.push(feature));
    expect(result.format).toBe('geojson-seq');
    expect(result.featureCount).toBe(features.length);
    expect(read).toEqual(features);
  });

  it('one feature per line with CRLF line ends; the same features as the whole text gives', () => {
    const path = join(dir, 'canals.geojsonl');
    writeFileSync(path, features.map((feature) => `${JSON.stringify(feature)}\r\n`).join(''));
    const read: unknown[] = [];
    streamGeoJsonFile(path, (feature) => void read.push(feature));
    expect(read).toEqual(features);
    expect(read).toEqual(parseGeoJsonText(path, readFileSync(path, 'utf8')).features);
  });

  it('a broken record deep in a large file is named by its number', () => {
    const path = join(dir, 'broken.geojsonl');
    const lines = features.map((feature) => JSON.stringify(feature));
    lines[25_000] = lines[25_000].slice(0, 40);
    writeFileSync(path, lines.join('\n'));
    expect(() => streamGeoJsonFile(path, () => undefined)).toThrow(/broken\.geojsonl: record 25000 of the GeoJSON text sequence is not valid JSON/);
  });

  it('a duplicate key deep in a large file names the feature, after the features before it', () => {
    const path = join(dir, 'twice.geojsonl');
    const lines = features.map((feature) => JSON.stringify(feature));
    lines[27_001] = lines[27_001].replace('"stage_m":', '"stage_m":1,"stage_m":');
    writeFileSync(path, lines.join('\n'));
    expect(() => streamGeoJsonFile(path, () => undefined)).toThrow(/twice\.geojsonl, feature 27001, field "stage_m": the key "stage_m" appears twice in properties/);
  });
});

describe('the streaming reader reads what JSON.parse reads', () => {
  const shipped = [
    ...readdirSync(join(ROOT, 'data-demo')).map((name) => join(ROOT, 'data-demo', name)),
    ...readdirSync(join(ROOT, 'test/fixtures/screen'), { recursive: true }).map((name) => join(ROOT, 'test/fixtures/screen', String(name))),
  ].filter((path) => path.endsWith('.geojson'));

  it('every GeoJSON file of the demo and the screen fixtures, feature for feature', async () => {
    expect(shipped.length).toBeGreaterThan(4);
    for (const path of shipped) {
      const bytes = readFileSync(path);
      const file = await readFeatureFile(path);
      expect(file.features, path).toEqual(JSON.parse(bytes.toString('utf8')).features);
      expect(file.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    }
  });

  it('bytes that are not UTF-8 become U+FFFD as in a whole-file decode, wherever the pieces are cut', () => {
    const path = join(dir, 'latin1.geojson');
    const feature = (i: number) => `{"type":"Feature","properties":{"id":"f${i}","name":"Kanal S\xfcd ${'y'.repeat(i % 7)}"},"geometry":null}`;
    const text = `{"type":"FeatureCollection","features":[${Array.from({ length: 120_000 }, (_, i) => feature(i)).join(',')}]}`;
    const bytes = Buffer.from(text, 'latin1');
    writeFileSync(path, bytes);
    const read: unknown[] = [];
    streamGeoJsonFile(path, (f) => void read.push(f));
    expect(read).toEqual(JSON.parse(bytes.toString('utf8')).features);
  });
});
