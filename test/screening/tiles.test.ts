// Tiles solve each transect exactly as a single run does: the demo split into 1, 2 and 7 tiles,
// gathered, gives every column of every transect side bit for bit, and the screening built on them
// the same strips. The reference is the single run itself. (test/cli/tiles.test.ts runs the same
// through tile processes and doab gather, on the demo and on a generated network.)
import { describe, expect, it } from 'vitest';
import { defaultConfig } from '../../src/input/config.js';
import { loadDistrict } from '../../src/input/load-district.js';
import { screenDistrict, type ScreenResult } from '../../src/screening/screen.js';
import { assembleTiles, screenTile, TILE_FACING_COLUMNS, TILE_RESULT_COLUMNS, type TilePart } from '../../src/screening/tiles.js';
import { stationsOfTile, tileBands, bandOf } from '../../src/geometry/tiles.js';
import type { ScreenSettings } from '../../src/shared/settings.js';
import type { LineRecord, ZoneRecord } from '../../src/screening/district-inputs.js';
import { DEMO_AQUIFER, DEMO_CANALS } from '../report/demo-result.js';

async function load(canals: string, aquifer: string, settings: Partial<ScreenSettings>) {
  const config = defaultConfig();
  // with the transects layer asked for, a run keeps every result column, so all can be compared
  Object.assign(config.settings, { stripsOnly: true, writeTransects: true, ...settings });
  const district = await loadDistrict(canals, aquifer, config);
  expect(district.problems.filter((p) => p.severity === 'error')).toEqual([]);
  return { lines: district.lines, zones: district.zones, settings: config.settings };
}

function sameColumns(whole: ScreenResult, gathered: ScreenResult, label: string): void {
  for (const name of TILE_FACING_COLUMNS) {
    const a = Buffer.from((whole.facings as unknown as Record<string, ArrayBufferView>)[name].buffer);
    const b = Buffer.from((gathered.facings as unknown as Record<string, ArrayBufferView>)[name].buffer);
    expect(a.equals(b), `${label}: facings.${name}`).toBe(true);
  }
  for (const name of TILE_RESULT_COLUMNS) {
    const a = Buffer.from((whole.transects as unknown as Record<string, ArrayBufferView>)[name].buffer);
    const b = Buffer.from((gathered.transects as unknown as Record<string, ArrayBufferView>)[name].buffer);
    expect(a.equals(b), `${label}: results.${name}`).toBe(true);
  }
  expect(JSON.stringify(gathered.strips), label).toBe(JSON.stringify(whole.strips));
  expect(gathered.warnings, label).toEqual(whole.warnings);
}

function splitAndGather(lines: LineRecord[], zones: ZoneRecord[], settings: ScreenSettings, count: number): { result: ScreenResult; parts: TilePart[] } {
  const parts: TilePart[] = [];
  // gathered in an order other than the tiles' own: order must not matter
  for (let index = count; index >= 1; index--) parts.push(screenTile(lines, zones, settings, { index, count }));
  const result = screenDistrict(lines, zones, settings, undefined, { tiles: { assemble: (stations) => assembleTiles(stations, parts) } });
  return { result, parts };
}

describe('tiles of the work area', () => {
  it('put every station in exactly one band, about equally many in each', () => {
    const n = 1000;
    const x = Float64Array.from({ length: n }, (_, i) => (i * 7919) % 1000);
    const y = new Float64Array(n);
    const bands = tileBands({ count: n, x, y }, 7);
    const sizes = Array.from({ length: 7 }, (_, k) => stationsOfTile({ count: n, x, y }, bands, { index: k + 1, count: 7 }).length);
    expect(sizes.reduce((a, b) => a + b, 0)).toBe(n);
    for (const size of sizes) expect(Math.abs(size - n / 7)).toBeLessThanOrEqual(1);
    expect(bandOf(bands, -1e9)).toBe(1);
    expect(bandOf(bands, 1e9)).toBe(7);
  });

  it('give the demo the same transects and strips as one run, in 1, 2 and 7 tiles', async () => {
    const { lines, zones, settings } = await load(DEMO_CANALS, DEMO_AQUIFER, {});
    const whole = screenDistrict(lines, zones, settings);
    for (const count of [1, 2, 7]) {
      const { result, parts } = splitAndGather(lines, zones, settings, count);
      // every tile has work, and (past one) none has it all
      for (const part of parts) expect(part.stations.length).toBeGreaterThan(0);
      sameColumns(whole, result, `demo in ${count} tiles`);
    }
  });

  it('refuses tiles that do not cover the district once', async () => {
    const { lines, zones, settings } = await load(DEMO_CANALS, DEMO_AQUIFER, {});
    const parts = [1, 2, 3].map((index) => screenTile(lines, zones, settings, { index, count: 3 }));
    const gather = (given: TilePart[]) => () => screenDistrict(lines, zones, settings, undefined, { tiles: { assemble: (stations) => assembleTiles(stations, given) } });
    expect(gather(parts.slice(0, 2))).toThrow('2 tiles for a split into 3');
    expect(gather([parts[0], parts[1], parts[1]])).toThrow('tile 2 of 3 is given twice');
  });
});
