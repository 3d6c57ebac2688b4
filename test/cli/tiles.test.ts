// Tiles over an array job: `doab screen --tile I/N` in N parallel processes (the compiled bin/doab.js,
// as a batch engine starts them), then `doab gather`, writes the files of a single run byte for
// byte, on the demo (with its DEM) and on a generated network, for N = 1, 2 and 7. Only when the
// run started and its command line differ. The tile index comes from --tile I/N and from each
// batch engine's array variable. A missing or damaged tile, or an input changed since, stops the
// gathering with the tile or file named and nothing written; rerunning the one tile is enough.
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, rmSync, truncateSync, writeFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { syntheticDistrict } from '../../bench/network.js';
import { parseTileOption } from '../../src/cli/tile-option.js';
import { freshDir, readCsv, readJson, ROOT, runCliInProcess } from './run-cli.js';
import { DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY, DISTRICT_TILE_LOSS_TOLERANCE } from '../../src/screening/district.js';
import { expectSameFiles, runFiles } from './run-files.js';

/** The tiles as a batch engine runs them: N processes at once, each told its index its own way. */
function runTiles(args: string[], out: string, count: number, indexBy: 'option' | 'JOB_COMPLETION_INDEX' | 'SLURM_ARRAY_TASK_ID' | 'AWS_BATCH_JOB_ARRAY_INDEX'): Promise<void[]> {
  const runs: Promise<void>[] = [];
  for (let index = 1; index <= count; index++) {
    const tile = indexBy === 'option' ? `${index}/${count}` : String(count);
    const env = { ...process.env, JOB_COMPLETION_INDEX: '', SLURM_ARRAY_TASK_ID: '', AWS_BATCH_JOB_ARRAY_INDEX: '', ...(indexBy === 'option' ? {} : { [indexBy]: String(index - 1) }) };
    runs.push(
      new Promise((resolve, reject) => {
        const child = spawn(process.execPath, [join(ROOT, 'bin/doab.js'), 'screen', ...args, '--tile', tile, '--out', out, '--quiet'], { cwd: ROOT, env });
        let stderr = '';
        child.stderr.on('data', (data) => (stderr += data));
        child.on('error', reject);
        child.on('close', (status) => (status === 0 ? resolve() : reject(new Error(`tile ${index} of ${count} exited ${status}: ${stderr}`))));
      }),
    );
  }
  return Promise.all(runs);
}

async function single(args: string[], out: string): Promise<Map<string, string>> {
  const run = await runCliInProcess(['screen', ...args, '--out', out, '--quiet']);
  expect(run.status, run.stderr).toBe(0);
  return runFiles(out);
}

async function gather(tiles: string, out: string) {
  return runCliInProcess(['gather', '--tiles', tiles, '--out', out, '--quiet']);
}

describe('tiles on a batch engine, then gather', () => {
  const dir = freshDir('tiles-cli');
  const demo = ['--canals', join(ROOT, 'data-demo/canals.geojson'), '--aquifer', join(ROOT, 'data-demo/aquifer.geojson'), '--dem', join(ROOT, 'data-demo/dem.tif'), '--strips-only'];
  const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson');
  let network: string[] = [];
  const singles = new Map<string, Map<string, string>>();
  beforeAll(() => {
    const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(60);
    writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lineFeatures }));
    writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zoneFeatures }));
    network = ['--canals', canals, '--aquifer', aquifer, '--crs', crs, '--max-gap', '800', '--strips-only', '--transects'];
  });

  it('gathers the demo and a generated network into the files of one run, for 1, 2 and 7 tiles in parallel processes', async () => {
    const cases = [
      { label: 'demo', args: demo, splits: [[1, 'option'], [2, 'SLURM_ARRAY_TASK_ID'], [7, 'AWS_BATCH_JOB_ARRAY_INDEX']] as const },
      { label: 'network', args: network, splits: [[1, 'option'], [2, 'JOB_COMPLETION_INDEX'], [7, 'option']] as const },
    ];
    // every tile of every split at once, as a busy cluster would start them; a split into one is
    // run in this process (nothing runs beside it), which keeps the suite's time down
    await Promise.all(cases.flatMap(({ label, args, splits }) => splits.filter(([count]) => count > 1).map(([count, indexBy]) => runTiles(args, join(dir, `${label}-tiles-${count}`), count, indexBy))));
    for (const { label, args } of cases) {
      const tile = await runCliInProcess(['screen', ...args, '--tile', '1/1', '--out', join(dir, `${label}-tiles-1`), '--quiet']);
      expect(tile.status, tile.stderr).toBe(0);
    }
    for (const { label, args, splits } of cases) {
      const one = await single(args, join(dir, `${label}-one`));
      singles.set(label, one);
      expect(one.get('strips.geojson')?.includes('"q_a_m2_d"'), `${label}: strips with seepage`).toBe(true);
      for (const [count] of splits) {
        const tiles = join(dir, `${label}-tiles-${count}`);
        expect(readdirSync(tiles).length, `${label}: one file per tile`).toBe(count);
        const out = join(dir, `${label}-gathered-${count}`);
        const run = await gather(tiles, out);
        expect(run.status, run.stderr).toBe(0);
        expectSameFiles(one, runFiles(out), `${label} in ${count} tiles`);
      }
    }
  }, 120_000);

  it('refuses a missing or damaged tile, naming it, and gathers once that one tile is rerun', async () => {
    const tiles = join(dir, 'demo-tiles-7');
    if (!existsSync(tiles)) await runTiles(demo, tiles, 7, 'option');
    const out = join(dir, 'refused');
    const tile3 = join(tiles, 'tile-0003-of-0007.doabtile');
    rmSync(tile3);
    let run = await gather(tiles, out);
    expect(run.status).toBe(1);
    expect(run.stderr).toContain('tile 3 (tile-0003-of-0007.doabtile) of 7 is missing');
    expect(run.stderr).toContain('--tile 3/7');
    expect(existsSync(out)).toBe(false);
    // the one tile rerun (in this process: the suite's time; a tile process is as above)
    expect((await runCliInProcess(['screen', ...demo, '--tile', '3/7', '--out', tiles, '--quiet'])).status).toBe(0);
    // cut short, as a tile killed while its file was copied to shared storage
    const tile5 = join(tiles, 'tile-0005-of-0007.doabtile');
    truncateSync(tile5, statSync(tile5).size - 100);
    run = await gather(tiles, out);
    expect(run.status).toBe(1);
    expect(run.stderr).toContain('tile 5 of 7 cannot be used: its checksum does not match');
    expect(existsSync(out)).toBe(false);
    expect((await runCliInProcess(['screen', ...demo, '--tile', '5/7', '--out', tiles, '--quiet'])).status).toBe(0);
    run = await gather(tiles, out);
    expect(run.status, run.stderr).toBe(0);
    expectSameFiles(singles.get('demo') ?? (await single(demo, join(dir, 'demo-one-again'))), runFiles(out), 'after rerunning tiles 3 and 5');
  }, 60_000);

  it('refuses inputs changed since the tiles ran, and tiles of another run', async () => {
    const tiles = join(dir, 'changed-tiles');
    const args = ['--canals', canals, '--aquifer', aquifer, ...network.slice(4)];
    for (const index of [1, 2]) expect((await runCliInProcess(['screen', ...args, '--tile', `${index}/2`, '--out', tiles, '--quiet'])).status).toBe(0);
    // tile 2 again with another step: not the same run as tile 1
    const other = join(dir, 'other-tiles');
    expect((await runCliInProcess(['screen', ...args, '--tile', '1/2', '--out', other, '--quiet'])).status).toBe(0);
    expect((await runCliInProcess(['screen', ...args, '--step', '50', '--tile', '2/2', '--out', other, '--quiet'])).status).toBe(0);
    let run = await gather(other, join(dir, 'other-out'));
    expect(run.status).toBe(1);
    expect(run.stderr).toContain('tile 2 of 2 was screened with other inputs or options than tile 1');
    const text = readFileSync(aquifer, 'utf8');
    writeFileSync(aquifer, text.replace('"k_m_d":', '"k_m_d": 1, "old_k":'));
    run = await gather(tiles, join(dir, 'changed-out'));
    writeFileSync(aquifer, text);
    expect(run.status).toBe(1);
    expect(run.stderr).toContain(`${aquifer}: this aquifer file is not the one the tiles in ${tiles} were screened with`);
  });

  it('runs the district solve in tiles, and gathers it within the tolerance the stitch states', async () => {
    // the demo at a 40 m cell (the suite's time): every line's loss within the stated tolerance of
    // one whole solve (DISTRICT_TILE_LOSS_TOLERANCE, measured in test/screening/district-tiles.test.ts)
    const args = ['--canals', join(ROOT, 'data-demo/canals.geojson'), '--aquifer', join(ROOT, 'data-demo/aquifer.geojson'), '--cell', '40'];
    const tiles = join(dir, 'district-tiles');
    for (const index of [1, 2]) {
      const run = await runCliInProcess(['screen', ...args, '--tile', `${index}/2`, '--out', tiles, '--quiet']);
      expect(run.status, run.stderr).toBe(0);
    }
    const run = await runCliInProcess(['gather', '--tiles', tiles, '--out', join(dir, 'district-gathered')]);
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr).toContain('district solve in 2 tiles');
    expect((await runCliInProcess(['screen', ...args, '--out', join(dir, 'district-one'), '--quiet'])).status).toBe(0);
    const losses = (folder: string) => new Map(readCsv(join(dir, folder, 'lines.csv')).map((row) => [row.line_id, Number(row.net_loss_m3_d)]));
    const stitched = losses('district-gathered'), one = losses('district-one');
    expect(stitched.size).toBe(one.size);
    let largest = 0;
    for (const [line, loss] of one) {
      const difference = Math.abs((stitched.get(line) as number) - loss);
      largest = Math.max(largest, difference);
      expect(difference, line).toBeLessThanOrEqual(Math.max(DISTRICT_TILE_LOSS_TOLERANCE * Math.abs(loss), DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY));
    }
    // stitched, not copied: the figures are the tiles' own
    expect(largest).toBeGreaterThan(0);
    const record = readJson(join(dir, 'district-gathered/run.json'));
    expect(record.totals.method).toBe('district');
  }, 60_000);

  it('takes the tile index from --tile I/N or from the array job of a batch engine', () => {
    expect(parseTileOption('3/7', {}).tile).toEqual({ index: 3, count: 7 });
    expect(parseTileOption('7', { JOB_COMPLETION_INDEX: '0' }).tile).toEqual({ index: 1, count: 7 });
    expect(parseTileOption('7', { SLURM_ARRAY_TASK_ID: '6' }).tile).toEqual({ index: 7, count: 7 });
    expect(parseTileOption('7', { AWS_BATCH_JOB_ARRAY_INDEX: '2' }).from).toBe('AWS_BATCH_JOB_ARRAY_INDEX=2 (counted from 0)');
    expect(() => parseTileOption('7', { SLURM_ARRAY_TASK_ID: '7' })).toThrow('past the last of 7 tiles');
    expect(() => parseTileOption('7', {})).toThrow('none of JOB_COMPLETION_INDEX, SLURM_ARRAY_TASK_ID, AWS_BATCH_JOB_ARRAY_INDEX is set');
    expect(() => parseTileOption('8/7', {})).toThrow('from 1 to 7');
    expect(() => parseTileOption('0/7', {})).toThrow('from 1 to 7');
    expect(() => parseTileOption('a/b', {})).toThrow('--tile must be I/N');
  });
});
