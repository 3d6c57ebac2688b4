// Faults while writing, on a real child process of the built command (strips only: the writes are
// what is tested, and the district solve would only add seconds): a file-size limit that cuts a
// layer short (ulimit -f, as a full disk would), and SIGTERM/SIGINT in the middle of the writes. In
// both, nothing half-written is left behind and the earlier complete outputs stay as they were.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, hashTree, ROOT } from './run-cli.js';

const BIN = join(ROOT, 'bin/doab.js');
const DEMO = ['--canals', join(ROOT, 'data-demo/canals.geojson'), '--aquifer', join(ROOT, 'data-demo/aquifer.geojson')];
const temporaries = (dir: string) => (existsSync(dir) ? readdirSync(dir).filter((name) => name.endsWith('.tmp')) : []);

describe('a write cut short by a file-size limit', () => {
  it('fails with exit 1 naming the cause, and leaves the earlier complete outputs as they were', () => {
    const out = join(freshDir('fsize'), 'out');
    const first = spawnSync(process.execPath, [BIN, 'screen', ...DEMO, '--out', out, '--quiet', '--strips-only'], { encoding: 'utf8' });
    expect(first.status, first.stderr).toBe(0);
    const before = hashTree(out);
    // ulimit -f counts 512-byte blocks [from memory: POSIX ulimit -f]; 40 blocks = 20 kB, less than the strips layer
    const limited = spawnSync('bash', ['-c', 'ulimit -f 40; exec "$0" "$@"', process.execPath, BIN, 'screen', ...DEMO, '--out', out, '--transects', '--quiet', '--strips-only'], { encoding: 'utf8' });
    expect(limited.status, limited.stderr).toBe(1);
    expect(limited.stderr).toMatch(/cannot write the outputs \(EFBIG: a file grew beyond the size the system allows\); nothing was written, earlier outputs are as they were/);
    expect(temporaries(out)).toEqual([]);
    expect(hashTree(out)).toEqual(before);
  });
});

describe('a GeoPackage cut short by a file-size limit', () => {
  it('fails with exit 1 naming the cause, and leaves no temporary or journal file behind', () => {
    const out = join(freshDir('fsize-gpkg'), 'out');
    // bash's ulimit -f counts 1024-byte blocks [from memory: bash manual, ulimit]: 150 KiB is more
    // than the report (about 116 kB) and less than the GeoPackage (about 176 kB) of this run; the
    // sizes are checked first, so the limit falls on the GeoPackage, which SQLite writes itself
    const first = spawnSync(process.execPath, [BIN, 'screen', ...DEMO, '--out', out, '--quiet', '--strips-only'], { encoding: 'utf8' });
    expect(first.status, first.stderr).toBe(0);
    const sizes = readdirSync(out).map((name) => ({ name, bytes: statSync(join(out, name)).size }));
    expect(sizes.filter((file) => file.bytes >= 150 * 1024).map((file) => file.name)).toEqual(['doab.gpkg']);
    const before = hashTree(out);
    const limited = spawnSync('bash', ['-c', 'ulimit -f 150; exec "$0" "$@"', process.execPath, BIN, 'screen', ...DEMO, '--out', out, '--quiet', '--strips-only'], { encoding: 'utf8' });
    expect(limited.status, limited.stderr).toBe(1);
    expect(limited.stderr).toMatch(/cannot write the outputs \(SQLITE_IOERR_WRITE: the system refused a write: a full disk, a quota or a file-size limit\); nothing was written/);
    expect(readdirSync(out).filter((name) => name.startsWith('.'))).toEqual([]);
    expect(hashTree(out)).toEqual(before);
  });
});

describe('a signal while writing', () => {
  for (const signal of ['SIGTERM', 'SIGINT'] as const) {
    it(`${signal} removes the temporary files and writes no output`, async () => {
      const out = join(freshDir('signal'), 'out');
      // a fine step and the transects layer make the writes last long enough to be caught in the middle
      const child = spawn(process.execPath, [BIN, 'screen', ...DEMO, '--out', out, '--transects', '--step', '2', '--quiet', '--strips-only'], { stdio: 'ignore' });
      const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, got) => resolve({ code, signal: got })));
      let seen = false;
      const deadline = Date.now() + 60_000;
      while (!seen && Date.now() < deadline && child.exitCode === null) {
        seen = temporaries(out).length > 0;
        if (!seen) await new Promise((resolve) => setTimeout(resolve, 2));
      }
      expect(seen, 'the run ended before any temporary file was seen').toBe(true);
      child.kill(signal);
      const end = await exited;
      expect(end.signal).toBe(signal);
      expect(temporaries(out)).toEqual([]);
      expect(readdirSync(out)).toEqual([]);
    }, 90_000);
  }
});
