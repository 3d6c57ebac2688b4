// The batch-engine files in docs/ do what they say: the Kubernetes Indexed Job's own command runs
// every tile (each pod told its index by JOB_COMPLETION_INDEX, as Kubernetes does) and the gather
// Job's command gathers them; the Slurm array script runs as each array task would, with
// SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT, then the gather script; submit.sh queues the
// array and the gathering after it (sbatch stood in for by a script that records its arguments).
// No cluster runs here: the manifests' commands and scripts are run on this machine with /data
// mapped to a temporary folder.
import { execFileSync } from 'node:child_process';
import { chmodSync, copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseAllDocuments } from 'yaml';
import { freshDir, readJson, ROOT, runCliInProcess } from '../cli/run-cli.js';

interface Container { args: string[]; volumeMounts: { name: string; mountPath: string }[] }
interface Manifest { kind: string; metadata: { name: string }; spec: any }

function manifests(name: string): Manifest[] {
  return parseAllDocuments(readFileSync(join(ROOT, 'docs/kubernetes', name), 'utf8')).map((doc) => doc.toJS() as Manifest);
}

function optionAfter(args: string[], option: string): string {
  const at = args.indexOf(option);
  expect(at, option).toBeGreaterThanOrEqual(0);
  return args[at + 1];
}

/** A demo copy where a job expects its inputs: <data>/in. */
function dataFolder(prefix: string): string {
  const data = freshDir(prefix);
  mkdirSync(join(data, 'in'));
  copyFileSync(join(ROOT, 'data-demo/canals.geojson'), join(data, 'in/canals.geojson'));
  copyFileSync(join(ROOT, 'data-demo/aquifer.geojson'), join(data, 'in/aquifer.geojson'));
  return data;
}

describe('the Kubernetes Indexed Job in docs/kubernetes', () => {
  it('is an Indexed Job whose pods run the tiles of one split on the shared volume, and whose gather Job gathers them', async () => {
    const [tiles] = manifests('doab-tiles.yaml');
    const [gather] = manifests('doab-gather.yaml');
    const volume = manifests('doab-volume.yaml');
    expect(tiles.kind).toBe('Job');
    expect(tiles.spec.completionMode).toBe('Indexed');
    const tileContainer: Container = tiles.spec.template.spec.containers[0];
    const gatherContainer: Container = gather.spec.template.spec.containers[0];
    const count = Number(optionAfter(tileContainer.args, '--tile'));
    // the number of tiles doab is told is the number of indices Kubernetes hands out
    expect(tiles.spec.completions).toBe(count);
    expect(optionAfter(gatherContainer.args, '--tiles')).toBe(optionAfter(tileContainer.args, '--out'));
    const claim = volume.find((m) => m.kind === 'PersistentVolumeClaim')!;
    expect(claim.spec.accessModes).toContain('ReadWriteMany');
    for (const job of [tiles, gather]) expect(job.spec.template.spec.volumes[0].persistentVolumeClaim.claimName).toBe(claim.metadata.name);
    const mount = tileContainer.volumeMounts[0].mountPath;

    // each pod's command, as Kubernetes runs it, on this machine
    const data = dataFolder('k8s');
    // --strips-only added: the district solve in tiles is tested on its own (test/cli/tiles.test.ts),
    // and here it would only slow the suite
    const local = (args: string[]) => [...args.map((arg) => (arg.startsWith(`${mount}/`) ? join(data, arg.slice(mount.length + 1)) : arg)), ...(args[0] === 'screen' ? ['--strips-only'] : [])];
    const before = process.env.JOB_COMPLETION_INDEX;
    try {
      for (let index = 0; index < tiles.spec.completions; index++) {
        process.env.JOB_COMPLETION_INDEX = String(index);
        const run = await runCliInProcess([...local(tileContainer.args), '--quiet']);
        expect(run.status, run.stderr).toBe(0);
      }
    } finally {
      if (before === undefined) delete process.env.JOB_COMPLETION_INDEX;
      else process.env.JOB_COMPLETION_INDEX = before;
    }
    expect(readdirSync(join(data, 'tiles')).length).toBe(count);
    const run = await runCliInProcess([...local(gatherContainer.args), '--quiet']);
    expect(run.status, run.stderr).toBe(0);
    const record = readJson(join(data, 'out/run.json'));
    expect(record.totals.method).toBe('strips');
    expect(record.counts.strips).toBeGreaterThan(10);
  }, 60_000);
});

describe('the Slurm array scripts in docs/slurm', () => {
  it('run each tile as an array task would, then gather', () => {
    const data = dataFolder('slurm');
    const env = { ...process.env, DOAB_ROOT: ROOT, DOAB_DATA: data, DOAB_SCREEN_OPTIONS: '--strips-only --quiet', SLURM_ARRAY_TASK_COUNT: '2', JOB_COMPLETION_INDEX: '', AWS_BATCH_JOB_ARRAY_INDEX: '' };
    for (const index of [0, 1]) execFileSync('bash', [join(ROOT, 'docs/slurm/doab-tiles.sbatch')], { env: { ...env, SLURM_ARRAY_TASK_ID: String(index) }, stdio: 'pipe' });
    expect(readdirSync(join(data, 'tiles')).sort()).toEqual(['tile-0001-of-0002.doabtile', 'tile-0002-of-0002.doabtile']);
    execFileSync('bash', [join(ROOT, 'docs/slurm/doab-gather.sbatch')], { env, stdio: 'pipe' });
    expect(existsSync(join(data, 'out/strips.geojson'))).toBe(true);
  }, 60_000);

  it('submit.sh queues an array from 0 to N-1, then the gathering after every task has finished well', () => {
    const bin = freshDir('fake-sbatch');
    const log = join(bin, 'calls');
    // stands in for sbatch: records its arguments, answers a job id as --parsable does
    writeFileSync(join(bin, 'sbatch'), `#!/bin/bash\necho "$*" >> ${log}\nif [[ "$*" == *--array* ]]; then echo 4001; else echo 4002; fi\n`);
    chmodSync(join(bin, 'sbatch'), 0o755);
    const out = execFileSync('bash', [join(ROOT, 'docs/slurm/submit.sh'), '7'], { env: { ...process.env, PATH: `${bin}:${process.env.PATH}` }, encoding: 'utf8' });
    const calls = readFileSync(log, 'utf8').trim().split('\n');
    expect(calls[0]).toBe(`--parsable --array=0-6 ${join(ROOT, 'docs/slurm/doab-tiles.sbatch')}`);
    expect(calls[1]).toBe(`--parsable --dependency=afterok:4001 ${join(ROOT, 'docs/slurm/doab-gather.sbatch')}`);
    expect(out).toContain('job array 4001');
  });
});
