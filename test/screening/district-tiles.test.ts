// The district solve in tiles, stitched, against one whole solve of the same district (the
// reference is our own: the whole solve, which district.test.ts holds to the Dupuit closed forms).
// The tolerances are the ones the stitch states (DISTRICT_TILE_* in src/screening/district.ts).
// The demo is gathered from tiles by test/cli/tiles.test.ts (at a 40 m cell, to keep the suite
// fast); bench/district-tiles.bench.ts measures a 200-line district at the default cell.
import { describe, expect, it } from 'vitest';
import {
  DISTRICT_TILE_HEAD_TOLERANCE_M,
  DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY,
  DISTRICT_TILE_LOSS_TOLERANCE,
  districtSolve,
  type DistrictInputs,
  type DistrictResult,
} from '../../src/screening/district.js';
import { districtTilePiece, type DistrictTilePiece } from '../../src/screening/district-tiles.js';
import { districtInputsOfResult } from '../../src/screening/screen.js';
import { DEFAULT_SETTINGS, type ScreenSettings } from '../../src/shared/settings.js';
import { box, line, screenLocal } from './local-district.js';

const inputsOf = districtInputsOfResult;

const pieces = (inputs: DistrictInputs, settings: ScreenSettings, count: number, options: { coarseCheck?: boolean } = {}) =>
  Array.from({ length: count }, (_, i) => districtTilePiece(inputs, settings, { index: i + 1, count }, options));

/** Lines whose stitched loss, and cells whose stitched water table, miss the stated tolerances. */
function misfits(whole: DistrictResult, stitched: DistrictResult, ids: string[]): string[] {
  const out: string[] = [];
  whole.lineLossM3PerDay.forEach((loss, l) => {
    const allowed = Math.max(DISTRICT_TILE_LOSS_TOLERANCE * Math.abs(loss), DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY);
    if (!(Math.abs(stitched.lineLossM3PerDay[l] - loss) <= allowed)) out.push(`${ids[l]}: ${stitched.lineLossM3PerDay[l].toFixed(1)} stitched, ${loss.toFixed(1)} whole`);
  });
  let worstM = 0;
  for (let g = 0; g < whole.waterTableM.length; g++) {
    if (Number.isNaN(whole.waterTableM[g]) !== Number.isNaN(stitched.waterTableM[g])) out.push(`cell ${g}: in the aquifer in one solve only`);
    const d = Math.abs(stitched.depthM[g] - whole.depthM[g]);
    if (d > worstM) worstM = d;
  }
  if (!(worstM <= DISTRICT_TILE_HEAD_TOLERANCE_M)) out.push(`depths differ by up to ${worstM.toFixed(3)} m`);
  return out;
}

// An invented district 6 km by 2 km of our own: two zones on different bases (the Picard path), an
// edge head on the east zone, a drain whose bed resists, lines along and across the bands.
const BASE_W = 90, BASE_E = 88;
function generated(settings: Partial<ScreenSettings> = {}) {
  return screenLocal(
    [
      line('A', { kind: 'canal', stage_start_m: 104, stage_end_m: 101 }, [[100, 1500], [2500, 1620], [5900, 1480]]),
      line('B', { kind: 'drain', stage_m: 97, bed_resistance_d: 5, wetted_perimeter_m: 6, water_depth_m: 1.5 }, [[100, 380], [5900, 420]]),
      line('C', { kind: 'canal', stage_m: 103 }, [[2230, 600], [2210, 1350]]),
      line('D', { kind: 'drain', stage_m: 98.5 }, [[300, 650], [1300, 1250]]),
      line('E', { kind: 'canal', stage_m: 102 }, [[4300, 700], [5600, 1200]]),
    ],
    [
      box('W', { k_m_d: 10, base_m: BASE_W, ground_m: 106, recharge_mm_yr: 300 }, [0, 0, 3000, 2000]),
      box('E', { k_m_d: 25, base_m: BASE_E, ground_m: 105, recharge_mm_yr: 150, edge_head_m: 99 }, [3000, 0, 6000, 2000]),
    ],
    { stripsOnly: true, ...settings },
  );
}

describe('district solve in tiles on a generated district', () => {
  const result = generated();
  const inputs = inputsOf(result);
  const settings = { ...DEFAULT_SETTINGS, ...result.settings };
  const ids = result.lines.map((l) => l.id);
  const whole = districtSolve(inputs, settings);

  it('gives exactly the whole solve with one tile', () => {
    const stitched = districtSolve(inputs, settings, { pieces: pieces(inputs, settings, 1) });
    expect(stitched).toEqual(whole);
  });

  it('stitches 2, 3 and 7 tiles within the stated tolerances, the coarse check exactly, and says so', () => {
    expect(whole.picardIterations).toBeGreaterThan(0);
    expect(whole.grid.columns).toBeGreaterThan(whole.grid.rows);
    for (const count of [2, 3, 7]) {
      const stitched = districtSolve(inputs, settings, { pieces: pieces(inputs, settings, count) });
      expect(misfits(whole, stitched, ids), `${count} tiles`).toEqual([]);
      expect(stitched.lineLossCoarseM3PerDay).toEqual(whole.lineLossCoarseM3PerDay);
      expect(stitched.status).toBe('converged');
      const said = stitched.warnings.find((w) => w.startsWith(`district solve in ${count} tiles`));
      expect(said).toMatch(/margin of 1000 m \(50 cells\).*held at the heads of the whole district solved at a 40 m cell/);
      // the stitched heads do not balance as one solve does, and the figures say by how much
      expect(stitched.balance.residualRelative).toBeGreaterThan(whole.balance.residualRelative);
      expect(stitched.balance.residualRelative).toBeLessThan(0.01);
    }
  });

  it('stitches pieces read back from their plain parts (JSON header, copied arrays) to the same figures', () => {
    const made = pieces(inputs, settings, 2, { coarseCheck: false });
    const readBack: DistrictTilePiece[] = made.map(({ header, arrays }) => ({
      header: JSON.parse(JSON.stringify(header)),
      arrays: Object.fromEntries(Object.entries(arrays).map(([name, values]) => [name, values.slice()])),
    }));
    for (const { header } of made) for (const value of Object.values(header)) expect(['number', 'string', 'boolean']).toContain(value === null ? 'number' : typeof value);
    expect(districtSolve(inputs, settings, { pieces: readBack, coarseCheck: false })).toEqual(districtSolve(inputs, settings, { pieces: made, coarseCheck: false }));
  });

  it('refuses pieces that are not every tile of one split of this grid, naming the tile', () => {
    const three = pieces(inputs, settings, 3, { coarseCheck: false });
    const solve = (given: DistrictTilePiece[], coarseCheck = false) => () => districtSolve(inputs, settings, { pieces: given, coarseCheck });
    expect(solve(three.slice(0, 2))).toThrow('district tile 1 of 3 is one of 3 tiles, but 2 pieces were given.');
    expect(solve([three[0], three[1], three[1]])).toThrow('district tile 2 of 3 is given twice.');
    expect(solve([...three, ...pieces(inputs, settings, 1, { coarseCheck: false })])).toThrow(/district tile 1 of 3 is one of 3 tiles, but 4 pieces were given/);
    expect(solve(three, true)).toThrow('district tile 1 of 3 was solved without the coarse check');
    // tiles of the same district on another grid: a 25 m cell
    const other = pieces(inputs, { ...settings, districtCellM: 25 }, 3, { coarseCheck: false });
    expect(solve([three[0], other[1], three[2]])).toThrow(/^district tile 2 of 3 does not fit this district: its cellM is 25, the district's 20/);
    expect(() => districtTilePiece(inputs, settings, { index: 4, count: 3 })).toThrow('Unexpected tile index: 4 of 3.');
    expect(() => districtTilePiece(inputs, settings, { index: 1, count: 10_000 })).toThrow(/Unexpected tile count: 10000 \(the district grid is \d+ columns wide/);
  });
});
