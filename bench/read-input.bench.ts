// Reading a ~100 MB GeoJSON FeatureCollection: the whole-text reader doab had (read the file,
// decode it, scan nesting and duplicate keys, JSON.parse) against the streaming reader, each in its
// own process so peak memory is its own. Prints figures; never part of the tests.
//   npx tsx bench/read-input.bench.ts [MB]
import { execFileSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, readFileSync, rmSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readFeatureFile } from '../src/input/read-features.js';
import { decodeText, duplicateKeys } from '../src/input/read-text.js';

const [mode, path] = process.argv.slice(2);

if (mode === 'whole-text' || mode === 'stream') {
  const started = performance.now();
  let features: number;
  if (mode === 'whole-text') {
    const text = decodeText(path, readFileSync(path));
    duplicateKeys(text, 1);
    features = (JSON.parse(text) as { features: unknown[] }).features.length;
  } else {
    features = (await readFeatureFile(path)).features.length;
  }
  const seconds = (performance.now() - started) / 1000;
  console.log(JSON.stringify({ features, seconds, peakRssMB: process.resourceUsage().maxRSS / 1024 }));
} else {
  const megabytes = Number(mode ?? 100);
  const dir = mkdtempSync(join(tmpdir(), 'doab-read-bench-'));
  const file = join(dir, 'canals.geojson');
  const fd = openSync(file, 'w');
  writeSync(fd, '{"type":"FeatureCollection","features":[\n');
  let bytes = 0;
  for (let i = 0; bytes < megabytes * 2 ** 20; i++) {
    let coordinates = '';
    for (let k = 0; k < 40; k++) coordinates += `${k ? ',' : ''}[${(30 + i * 1e-5 + k * 1e-4).toFixed(7)},${(29 + k * 1e-4).toFixed(7)}]`;
    const feature = `${i ? ',\n' : ''}{"type":"Feature","properties":{"id":"l${i}","kind":"canal","stage_m":${(100 + (i % 7)).toFixed(2)}},"geometry":{"type":"LineString","coordinates":[${coordinates}]}}`;
    bytes += writeSync(fd, feature);
  }
  writeSync(fd, ']}\n');
  closeSync(fd);
  console.log(`${(statSync(file).size / 2 ** 20).toFixed(1)} MiB FeatureCollection of 40-position lines`);
  for (const run of ['whole-text', 'stream']) {
    const out = execFileSync(process.execPath, ['--import', 'tsx', import.meta.filename, run, file], { encoding: 'utf8' });
    const { features, seconds, peakRssMB } = JSON.parse(out);
    console.log(`${run.padEnd(10)}  ${features} features  ${seconds.toFixed(2)} s  peak RSS ${peakRssMB.toFixed(0)} MB`);
  }
  rmSync(dir, { recursive: true, force: true });
}
