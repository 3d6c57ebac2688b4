// Safety of what doab reads and writes: spreadsheet formulas in the ranking table are
// neutralised, attribute names cannot reach a prototype, only --out is written to, inputs are
// never changed, and internal errors show no stack trace unless --debug asks for one.
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { main } from '../../src/cli/main.js';
import { neutraliseCell } from '../../src/output/layers.js';
import { freshDir, hashTree, readCsv, readJson, ROOT, runCli } from '../cli/run-cli.js';

// lets one test make the screening stage fail as an internal bug would, and leaves it alone otherwise
const fault = vi.hoisted(() => ({ on: false }));
vi.mock('../../src/screening/screen.js', async (importOriginal) => {
  const original = await importOriginal<typeof import('../../src/screening/screen.js')>();
  return {
    ...original,
    screenDistrict: (...args: Parameters<typeof original.screenDistrict>) => {
      if (fault.on) throw new TypeError('a bug planted by the test');
      return original.screenDistrict(...args);
    },
  };
});

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');

// OWASP, CSV Injection: cells starting with =, +, -, @, tab or carriage return can run as
// formulas in a spreadsheet [published]
const FORMULA_STARTS = ['=', '+', '-', '@', '\t', '\r'];


function capture() {
  let out = '', err = '';
  return { io: { out: (text: string) => void (out += text), err: (text: string) => void (err += text) }, text: () => ({ out, err }) };
}

describe('neutraliseCell', () => {
  it('prefixes text that a spreadsheet would run as a formula, and leaves numbers and other text alone', () => {
    for (const start of FORMULA_STARTS) expect(neutraliseCell(`${start}1+2`)).toBe(`'${start}1+2`);
    expect(neutraliseCell('a-upper')).toBe('a-upper');
    expect(neutraliseCell('')).toBe('');
    expect(neutraliseCell(-12.5)).toBe(-12.5);
    expect(neutraliseCell(0)).toBe(0);
  });
});

describe('doab screen on lines whose ids look like formulas', () => {
  // three copies of the parallel pair side by side, ids starting with formula characters; ids are
  // trimmed when read, so a tab or CR before a formula is dropped and the formula must still be caught
  const IDS: [string, string][] = [
    ['=HYPERLINK("http://invalid.example/x","open")', '-1+2'],
    ['+1+1', '@SUM(A1:A2)'],
    ['\t=1+1', '\r\n-3'],
  ];
  let dir: string, inputs: string, out: string, before: Record<string, string>;
  let run: ReturnType<typeof runCli>;

  beforeAll(() => {
    dir = freshDir('safety');
    inputs = join(dir, 'in');
    out = join(dir, 'out');
    mkdirSync(inputs);
    const pair = readJson(join(PAIR, 'canals.geojson'));
    const zone = readJson(join(PAIR, 'aquifer.geojson')).features[0];
    const shift = 0.11; // degrees of longitude: each copy sits east of the last, in its own zone
    const lines: unknown[] = [], zones: unknown[] = [];
    IDS.forEach((ids, copy) => {
      const move = (position: number[]) => [Number((position[0] + copy * shift).toFixed(7)), position[1]];
      pair.features.forEach((line: any, i: number) => lines.push({ ...line, properties: { ...line.properties, id: ids[i] }, geometry: { ...line.geometry, coordinates: line.geometry.coordinates.map(move) } }));
      zones.push({ ...zone, properties: { ...zone.properties, id: `zone-${copy}` }, geometry: { ...zone.geometry, coordinates: zone.geometry.coordinates.map((ring: number[][]) => ring.map(move)) } });
    });
    writeFileSync(join(inputs, 'canals.geojson'), JSON.stringify({ type: 'FeatureCollection', features: lines }));
    writeFileSync(join(inputs, 'aquifer.geojson'), JSON.stringify({ type: 'FeatureCollection', features: zones }));
    before = hashTree(dir);
    run = runCli(['screen', '--canals', join(inputs, 'canals.geojson'), '--aquifer', join(inputs, 'aquifer.geojson'), '--out', out]);
    expect(run.status, run.stderr).toBe(0);
  });

  it('neutralises every id cell in ranking.csv and keeps the numbers numbers', () => {
    const rows = readCsv(join(out, 'ranking.csv'));
    expect(rows).toHaveLength(3);
    const cells = rows.flatMap((row) => [row.line_a, row.line_b]);
    expect(cells.sort()).toEqual(IDS.flat().map((id) => `'${id.trim()}`).sort());
    for (const row of rows) {
      // the strip id starts with line a's id
      expect(row.strip_id.startsWith("'")).toBe(true);
      for (const column of ['rank', 'length_m', 'spacing_m', 'loss_m3_d', 'loss_m3_d_km', 'loss_m3_yr', 'min_depth_m']) {
        expect(row[column], column).toMatch(/^-?\d+(\.\d+)?(e[-+]\d+)?$/);
      }
    }
    const text = readFileSync(join(out, 'ranking.csv'), 'utf8');
    for (const line of text.split('\n').slice(1)) expect(line).not.toMatch(/(^|,)"?[=+\-@\t\r]/);
    // the per-line table too (OWASP, CSV Injection)
    const lineRows = readCsv(join(out, 'lines.csv'));
    expect(lineRows.map((row) => row.line_id).sort()).toEqual(IDS.flat().map((id) => `'${id.trim()}`).sort());
  });

  it('keeps the ids as they are in the GeoJSON layers, which no spreadsheet evaluates', () => {
    const lines = readJson(join(out, 'canals.geojson'));
    expect(lines.features.map((f: any) => f.properties.id).sort()).toEqual(IDS.flat().sort());
  });

  it('writes only inside --out, every file complete, and leaves the inputs as they were', () => {
    const after = hashTree(dir);
    const outputs = Object.keys(after).filter((path) => path.startsWith('out/'));
    expect(outputs.sort()).toEqual([
      'out/canals.geojson', 'out/depth.tif', 'out/doab.gpkg', 'out/lines.csv', 'out/lines.sld', 'out/ranking.csv', 'out/report.html', 'out/run.json',
      'out/strips.geojson', 'out/strips.sld', 'out/water-table.tif',
    ]);
    const inputsAfter = Object.fromEntries(Object.entries(after).filter(([path]) => !path.startsWith('out/')));
    expect(inputsAfter).toEqual(before);
    expect(readJson(join(out, 'run.json')).inputs.canals.sha256).toBe(createHash('sha256').update(readFileSync(join(inputs, 'canals.geojson'))).digest('hex'));
  });
});

describe('attribute names that reach prototypes in careless code', () => {
  it('are refused by name, with no prototype changed on the way and nothing written', async () => {
    const dir = freshDir('proto');
    const canals = readFileSync(join(PAIR, 'canals.geojson'), 'utf8').replace(
      '"name":"Upper Test Canal",',
      '"name":"Upper Test Canal","__proto__":{"polluted":true},"constructor":{"prototype":{"polluted":true}},"toString":"plain text",',
    );
    const canalsPath = join(dir, 'canals.geojson');
    writeFileSync(canalsPath, canals);
    // JSON.parse keeps "__proto__" as an own key; the file really holds what the test means
    expect(Object.hasOwn(JSON.parse(canals).features[0].properties, '__proto__')).toBe(true);
    const out = join(dir, 'out');
    const { io, text } = capture();
    const code = await main(['screen', '--canals', canalsPath, '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out, '--quiet'], io);
    expect(code, text().err).toBe(1);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect((Object.prototype as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.getOwnPropertyNames(Object.prototype)).not.toContain('polluted');
    for (const key of ['__proto__', 'constructor']) {
      expect(text().err).toContain(`${canalsPath}, feature 0 (id "a-upper"), field "${key}": an attribute named "${key}" is refused`);
    }
    // an attribute that only shares a name with an object method is a plain attribute
    expect(text().err).not.toContain('field "toString"');
    expect(existsSync(out)).toBe(false);
  });
});

describe('internal errors', () => {
  const args = (out: string) => ['screen', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out];

  it('show no stack trace without --debug, exit 3 and write nothing', async () => {
    const out = join(freshDir('internal'), 'out');
    const { io, text } = capture();
    fault.on = true;
    try {
      expect(await main(args(out), io)).toBe(3);
    } finally {
      fault.on = false;
    }
    const { err } = text();
    expect(err).toMatch(/^doab: internal error: a bug planted by the test$/m);
    expect(err).toMatch(/Run again with --debug/);
    expect(err).not.toMatch(/^\s+at /m);
    expect(readdirSync(join(out, '..'))).toEqual([]);
  });

  it('show the stack trace with --debug', async () => {
    const { io, text } = capture();
    fault.on = true;
    try {
      expect(await main([...args(join(freshDir('internal-debug'), 'out')), '--debug'], io)).toBe(3);
    } finally {
      fault.on = false;
    }
    expect(text().err).toMatch(/^TypeError: a bug planted by the test\n\s+at /m);
  });
});
