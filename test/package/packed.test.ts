// The library as a user gets it: `npm pack`, unpacked into a fresh folder's node_modules (its
// dependencies linked from ours, so nothing is fetched), imported by name from a script and a
// type-checked TypeScript file, screening the demo the way the README's library example does.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { freshDir, readJson, ROOT, runCliInProcess } from '../cli/run-cli.js';

const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';
let project: string;

beforeAll(() => {
  project = freshDir('packed');
  const packed = execFileSync(npm, ['pack', '--ignore-scripts', '--silent', '--pack-destination', project], { cwd: ROOT, encoding: 'utf8' }).trim().split('\n').pop()!;
  const modules = join(project, 'node_modules');
  mkdirSync(join(modules, 'doab'), { recursive: true });
  execFileSync('tar', ['-xzf', join(project, packed), '-C', join(modules, 'doab'), '--strip-components=1']);
  for (const name of readdirSync(join(ROOT, 'node_modules'))) {
    if (name === 'doab' || name.startsWith('.')) continue;
    symlinkSync(join(ROOT, 'node_modules', name), join(modules, name));
  }
}, 120_000);

describe('the packed package', () => {
  it('ships the compiled library, its declarations and the command, not the tests', () => {
    const files = readdirSync(join(project, 'node_modules/doab'), { recursive: true }).map(String);
    expect(files).toContain(join('dist', 'index.js'));
    expect(files).toContain(join('dist', 'index.d.ts'));
    expect(files).toContain(join('bin', 'doab.js'));
    expect(files.some((file) => file.startsWith('test'))).toBe(false);
  });

  it('screens the demo from an import by name, with the same strips as doab screen', async () => {
    writeFileSync(
      join(project, 'use.mjs'),
      `import { readConfig, loadDistrict, screenLoaded, writeRun } from 'doab';
const config = readConfig();
config.settings.stripsOnly = true; // any setting of the table; the district solve is tested elsewhere
const district = await loadDistrict(process.argv[2], process.argv[3], config);
const result = screenLoaded(district, config);
await writeRun('out', result, { district, config });
console.log(JSON.stringify({ strips: result.strips.length, lossM3PerDay: result.totals.lossM3PerDay }));
`,
    );
    const run = spawnSync(process.execPath, ['use.mjs', join(ROOT, 'data-demo/canals.geojson'), join(ROOT, 'data-demo/aquifer.geojson')], { cwd: project, encoding: 'utf8' });
    expect(run.status, run.stderr).toBe(0);
    const printed = JSON.parse(run.stdout);
    const cliOut = join(freshDir('packed-cli'), 'out');
    const cli = await runCliInProcess(['screen', '--canals', join(ROOT, 'data-demo/canals.geojson'), '--aquifer', join(ROOT, 'data-demo/aquifer.geojson'), '--out', cliOut, '--quiet', '--strips-only']);
    expect(cli.status, cli.stderr).toBe(0);
    expect(printed.strips).toBe(readJson(join(cliOut, 'strips.geojson')).features.length);
    expect(readFileSync(join(project, 'out/strips.geojson')).equals(readFileSync(join(cliOut, 'strips.geojson')))).toBe(true);
    expect(readFileSync(join(project, 'out/ranking.csv')).equals(readFileSync(join(cliOut, 'ranking.csv')))).toBe(true);
  });

  it('type-checks a TypeScript user of the declarations', () => {
    writeFileSync(
      join(project, 'use.ts'),
      `import { DEFAULT_SETTINGS, readConfig, type ScreenResult, type ScreenSettings } from 'doab';
const settings: ScreenSettings = { ...DEFAULT_SETTINGS, stepM: 50 };
const config = readConfig();
export const step: number = settings.stepM + config.settings.maxGapM;
export function strips(result: ScreenResult): string[] { return result.strips.map((s) => s.lineAId); }
`,
    );
    writeFileSync(join(project, 'tsconfig.json'), JSON.stringify({ compilerOptions: { module: 'NodeNext', moduleResolution: 'NodeNext', strict: true, noEmit: true, skipLibCheck: true, types: ['node'] }, files: ['use.ts'] }));
    writeFileSync(join(project, 'package.json'), JSON.stringify({ type: 'module' }));
    const check = spawnSync(process.execPath, [join(ROOT, 'node_modules/typescript/bin/tsc'), '-p', 'tsconfig.json'], { cwd: project, encoding: 'utf8' });
    expect(check.status, check.stdout + check.stderr).toBe(0);
  });
});
