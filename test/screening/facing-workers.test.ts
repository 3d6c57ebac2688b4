// The transect cast and solve over worker threads give the same files, byte for byte, for any number of
// workers: on the demo (source modules, workers through tsx) and on a generated network of a few
// thousand stations (the compiled dist/, as bin/doab.js runs it). The worker threshold is forced
// to 0 so that these small districts really go through the workers, and a counter proves they did.
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { syntheticDistrict } from '../../bench/network.js';
import { facingWorkerStats } from '../../src/screening/facing-workers.js';
import { freshDir, ROOT, runCliInProcess } from '../cli/run-cli.js';
import { expectSameFiles as expectSame, runFiles as filesOfRun } from '../cli/run-files.js';

type Main = (argv: string[], io: { out: (text: string) => void; err: (text: string) => void }) => Promise<number>;

/** Every file of a run; the record says the workers were asked for, and leaves them out of the settings. */
function runFiles(out: string): Map<string, string> {
  return filesOfRun(out, (record) => {
    expect(record.command_line.slice(-2)[0]).toBe('--workers');
    expect(record.settings).not.toHaveProperty('workers');
  });
}

async function screenWithWorkers(run: Main, args: string[], out: string, workers: number): Promise<Map<string, string>> {
  let stderr = '';
  const status = await run(['screen', ...args, '--out', out, '--strips-only', '--quiet', '--workers', String(workers)], { out: () => {}, err: (text) => (stderr += text) });
  expect(status, stderr).toBe(0);
  return runFiles(out);
}

function expectSameFiles(a: Map<string, string>, b: Map<string, string>, workers: number): void {
  expectSame(a, b, `--workers ${workers}`);
}

const mainInProcess: Main = async (argv) => (await runCliInProcess(argv)).status ?? 1;

describe('the transect solve over worker threads', () => {
  let threshold: string | undefined;
  beforeAll(() => {
    threshold = process.env.DOAB_WORKER_MIN_FACINGS;
    process.env.DOAB_WORKER_MIN_FACINGS = '0';
  });
  afterAll(() => {
    if (threshold === undefined) delete process.env.DOAB_WORKER_MIN_FACINGS;
    else process.env.DOAB_WORKER_MIN_FACINGS = threshold;
  });

  it('writes the same demo files with 1, 2 and 3 workers (strips only)', async () => {
    const out = join(freshDir('workers-demo'), 'out');
    const args = ['--canals', join(ROOT, 'data-demo/canals.geojson'), '--aquifer', join(ROOT, 'data-demo/aquifer.geojson')];
    const runsBefore = facingWorkerStats.runs, threadsBefore = facingWorkerStats.threads, threadChunksBefore = facingWorkerStats.threadChunks, castBefore = facingWorkerStats.threadCastChunks;
    const one = await screenWithWorkers(mainInProcess, args, out, 1);
    expect(facingWorkerStats.runs).toBe(runsBefore);
    expect(one.get('strips.geojson')?.includes('"q_a_m2_d"'), 'strips with seepage').toBe(true);
    for (const workers of [2, 3]) expectSameFiles(one, await screenWithWorkers(mainInProcess, args, out, workers), workers);
    expect(facingWorkerStats.runs).toBe(runsBefore + 2);
    // N workers are this thread and N - 1 started ones, each handed two chunks at the start
    expect(facingWorkerStats.threads).toBe(threadsBefore + 3);
    expect(facingWorkerStats.threadChunks).toBeGreaterThanOrEqual(threadChunksBefore + 2 * 3);
    // the started threads cast their chunks' transects as well as solving them
    expect(facingWorkerStats.threadCastChunks).toBe(facingWorkerStats.threadChunks - threadChunksBefore + castBefore);
  });

  it('writes the same files for a generated network with 1, 2 and 3 workers, from the compiled dist/', async () => {
    const dir = freshDir('workers-network');
    const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(120);
    const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson');
    writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lineFeatures }));
    writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zoneFeatures }));
    // the compiled modules, as bin/doab.js loads them: their workers start dist/screening/facing-worker.js
    const { main } = (await import(join(ROOT, 'dist/cli/main.js'))) as { main: Main };
    const { facingWorkerStats: stats } = (await import(join(ROOT, 'dist/screening/facing-workers.js'))) as { facingWorkerStats: typeof facingWorkerStats };
    const args = ['--canals', canals, '--aquifer', aquifer, '--crs', crs, '--max-gap', '800'];
    const out = join(dir, 'out');
    const one = await screenWithWorkers(main, args, out, 1);
    const record = JSON.parse(readFileSync(join(out, 'run.json'), 'utf8'));
    expect(record.counts.stations).toBeGreaterThan(2000);
    expect(stats.runs).toBe(0);
    for (const workers of [2, 3]) expectSameFiles(one, await screenWithWorkers(main, args, out, workers), workers);
    expect(stats.runs).toBe(2);
    expect(stats.threads).toBe(3);
    expect(stats.threadChunks).toBeGreaterThanOrEqual(2 * 3);
  });
});
