// Hostile inputs are bounded: sizes and counts are checked before anything is allocated, and each
// refusal is a data error (exit 1) naming the file, with the first problems listed and the rest counted.
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, hashTree, ROOT, runCliInProcess } from '../cli/run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const CANALS = join(PAIR, 'canals.geojson');
const AQUIFER = join(PAIR, 'aquifer.geojson');

describe('inputs that are not regular files, or too large', () => {
  it('refuses a device such as /dev/zero, naming it, without reading it', async () => {
    for (const command of ['check', 'screen']) {
      const out = join(freshDir('devzero'), 'out');
      const run = await runCliInProcess([command, '--canals', '/dev/zero', '--aquifer', AQUIFER, ...(command === 'screen' ? ['--out', out] : [])]);
      expect(run.status, run.stderr).toBe(1);
      expect(`${run.stdout}${run.stderr}`).toMatch(/^error: \/dev\/zero: not a regular file \(a device, pipe or socket\)/m);
    }
  });

  it('refuses a file larger than the input budget before reading it (a 5 GB sparse file), and says which setting raises it', async () => {
    const dir = freshDir('large');
    const big = join(dir, 'canals.geojson');
    execFileSync('truncate', ['-s', '5G', big]);
    const run = await runCliInProcess(['check', '--canals', big, '--aquifer', AQUIFER]);
    expect(run.status).toBe(1);
    expect(run.stdout).toMatch(/: is 5120 MB, more than the 4096 MB an input may be \(setting maxInputMB, --max-input-mb\)/);
    const small = await runCliInProcess(['check', '--canals', CANALS, '--aquifer', AQUIFER, '--config', writeConfig(dir, { maxInputMB: 0.0001 })]);
    expect(small.status).toBe(1);
    expect(small.stdout).toMatch(/canals\.geojson: is 0 MB, more than the 0\.0001 MB an input may be/);
    const beyond = await runCliInProcess(['check', '--canals', CANALS, '--aquifer', AQUIFER, '--config', writeConfig(dir, { maxInputMB: 100_001 })]);
    expect(beyond.status).toBe(1);
    expect(beyond.stderr).toMatch(/"maxInputMB" can be at most 100000/);
    // past the old cap of 500 MB (JavaScript's longest text) a budget is now taken
    const raised = await runCliInProcess(['check', '--canals', CANALS, '--aquifer', AQUIFER, '--config', writeConfig(dir, { maxInputMB: 20_000 })]);
    expect(raised.stderr).not.toMatch(/maxInputMB/);
    expect(raised.status).toBe(0);
  });
});

function writeConfig(dir: string, config: object): string {
  const path = join(dir, `config-${Object.keys(config).join('-')}-${Math.random().toString(36).slice(2)}.jsonc`);
  writeFileSync(path, JSON.stringify(config));
  return path;
}

describe('many problems, and large records', () => {
  it('200,000 bad features: exit 1, the first problems listed and the rest counted', async () => {
    const dir = freshDir('many-bad');
    const line = (i: number) => `{"type":"Feature","properties":{"id":"l${i}"},"geometry":{"type":"LineString","coordinates":[[30.5,29.5],[30.51,29.5]]}}`;
    const path = join(dir, 'canals.geojson');
    writeFileSync(path, `{"type":"FeatureCollection","features":[${Array.from({ length: 200_000 }, (_, i) => line(i)).join(',\n')}]}`);
    // screen only: check lists problems by the same code, and reads 200,000 features in the next test
    for (const command of ['screen']) {
      const run = await runCliInProcess([command, '--canals', path, '--aquifer', AQUIFER, ...(command === 'screen' ? ['--out', join(dir, 'out')] : [])]);
      const text = `${run.stdout}${run.stderr}`;
      expect(run.status, text.slice(0, 500)).toBe(1);
      expect(text.split('\n').filter((l) => /^error: /.test(l))).toHaveLength(100);
      expect(text).toMatch(/^\.\.\. and 1999\d\d more problems like these \(the first 100 are listed\)$/m);
      expect(text).toMatch(new RegExp(`^error: ${path.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}, feature 0 \\(id "l0"\\), field "stage_m": missing water level`, 'm'));
    }
  }, 60_000);

  it('one RFC 8142 record holding a collection of 200,000 features is read (no argument-list overflow)', async () => {
    const dir = freshDir('big-record');
    const canals = JSON.parse(readFileSync(CANALS, 'utf8'));
    const filler = Array.from({ length: 200_000 }, (_, i) => ({ ...canals.features[0], properties: { ...canals.features[0].properties, id: `f${i}`, stage_m: 'high' } }));
    const path = join(dir, 'canals.geojsons');
    writeFileSync(path, `\u001e${JSON.stringify({ type: 'FeatureCollection', features: filler })}\n`);
    const run = await runCliInProcess(['check', '--canals', path, '--aquifer', AQUIFER]);
    expect(run.status).toBe(1);
    expect(run.stdout).toMatch(/^200000 errors, /m);
  }, 60_000);
});

describe('doab profile on a tampered run record', () => {
  it('checks an input against its recorded SHA-256 before reading it as data, and never quotes a file that failed', async () => {
    const dir = freshDir('tampered');
    const out = join(dir, 'run');
    expect((await runCliInProcess(['screen', '--canals', CANALS, '--aquifer', AQUIFER, '--out', out, '--quiet'])).status).toBe(0);
    const record = JSON.parse(readFileSync(join(out, 'run.json'), 'utf8'));
    const strip = JSON.parse(readFileSync(join(out, 'strips.geojson'), 'utf8')).features[0].properties.strip_id;
    const secret = join(dir, 'secret.geojson');
    writeFileSync(secret, 'root:x:0:0:a system file, not GeoJSON\n');
    for (const path of [secret, '/dev/zero']) {
      record.inputs.canals.path = path;
      writeFileSync(join(out, 'run.json'), JSON.stringify(record));
      const before = hashTree(out);
      const run = await runCliInProcess(['profile', '--run', out, '--strip', strip]);
      expect(run.status, run.stderr).toBe(1);
      expect(run.stderr).not.toMatch(/root:x|system file/);
      expect(run.stderr).toMatch(path === secret ? /changed since the run in .*SHA-256 now [0-9a-f]{64}/ : /not a regular file/);
      expect(hashTree(out)).toEqual(before);
    }
  });
});
