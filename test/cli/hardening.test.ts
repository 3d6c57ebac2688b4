// Careless-user cases that end well or with a usage error, beside the bad-input corpus (which holds
// the cases that stop with exit 1 or 2 on a file of the case's own).
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, hashTree, ROOT, runCliInProcess } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const CANALS = join(PAIR, 'canals.geojson');
const AQUIFER = join(PAIR, 'aquifer.geojson');

describe('hardening', () => {
  it('reads a config that starts with a UTF-8 byte-order mark', async () => {
    const config = join(freshDir('bom'), 'doab.jsonc');
    writeFileSync(config, '\uFEFF{ "stepM": 50 } // a comment\n');
    const run = await runCliInProcess(['check', '--canals', CANALS, '--aquifer', AQUIFER, '--config', config]);
    expect(run.status, run.stderr).toBe(0);
  });

  it('says how many lines lie outside every zone, and goes on with the rest', async () => {
    const dir = freshDir('outside');
    const doc = JSON.parse(readFileSync(CANALS, 'utf8'));
    const stray = { ...doc.features[0], properties: { ...doc.features[0].properties, id: 'stray' }, geometry: { type: 'LineString', coordinates: [[31.5, 29.5], [31.51, 29.5]] } };
    doc.features.push(stray);
    const canals = join(dir, 'canals.geojson');
    writeFileSync(canals, JSON.stringify(doc));
    const run = await runCliInProcess(['check', '--canals', canals, '--aquifer', AQUIFER]);
    expect(run.status).toBe(0);
    expect(run.stdout).toContain(`warning: ${canals}: 1 of 3 lines have no vertex inside any zone of ${AQUIFER} ("stray"): nothing is computed for them`);
  });

  it('refuses doab profile --out naming a file before any screening, and an empty --out', async () => {
    const dir = freshDir('profile-out');
    const out = join(dir, 'run');
    expect((await runCliInProcess(['screen', '--canals', CANALS, '--aquifer', AQUIFER, '--out', out, '--quiet', '--strips-only'])).status).toBe(0);
    const file = join(dir, 'a-file.txt');
    writeFileSync(file, 'not a folder\n');
    const before = hashTree(dir);
    const strip = JSON.parse(readFileSync(join(out, 'strips.geojson'), 'utf8')).features[0].properties.strip_id;
    const refused = await runCliInProcess(['profile', '--run', out, '--strip', strip, '--out', file]);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/^doab: usage error: --out .*a-file\.txt: is a file, not a folder/);
    const empty = await runCliInProcess(['profile', '--run', out, '--strip', strip, '--out', '']);
    expect(empty.status).toBe(2);
    expect(empty.stderr).toMatch(/^doab: usage error: --out is empty/);
    expect(hashTree(dir)).toEqual(before);
  });

  it('removes temporary files an earlier killed run left (even one under this process id), and nothing else', async () => {
    const out = join(freshDir('stale'), 'out');
    mkdirSync(out);
    const stale = [`.strips.geojson.${process.pid}.tmp`, '.ranking.csv.doab-1-0a1b2c3d.tmp', `.report.html.doab-${process.pid}-deadbeef.tmp`];
    for (const name of stale) writeFileSync(join(out, name), 'half a layer');
    writeFileSync(join(out, '.notes.txt.1.tmp'), 'not ours: another name');
    const run = await runCliInProcess(['screen', '--canals', CANALS, '--aquifer', AQUIFER, '--out', out, '--quiet', '--strips-only']);
    expect(run.status, run.stderr).toBe(0);
    const left = readdirSync(out);
    for (const name of stale) expect(left).not.toContain(name);
    expect(left).toContain('.notes.txt.1.tmp');
  });

  it('leaves a file of the engineer alone under a name this run does not write, and refuses one under a name it does', async () => {
    const out = join(freshDir('own-file'), 'out');
    mkdirSync(out);
    writeFileSync(join(out, 'transects.geojson'), 'the engineer\'s own layer');
    const run = await runCliInProcess(['screen', '--canals', CANALS, '--aquifer', AQUIFER, '--out', out, '--quiet', '--strips-only']);
    expect(run.status, run.stderr).toBe(0);
    expect(readFileSync(join(out, 'transects.geojson'), 'utf8')).toBe('the engineer\'s own layer');
    const other = join(freshDir('own-file-2'), 'out');
    mkdirSync(other);
    writeFileSync(join(other, 'transects.geojson'), 'the engineer\'s own layer');
    const refused = await runCliInProcess(['screen', '--canals', CANALS, '--aquifer', AQUIFER, '--out', other, '--quiet', '--strips-only', '--transects']);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/transects\.geojson there was not written by doab/);
    expect(readFileSync(join(other, 'transects.geojson'), 'utf8')).toBe('the engineer\'s own layer');
  });
});
