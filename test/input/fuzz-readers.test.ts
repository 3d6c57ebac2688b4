// Property-based fuzzing of the reading and validation stages: random bytes and mutated valid
// files (GeoJSON, GeoJSON text sequences, shapefiles, zipped shapefiles) go through
// readFeatureFile, checkLines, checkZones and crossCheck. Each run must either give records and
// problems or throw a DataError that names the file: never another exception.
// The seed is fixed so a run is repeatable; explore with DOAB_FUZZ_SEED=<n> DOAB_FUZZ_RUNS=<scale>.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { zipSync } from 'fflate';
import { afterAll, describe, expect, it } from 'vitest';
import { DataError } from '../../src/shared/errors.js';
import { readFeatureFile } from '../../src/input/read-features.js';
import { crossCheck } from '../../src/screening/cross-checks.js';
import { checkLines, checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

const ROOT = join(import.meta.dirname, '../..');
const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const SHAPES = join(ROOT, 'test/fixtures/bad/_valid-shapefile');
const SEED = Number(process.env.DOAB_FUZZ_SEED ?? 20_240_101);
const SCALE = Number(process.env.DOAB_FUZZ_RUNS ?? 1);
const runs = (n: number) => ({ seed: SEED, numRuns: Math.max(1, Math.round(n * SCALE)) });

const dir = mkdtempSync(join(tmpdir(), 'doab-fuzz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const canalsText = readFileSync(join(PAIR, 'canals.geojson'), 'utf8');
const aquiferText = readFileSync(join(PAIR, 'aquifer.geojson'), 'utf8');
const shp = (name: string) => new Uint8Array(readFileSync(join(SHAPES, name)));
const parts = {
  canals: { shp: shp('canals.shp'), shx: shp('canals.shx'), dbf: shp('canals.dbf'), prj: shp('canals.prj'), cpg: shp('canals.cpg') },
  aquifer: { shp: shp('aquifer.shp'), shx: shp('aquifer.shx'), dbf: shp('aquifer.dbf'), prj: shp('aquifer.prj'), cpg: shp('aquifer.cpg') },
};
const encode = (text: string) => new TextEncoder().encode(text);

let counter = 0;
/** Writes the files under fresh names (the first is the one read) and returns its path. */
function writeInput(stemExtension: string, files: Record<string, Uint8Array> = {}): (main: Uint8Array) => string {
  return (main) => {
    const stem = `f${counter++}`;
    for (const [extension, bytes] of Object.entries(files)) writeFileSync(join(dir, `${stem}.${extension}`), bytes);
    const path = join(dir, `${stem}.${stemExtension}`);
    writeFileSync(path, main);
    return path;
  };
}

type Outcome = 'read' | 'data-error';

/** Reads and checks one file; any exception other than a DataError fails the property. */
async function readAndCheck(path: string): Promise<Outcome> {
  let file;
  try {
    file = await readFeatureFile(path);
  } catch (error) {
    if (!(error instanceof DataError)) throw error;
    // the message names the file, or a part of it (a .prj, a .cpg, an entry of the zip)
    expect(error.place.file.startsWith(path.replace(/\.\w+$/, ''))).toBe(true);
    expect(error.message.startsWith(error.place.file)).toBe(true);
    return 'data-error';
  }
  expect(Array.isArray(file.features)).toBe(true);
  expect(file.sha256).toMatch(/^[0-9a-f]{64}$/);
  const lines = checkLines(path, file.features, DEFAULT_RULES);
  const zones = checkZones(path, file.features, DEFAULT_RULES);
  for (const problem of [...lines.problems, ...zones.problems]) {
    expect(problem.place.file).toBe(path);
    expect(problem.message.length).toBeGreaterThan(0);
  }
  // whatever passes the checks is usable: finite lon/lat, a real stage, K and thickness
  for (const line of lines.records) {
    expect(Number.isFinite(line.stageStartM) && Number.isFinite(line.stageEndM)).toBe(true);
    for (const part of line.partsLonLat) for (let i = 0; i < part.length; i += 2) expect(Math.abs(part[i]) <= 180 && Math.abs(part[i + 1]) <= 90).toBe(true);
  }
  for (const zone of zones.records) {
    expect(zone.kMPerDay).toBeGreaterThan(0);
    expect(zone.groundM).toBeGreaterThan(zone.baseM);
    expect(Number.isFinite(zone.rechargeMPerDay)).toBe(true);
  }
  crossCheck(lines.records, zones.records, { lines: path, zones: path });
  return 'read';
}

/** Byte-level damage: overwrite, delete, duplicate, insert or truncate, a few times. */
function damaged(base: Uint8Array): fc.Arbitrary<Uint8Array> {
  const edit = fc.tuple(fc.constantFrom('flip', 'set', 'delete', 'duplicate', 'insert', 'truncate'), fc.nat(), fc.integer({ min: 0, max: 255 }));
  return fc.array(edit, { minLength: 1, maxLength: 6 }).map((edits) => {
    const bytes = Array.from(base);
    for (const [kind, at, value] of edits) {
      const i = bytes.length === 0 ? 0 : at % bytes.length;
      if (kind === 'flip') bytes[i] ^= 1 << (value % 8);
      else if (kind === 'set') bytes[i] = value;
      else if (kind === 'delete') bytes.splice(i, 1 + (value % 4));
      else if (kind === 'duplicate') bytes.splice(i, 0, ...bytes.slice(i, i + 1 + (value % 8)));
      else if (kind === 'insert') bytes.splice(i, 0, value);
      else bytes.length = i;
    }
    return Uint8Array.from(bytes);
  });
}

/** Counts how often each outcome came up, so a property that never reaches the checks shows. */
function tally() {
  const seen: Record<Outcome, number> = { read: 0, 'data-error': 0 };
  return { seen, add: (outcome: Outcome) => (seen[outcome] += 1) };
}

describe('readers and checks on random bytes', () => {
  it.each(['geojson', 'geojsons', 'json'])('.%s: any bytes give records or a DataError', async (extension) => {
    await fc.assert(fc.asyncProperty(fc.uint8Array({ maxLength: 400 }), async (bytes) => void (await readAndCheck(writeInput(extension)(bytes)))), runs(150));
  });

  it('.shp with a valid .dbf, and a valid .shp with a random .dbf', async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 400 }), async (bytes) => {
        await readAndCheck(writeInput('shp', { dbf: parts.canals.dbf })(bytes));
        await readAndCheck(writeInput('shp', { dbf: bytes })(parts.canals.shp));
      }),
      runs(150),
    );
  });

  it('.zip', async () => {
    await fc.assert(fc.asyncProperty(fc.uint8Array({ maxLength: 400 }), async (bytes) => void (await readAndCheck(writeInput('zip')(bytes)))), runs(150));
  });
});

describe('readers and checks on damaged valid files', () => {
  it('GeoJSON lines and zones: truncated, bytes flipped, characters deleted or duplicated', async () => {
    const { seen, add } = tally();
    await fc.assert(
      fc.asyncProperty(damaged(encode(canalsText)), damaged(encode(aquiferText)), async (canals, aquifer) => {
        add(await readAndCheck(writeInput('geojson')(canals)));
        add(await readAndCheck(writeInput('geojson')(aquifer)));
      }),
      runs(250),
    );
    // a small edit often leaves valid JSON: the checks behind the parser got exercised too
    expect(seen.read).toBeGreaterThan(0);
    expect(seen['data-error']).toBeGreaterThan(0);
  });

  it('GeoJSON text sequences (RS-led and one feature per line)', async () => {
    const features = (JSON.parse(canalsText).features as unknown[]).concat(JSON.parse(aquiferText).features);
    const rs = encode(features.map((f) => `\u001e${JSON.stringify(f)}\n`).join(''));
    const lf = encode(features.map((f) => `${JSON.stringify(f)}\n`).join(''));
    await fc.assert(
      fc.asyncProperty(damaged(rs), damaged(lf), async (a, b) => {
        await readAndCheck(writeInput('geojsons')(a));
        await readAndCheck(writeInput('geojsonl')(b));
      }),
      runs(150),
    );
  });

  it('shapefiles: damaged .shp, .dbf, .prj and .cpg', async () => {
    const { seen, add } = tally();
    const damagedPart = fc
      .tuple(fc.constantFrom('canals' as const, 'aquifer' as const), fc.constantFrom('shp' as const, 'dbf' as const, 'prj' as const, 'cpg' as const))
      .chain(([layer, which]) => damaged(parts[layer][which]).map((bytes) => ({ ...parts[layer], [which]: bytes })));
    await fc.assert(
      fc.asyncProperty(damagedPart, async (files) => {
        const { shp: main, ...sidecars } = files;
        add(await readAndCheck(writeInput('shp', sidecars)(main)));
      }),
      runs(300),
    );
    expect(seen.read).toBeGreaterThan(0);
    expect(seen['data-error']).toBeGreaterThan(0);
  });

  it('zipped shapefiles: the archive bytes damaged, or an entry damaged before zipping', async () => {
    const zipOf = (entries: Record<string, Uint8Array>) => zipSync(Object.fromEntries(Object.entries(entries).map(([ext, bytes]) => [`zone.${ext}`, bytes])));
    const good = zipOf(parts.aquifer);
    await fc.assert(
      fc.asyncProperty(damaged(good), fc.constantFrom('shp', 'dbf', 'prj'), damaged(parts.aquifer.shp), async (archive, which, entry) => {
        await readAndCheck(writeInput('zip')(archive));
        await readAndCheck(writeInput('zip')(zipOf({ ...parts.aquifer, [which]: which === 'shp' ? entry : parts.aquifer[which] })));
      }),
      runs(150),
    );
  });
});

describe('checks on valid JSON of the wrong shape', () => {
  const lines = () => JSON.parse(canalsText);
  const zones = () => JSON.parse(aquiferText);
  // anything JSON can hold, plus the numbers 1e999 becomes and the keys that reach prototypes
  const value = fc.oneof(
    fc.jsonValue({ maxDepth: 3 }),
    fc.constantFrom<unknown>(Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, -0, 1e308, '12,5', '', ' ', 'NaN'),
    // as text, parsed afresh each time, so that one run's edits cannot leak into the next
    fc.constantFrom('{"__proto__":{"polluted":true}}', '{"constructor":{"prototype":{"polluted":true}}}', '{"toJSON":1,"length":-1}').map((text) => JSON.parse(text)),
  );
  // where to put it: a coordinate, a position, a ring or part, the geometry, an attribute, the feature
  const place = fc.constantFrom('coordinate', 'position', 'part', 'coordinates', 'geometry', 'type', 'property', 'properties', 'feature', 'crs');

  function put(doc: any, where: string, v: unknown, n: number, zone: boolean): void {
    const keys = zone ? ['id', 'k_m_d', 'base_m', 'ground_m', 'recharge_mm_yr'] : ['id', 'kind', 'stage_m', 'stage_start_m', 'stage_end_m', 'name'];
    const i = n % doc.features.length;
    const feature = doc.features[i];
    const line = () => (zone ? feature.geometry.coordinates[0] : feature.geometry.coordinates);
    try {
      if (where === 'coordinate') line()[n % line().length][n % 2] = v;
      else if (where === 'position') line()[n % line().length] = v;
      else if (where === 'part') (zone ? feature.geometry.coordinates : [line()])[0] = v;
      else if (where === 'coordinates') feature.geometry.coordinates = v;
      else if (where === 'geometry') feature.geometry = v;
      else if (where === 'type') feature.geometry.type = v;
      else if (where === 'property') feature.properties[keys[n % keys.length]] = v;
      else if (where === 'properties') feature.properties = v;
      else if (where === 'feature') doc.features[i] = v;
      else doc.crs = v;
    } catch {
      // an earlier edit took away what this one would change (a geometry set to 7, say): leave it
    }
  }

  it('random JSON values in place of coordinates, geometry, attributes and features', async () => {
    const { seen, add } = tally();
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(place, value, fc.nat()), { minLength: 1, maxLength: 3 }), async (edits) => {
        const a = lines(), b = zones();
        for (const [where, v, n] of edits) {
          // fast-check reuses generated values while shrinking: edit copies, never the values
          put(a, where, structuredClone(v), n, false);
          put(b, where, structuredClone(v), n, true);
        }
        // JSON.stringify writes Infinity as null; the text form keeps the 1e999 a file would hold
        const text = (doc: unknown) => JSON.stringify(doc, (_, x) => (x === Number.POSITIVE_INFINITY ? '__inf__' : x === Number.NEGATIVE_INFINITY ? '__-inf__' : x)).replace(/"__inf__"/g, '1e999').replace(/"__-inf__"/g, '-1e999');
        add(await readAndCheck(writeInput('geojson')(encode(text(a)))));
        add(await readAndCheck(writeInput('geojson')(encode(text(b)))));
        expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      }),
      runs(400),
    );
    expect(seen.read).toBeGreaterThan(0);
  });

  // String() of an object whose own toString is not a function throws: the check must not call it
  it('an object as kind, with its own "toString" or "valueOf" member, gives a problem, not a TypeError', () => {
    fc.assert(
      fc.property(fc.constantFrom('toString', 'valueOf'), fc.jsonValue({ maxDepth: 1 }), (key, v) => {
        const doc = lines();
        doc.features[0].properties.kind = JSON.parse(JSON.stringify({ [key]: v, other: 1 }));
        const checked = checkLines('canals.geojson', doc.features, DEFAULT_RULES);
        expect(checked.problems.some((p) => p.place.field === 'kind' && p.place.featureIndex === 0)).toBe(true);
      }),
      runs(20),
    );
  });

  it('a GeoJSON text sequence record that is a FeatureCollection whose "features" is not a list gives a DataError', async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.dictionary(fc.string(), fc.jsonValue({ maxDepth: 1 })), fc.integer(), fc.boolean()), async (features) => {
        const path = writeInput('geojsons')(encode(`\u001e${JSON.stringify({ type: 'FeatureCollection', features })}\n`));
        await expect(readFeatureFile(path)).rejects.toBeInstanceOf(DataError);
      }),
      runs(20),
    );
  });
});
