// Output as GeoJSON text sequences, and input in a projected CRS named on the command line.
import { execFileSync, spawnSync } from 'node:child_process';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, readJson, ROOT, runCli } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const hasOgr = spawnSync('ogr2ogr', ['--version']).status === 0;

// formats and coordinates are the matter here, not the district solve: strips only, for speed
function screen(canals: string, aquifer: string, extra: string[] = []) {
  const out = freshDir('formats');
  return { out, run: runCli(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--quiet', '--strips-only', ...extra]) };
}

describe('--seq writes GeoJSON text sequences', () => {
  it('gives one RS-led JSON record per feature, the same features as a FeatureCollection run', () => {
    const collection = screen(join(PAIR, 'canals.geojson'), join(PAIR, 'aquifer.geojson'), ['--transects']);
    const sequence = screen(join(PAIR, 'canals.geojson'), join(PAIR, 'aquifer.geojson'), ['--transects', '--seq']);
    expect(sequence.run.status, sequence.run.stderr).toBe(0);
    for (const layer of ['strips', 'canals', 'transects']) {
      const text = readFileSync(join(sequence.out, `${layer}.geojsons`), 'utf8');
      // RFC 8142 section 2: each text is a record separator, a JSON text, then a line feed [published]
      const records = text.split('\u001e').slice(1);
      expect(text.startsWith('\u001e')).toBe(true);
      for (const record of records) expect(record.endsWith('\n')).toBe(true);
      const features = records.map((record) => JSON.parse(record));
      expect(features).toEqual(readJson(join(collection.out, `${layer}.geojson`)).features);
      if (hasOgr) {
        // GDAL's GeoJSONSeq driver, an independent reader of RFC 8142
        const info = execFileSync('ogrinfo', ['-ro', '-so', '-al', join(sequence.out, `${layer}.geojsons`)], { encoding: 'utf8' });
        expect(info).toMatch(new RegExp(`Feature Count: ${features.length}\\b`));
      } else {
        expect(process.env.CI, 'ogrinfo (Debian gdal-bin) is missing').toBeFalsy();
      }
    }
  });
});

describe('--input-crs', () => {
  it('reads projected coordinates that the file does not declare, and says how when it is missing', () => {
    if (!hasOgr) {
      expect(process.env.CI, 'ogr2ogr (Debian gdal-bin) is missing').toBeFalsy();
      return;
    }
    const dir = freshDir('input-crs');
    // GDAL/PROJ projects the fixture to UTM 36N; the legacy "crs" member it writes is removed so
    // that only --input-crs can tell doab the CRS
    for (const name of ['canals', 'aquifer']) {
      const projected = join(dir, `${name}-utm.geojson`);
      execFileSync('ogr2ogr', ['-f', 'GeoJSON', '-t_srs', 'EPSG:32636', projected, join(PAIR, `${name}.geojson`)]);
      const collection = readJson(projected);
      expect(collection.crs).toBeDefined();
      delete collection.crs;
      writeFileSync(join(dir, `${name}.geojson`), JSON.stringify(collection));
    }
    const without = screen(join(dir, 'canals.geojson'), join(dir, 'aquifer.geojson'));
    expect(without.run.status).toBe(1);
    expect(without.run.stderr).toMatch(/cannot be longitude\/latitude.*--input-crs/);
    const given = screen(join(dir, 'canals.geojson'), join(dir, 'aquifer.geojson'), ['--input-crs', 'EPSG:32636']);
    expect(given.run.status, given.run.stderr).toBe(0);
    const reference = screen(join(PAIR, 'canals.geojson'), join(PAIR, 'aquifer.geojson'));
    const q = (out: string) => readJson(join(out, 'strips.geojson')).features[0].properties.q_a_m2_d as number;
    expect(Math.abs(q(given.out) / q(reference.out) - 1)).toBeLessThan(1e-3);
    expect(readJson(join(given.out, 'run.json')).inputs.canals.source_crs).toBe('EPSG:32636');
  });
});

describe('a second run into the same folder', () => {
  it('removes the layers of the first run that it does not write, and nothing else', () => {
    const out = freshDir('rerun');
    const args = ['screen', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out, '--quiet'];
    expect(runCli([...args, '--transects']).status).toBe(0);
    writeFileSync(join(out, 'notes.txt'), 'the engineer\'s own file');
    // strips only the second time: the first run's rasters go too
    const again = runCli([...args, '--strips-only']);
    expect(again.status, again.stderr).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['canals.geojson', 'doab.gpkg', 'lines.csv', 'lines.sld', 'notes.txt', 'ranking.csv', 'report.html', 'run.json', 'strips.geojson', 'strips.sld']);
    expect(readFileSync(join(out, 'notes.txt'), 'utf8')).toBe('the engineer\'s own file');
  });
});
