import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { gpkgLayersText } from '../output/gpkg-layers.js';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import { ROOT, runCliInProcess } from '../cli/run-cli.js';

// The demo's zones given in metres (UTM 42N) and again with every edge split into 250 equal steps:
// the same shapes with 1,000 vertices a ring. Every layer of the screen must be the same to the byte.
// 250 and not 2,500 (10,000 a ring, which gives the same layers too) to keep the suite quick: the
// cost at 10,000 vertices is measured by bench/zones.bench.ts, not here.
const UTM = '+proj=utm +zone=42 +datum=WGS84 +units=m +no_defs';
const CRS_MEMBER = { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32642' } };
const toUtm = (c: number[]): number[] => proj4('EPSG:4326', UTM, c).map((v: number) => Math.round(v * 1000) / 1000);

function densify(ring: number[][], perEdge: number): number[][] {
  const out: number[][] = [];
  for (let i = 0; i + 1 < ring.length; i++) {
    const [ax, ay] = ring[i], [bx, by] = ring[i + 1];
    for (let k = 0; k < perEdge; k++) out.push([ax + ((bx - ax) * k) / perEdge, ay + ((by - ay) * k) / perEdge]);
  }
  out.push(out[0]);
  return out;
}

function demoInMetres(dir: string, perEdge: number): { canals: string; aquifer: string } {
  const read = (name: string) => JSON.parse(readFileSync(join(ROOT, 'data-demo', name), 'utf8'));
  const aquifer = read('aquifer.geojson'), canals = read('canals.geojson');
  for (const f of aquifer.features) {
    const g = f.geometry;
    const polygons: number[][][][] = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
    const out = polygons.map((p) => p.map((ring) => densify(ring.map(toUtm), perEdge)));
    g.coordinates = g.type === 'Polygon' ? out[0] : out;
  }
  for (const f of canals.features) {
    const g = f.geometry;
    g.coordinates = g.type === 'LineString' ? g.coordinates.map(toUtm) : g.coordinates.map((part: number[][]) => part.map(toUtm));
  }
  const paths = { canals: join(dir, 'canals.geojson'), aquifer: join(dir, `aquifer-${perEdge}.geojson`) };
  writeFileSync(paths.canals, JSON.stringify({ ...canals, crs: CRS_MEMBER }));
  writeFileSync(paths.aquifer, JSON.stringify({ ...aquifer, crs: CRS_MEMBER }));
  return paths;
}

describe('zones of 1,000 vertices a ring', () => {
  it('screen the demo to the same layers, byte for byte, as its plain rectangles', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'doab-detailed-zones-'));
    const layers: Record<string, Buffer>[] = [];
    for (const perEdge of [1, 250]) {
      const { canals, aquifer } = demoInMetres(dir, perEdge);
      if (perEdge > 1) expect(JSON.parse(readFileSync(aquifer, 'utf8')).features[1].geometry.coordinates[0]).toHaveLength(4 * perEdge + 1);
      const out = join(dir, `out-${perEdge}`);
      const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', aquifer, '--strips-only', '--workers', '1', '--out', out]);
      expect(run.status, run.stderr).toBe(0);
      // run.json and the report name the inputs and the time; the layers name neither
      const files = readdirSync(out).filter((name) => name !== 'run.json' && name !== 'report.html');
      // the GeoPackage holds run.json as metadata: its layers are compared
      layers.push(Object.fromEntries(files.map((name) => [name, name === 'doab.gpkg' ? Buffer.from(gpkgLayersText(join(out, name))) : readFileSync(join(out, name))])));
    }
    expect(Object.keys(layers[1]).sort()).toEqual(Object.keys(layers[0]).sort());
    expect(Object.keys(layers[0])).toContain('strips.geojson');
    for (const name of Object.keys(layers[0])) expect(layers[1][name].equals(layers[0][name]), name).toBe(true);
  });
});
