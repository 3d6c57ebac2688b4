// `doab check` and `doab screen --skip-invalid` on districts with several problems at once,
// warnings that do not stop a run, and the good parallel-pair district.
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, readJson, ROOT, runCliInProcess } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const GOOD_CANALS = join(PAIR, 'canals.geojson');
const GOOD_AQUIFER = join(PAIR, 'aquifer.geojson');

const goodCanals = () => readJson(GOOD_CANALS);
const goodAquifer = () => readJson(GOOD_AQUIFER);

function write(dir: string, name: string, doc: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(doc));
  return path;
}

const lit = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** The lines of check's report that are problems, in order. */
const problemLines = (stdout: string) => stdout.split('\n').filter((line) => /^(error|warning): /.test(line));

// a second zone north of the pair's zone, sharing its northern edge (no overlap)
function northZone(id: string, properties: Record<string, unknown> = {}) {
  return {
    type: 'Feature',
    properties: { id, k_m_d: 5, base_m: 90, ground_m: 108, recharge_mm_yr: 0, ...properties },
    geometry: { type: 'Polygon', coordinates: [[[30.4587632, 29.5360802], [30.5618552, 29.5360403], [30.5618552, 29.58], [30.4587632, 29.58], [30.4587632, 29.5360802]]] },
  };
}

describe('doab check', () => {
  it('passes the good district: exit 0, 0 errors, the feature counts', async () => {
    const run = await runCliInProcess(['check', '--canals', GOOD_CANALS, '--aquifer', GOOD_AQUIFER]);
    expect(run.status, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/^0 errors, 0 warnings$/m);
    expect(run.stdout).toContain(`${GOOD_CANALS}: 2 features (2 valid lines)`);
    expect(run.stdout).toContain(`${GOOD_AQUIFER}: 1 features (1 valid zones)`);
    expect(problemLines(run.stdout)).toEqual([]);
  });

  it('prints every problem, errors before warnings, each with file, feature, id and field, and exits 1', async () => {
    const dir = freshDir('check-many');
    const canals = goodCanals();
    canals.features[0].properties.stage_m = '105,2';
    canals.features[1].properties.kind = 'ditch';
    canals.features.push({ type: 'Feature', properties: { id: 'c-east', stage_m: 104 }, geometry: { type: 'Point', coordinates: [30.51, 29.49] } });
    canals.features.push({ type: 'Feature', properties: { id: 'a-upper', stage_m: 104 }, geometry: { type: 'LineString', coordinates: [[30.5, 29.49], [30.52, 29.49]] } });
    const aquifer = goodAquifer();
    aquifer.features[0].properties.k_m_d = 5000;
    aquifer.features.push(northZone('silt', { base_m: undefined }));
    aquifer.features.push(northZone('clay', { k_m_d: 0.001 }));
    // move the clay zone north, off the silt zone, so that no zones overlap
    aquifer.features[2].geometry.coordinates[0] = aquifer.features[2].geometry.coordinates[0].map(([x, y]: number[]) => [x, y + 0.05]);
    const canalsPath = write(dir, 'canals.geojson', canals);
    const aquiferPath = write(dir, 'aquifer.geojson', aquifer);

    const run = await runCliInProcess(['check', '--canals', canalsPath, '--aquifer', aquiferPath]);
    expect(run.status, run.stdout + run.stderr).toBe(1);
    const c = lit(canalsPath), a = lit(aquiferPath);
    const expected = [
      `^error: ${c}, feature 0 \\(id "a-upper"\\), field "stage_m": expected a number, found text "105,2" \\(a decimal comma\\? write 105\\.2`,
      `^error: ${c}, feature 1 \\(id "b-lower"\\), field "kind": expected "canal" or "drain", found text "ditch"`,
      `^error: ${c}, feature 2 \\(id "c-east"\\), field "geometry": expected LineString or MultiLineString, found "Point"`,
      `^error: ${c}, feature 3 \\(id "a-upper"\\), field "id": duplicate id "a-upper" \\(also feature 0\\)`,
      // base_m: undefined is dropped by JSON.stringify, so the attribute is missing
      `^error: ${a}, feature 1 \\(id "silt"\\), field "base_m": missing required number`,
      `^warning: ${a}, feature 0 \\(id "sand"\\), field "k_m_d": hydraulic conductivity 5000 m/d is outside the handbook range`,
      `^warning: ${a}, feature 2 \\(id "clay"\\), field "k_m_d": hydraulic conductivity 0\\.001 m/d is outside the handbook range`,
    ];
    for (const pattern of expected) expect(run.stdout).toMatch(new RegExp(pattern, 'm'));
    const lines = problemLines(run.stdout);
    expect(lines).toHaveLength(expected.length);
    const firstWarning = lines.findIndex((line) => line.startsWith('warning:'));
    expect(lines.slice(firstWarning).every((line) => line.startsWith('warning:'))).toBe(true);
    expect(run.stdout).toMatch(/^5 errors, 2 warnings$/m);
    expect(run.stdout).toContain(`${canalsPath}: 4 features (0 valid lines)`);
  });

  it('warns about overlapping zones, naming both, and exits 0 when nothing else is wrong', async () => {
    const dir = freshDir('check-overlap');
    const aquifer = goodAquifer();
    // the same zone shifted north by a third of its height: the two share a band about 5.4 km tall
    const shifted = northZone('loam');
    shifted.geometry.coordinates[0] = aquifer.features[0].geometry.coordinates[0].map(([x, y]: number[]) => [x, y + 0.024]);
    aquifer.features.push(shifted);
    const aquiferPath = write(dir, 'aquifer.geojson', aquifer);
    const run = await runCliInProcess(['check', '--canals', GOOD_CANALS, '--aquifer', aquiferPath]);
    expect(run.status, run.stdout + run.stderr).toBe(0);
    expect(run.stdout).toMatch(new RegExp(`^warning: ${lit(aquiferPath)}, feature 1 \\(id "loam"\\), field "geometry": overlaps zone "sand" \\(feature 0\\) over [\\d.]+ ha`, 'm'));
    // the shared band is a lon/lat rectangle; its area on a sphere is R^2 dlon (sin lat2 - sin lat1)
    // (J.P. Snyder 1987, USGS PP 1395 [from memory]) with R the mean earth radius 6371.0088 km
    // (IUGG [published]); the ring edges slope by 4e-5 degrees, so take their mean latitudes
    const rad = Math.PI / 180, R = 6_371_008.8;
    const south = (29.4639068 + 29.4638669) / 2 + 0.024, north = (29.5360403 + 29.5360802) / 2;
    const expectedHa = (R * R * (30.5618552 - 30.4587632) * rad * (Math.sin(north * rad) - Math.sin(south * rad))) / 10_000;
    const ha = Number(/over ([\d.]+) ha/.exec(run.stdout)![1]);
    expect(Math.abs(ha / expectedHa - 1)).toBeLessThan(0.01);
    expect(run.stdout).toMatch(/^0 errors, 1 warning$/m);
  });

  it('warns when K is outside the handbook range, naming the source (Bouwer 1978) and the unit', async () => {
    const dir = freshDir('check-k');
    const aquifer = goodAquifer();
    // 0.002 cm/s = 1.728 m/d is fine; 2 cm/s = 1728 m/d is above the 1000 m/d of gravel (Bouwer 1978 [published second-hand])
    aquifer.features[0].properties.k_m_d = 2;
    const aquiferPath = write(dir, 'aquifer.geojson', aquifer);
    const config = join(dir, 'config.jsonc');
    writeFileSync(config, '{ "units": { "k": "cm/s" } }\n');
    const run = await runCliInProcess(['check', '--canals', GOOD_CANALS, '--aquifer', aquiferPath, '--config', config]);
    expect(run.status, run.stdout + run.stderr).toBe(0);
    expect(run.stdout).toMatch(
      new RegExp(`^warning: ${lit(aquiferPath)}, feature 0 \\(id "sand"\\), field "k_m_d": hydraulic conductivity 1728 m/d is outside the handbook range.*0\\.01 to 1000 m/d.*Bouwer.*1978.*\\(cm/s\\)`, 'm'),
    );
    expect(run.stdout).toMatch(/^0 errors, 1 warning$/m);
  });

  it('warns when a canal stands far above the ground, and exits 0', async () => {
    const dir = freshDir('check-high');
    const canals = goodCanals();
    // ground 108 m; 120 m is 12 m above it, more than the 5 m an embankment canal stands (common practice)
    canals.features[0].properties.stage_m = 120;
    const canalsPath = write(dir, 'canals.geojson', canals);
    const run = await runCliInProcess(['check', '--canals', canalsPath, '--aquifer', GOOD_AQUIFER]);
    expect(run.status, run.stdout + run.stderr).toBe(0);
    expect(run.stdout).toMatch(new RegExp(`^warning: ${lit(canalsPath)}, feature 0 \\(id "a-upper"\\), field "[a-z_]+": stage 120 m at chainage 0 m is 12 m above the ground of zone "sand" \\(108 m\\)`, 'm'));
    expect(run.stdout).toMatch(/^0 errors, 1 warning$/m);
  });

  it('stops on a canal level at or below the aquifer base', async () => {
    const dir = freshDir('check-low');
    const canals = goodCanals();
    canals.features[1].properties.stage_m = 90;
    const canalsPath = write(dir, 'canals.geojson', canals);
    const run = await runCliInProcess(['check', '--canals', canalsPath, '--aquifer', GOOD_AQUIFER]);
    expect(run.status).toBe(1);
    expect(run.stdout).toMatch(new RegExp(`^error: ${lit(canalsPath)}, feature 1 \\(id "b-lower"\\), field "[a-z_]+": stage 90 m at chainage 0 m is at or below the aquifer base 90 m of zone "sand"`, 'm'));
  });
});

describe('doab screen --skip-invalid', () => {
  function district() {
    const dir = freshDir('skip');
    const canals = goodCanals();
    // a third line between the two, with its stage as text and a Point for geometry
    canals.features.push({ type: 'Feature', properties: { id: 'c-middle', kind: 'canal', stage_m: '104' }, geometry: { type: 'LineString', coordinates: [[30.5, 29.498], [30.52, 29.498]] } });
    canals.features.push({ type: 'Feature', properties: { id: 'd-dot', kind: 'drain', stage_m: 100 }, geometry: { type: 'Point', coordinates: [30.51, 29.497] } });
    return { dir, canals: write(dir, 'canals.geojson', canals), out: join(dir, 'out') };
  }

  it('without the flag stops with exit 1 and writes nothing', async () => {
    const { canals, out } = district();
    const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', GOOD_AQUIFER, '--out', out]);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/doab: stopped: 2 problems in the inputs; nothing was written/);
    expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  });

  it('with the flag leaves the bad features out, lists them in run.json and says so in the summary', async () => {
    const { canals, out } = district();
    const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', GOOD_AQUIFER, '--out', out, '--skip-invalid']);
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr).toMatch(/skipping 2 invalid features \(--skip-invalid\)/);
    expect(run.stderr).toContain(`error: ${canals}, feature 2 (id "c-middle"), field "stage_m": expected a number, found text "104"`);
    expect(run.stderr).toContain(`error: ${canals}, feature 3 (id "d-dot"), field "geometry": expected LineString or MultiLineString, found "Point"`);
    expect(run.stdout).toMatch(/2 invalid features were skipped \(--skip-invalid\); run\.json lists them/);

    const record = readJson(join(out, 'run.json'));
    expect(record.skipped_features).toEqual([
      { file: canals, feature: 2, id: 'c-middle', field: 'stage_m', problem: expect.stringMatching(/expected a number, found text "104"/) },
      { file: canals, feature: 3, id: 'd-dot', field: 'geometry', problem: expect.stringMatching(/expected LineString or MultiLineString/) },
    ]);
    expect(record.counts.lines).toBe(2);
    expect(record.inputs.canals.features).toBe(4);
    const lines = readJson(join(out, 'canals.geojson'));
    expect(lines.features.map((f: any) => f.properties.id)).toEqual(['a-upper', 'b-lower']);
    // the good pair is screened as if the bad lines were not there: one strip between a and b
    const strips = readJson(join(out, 'strips.geojson'));
    expect(strips.features).toHaveLength(1);
    // both start at the same longitude; the southern one, b-lower, is line a (by geometry)
    expect(strips.features[0].properties.line_a).toBe('b-lower');
    expect(strips.features[0].properties.line_b).toBe('a-upper');
  });

  it('still stops on a problem with a whole file, since no feature can be skipped to fix it', async () => {
    const dir = freshDir('skip-file');
    const canals = join(dir, 'canals.geojson');
    writeFileSync(canals, readFileSync(GOOD_CANALS, 'utf8').slice(0, 100));
    const out = join(dir, 'out');
    const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', GOOD_AQUIFER, '--out', out, '--skip-invalid']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(new RegExp(`^error: ${lit(canals)}: not valid JSON`, 'm'));
    expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  });
});

describe('doab check --dem', () => {
  it('lets zones leave out ground_m with the DEM screen will use, and says so; without it they are refused', async () => {
    const dir = freshDir('check-dem');
    const aquifer = readJson(join(ROOT, 'data-demo/aquifer.geojson'));
    for (const feature of aquifer.features) delete feature.properties.ground_m;
    const path = join(dir, 'aquifer.geojson');
    writeFileSync(path, JSON.stringify(aquifer));
    const canals = join(ROOT, 'data-demo/canals.geojson');
    const without = await runCliInProcess(['check', '--canals', canals, '--aquifer', path]);
    expect(without.status).toBe(1);
    expect(without.stdout).toMatch(/no feature has the attribute "ground_m"/);
    const withDem = await runCliInProcess(['check', '--canals', canals, '--aquifer', path, '--dem', join(ROOT, 'data-demo/dem.tif')]);
    expect(withDem.status, withDem.stdout + withDem.stderr).toBe(0);
    expect(withDem.stdout).toMatch(/no feature has "ground_m" .*the DEM's ground alone/);
  });
});
