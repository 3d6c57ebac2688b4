// A zone may hold a head along its part of the aquifer's outer edge (a river or a regional water
// table beyond the district); elsewhere the edge is no-flow. A canal 1 km from a held edge, with
// no recharge and every other edge no-flow, is one-dimensional Dupuit-Forchheimer flow:
// u(x) = h0^2 - (h0^2 - hL^2) x / L, q = K (h0^2 - hL^2) / (2L) (Dupuit-Forchheimer; W.W. Woessner
// and E.P. Poeter (2020), section 7.3 [published]).
import { describe, expect, it } from 'vitest';
import { cellAt } from '../../src/geometry/grid.js';
import { box, line, screenLocal } from './local-district.js';

const K = 10, BASE = 90, STAGE = 105, EDGE = 103;
const E0 = 300_000, N0 = 3_265_000;

function district(edgeHead: number | null) {
  const edge = edgeHead === null ? {} : { edge_head_m: edgeHead };
  return screenLocal(
    [line('C', { kind: 'canal', stage_m: STAGE }, [[0, -4000], [0, 4000]])],
    [
      box('inner', { k_m_d: K, base_m: BASE, ground_m: 110, recharge_mm_yr: 0 }, [-1000, -4000, 1000, 4000]),
      box('rim', { k_m_d: K, base_m: BASE, ground_m: 110, recharge_mm_yr: 0, ...edge }, [1000, -4000, 1100, 4000]),
    ],
  );
}

describe('a head held on the outer edge', () => {
  it('gives the one-dimensional water table between the canal and the edge, and closes the water balance with the edge terms', () => {
    const result = district(EDGE);
    const solve = result.district!;
    expect(solve).not.toBeNull();
    // the held cells are the rim's outermost column: their centres half a cell inside x = 1100
    const lengthM = 1100 - solve.grid.cellM / 2;
    const h0 = STAGE - BASE, hL = EDGE - BASE;
    for (const x of [200, 500, 800]) {
      const g = cellAt(solve.grid, E0 + x, N0);
      const centreX = solve.grid.originX + ((g % solve.grid.columns) + 0.5) * solve.grid.cellM - E0;
      const expected = BASE + Math.sqrt(h0 * h0 - ((h0 * h0 - hL * hL) * centreX) / lengthM);
      expect(Math.abs(solve.waterTableM[g] - expected), `x = ${centreX}`).toBeLessThan(0.01 * (expected - BASE));
    }
    // the canal loses what leaves across the edge: 8 km of q = K (h0^2 - hL^2) / (2L), within 2 % (the rim's ends are held too)
    const q = (K * (h0 * h0 - hL * hL)) / (2 * lengthM);
    const balance = solve.balance;
    expect(balance.edgeOutM3PerDay / (8000 * q)).toBeGreaterThan(0.98);
    expect(balance.edgeOutM3PerDay / (8000 * q)).toBeLessThan(1.02);
    expect(balance.residualRelative).toBeLessThan(1e-6);
    expect(Math.abs(balance.lineLossM3PerDay - balance.edgeOutM3PerDay + balance.edgeInM3PerDay)).toBeLessThan(1e-6 * balance.lineLossM3PerDay);
  });

  it('says so when a zone gives an edge head but meets the outer edge nowhere, and holds nothing there', () => {
    // the held zone is an island inside the other: none of its cells touches the aquifer's edge
    const result = screenLocal(
      [line('C', { kind: 'canal', stage_m: STAGE }, [[0, -4000], [0, 4000]])],
      [
        box('island', { k_m_d: K, base_m: BASE, ground_m: 110, recharge_mm_yr: 0, edge_head_m: EDGE }, [400, -500, 600, 500]),
        box('inner', { k_m_d: K, base_m: BASE, ground_m: 110, recharge_mm_yr: 0 }, [-1000, -4000, 1000, 4000]),
      ],
    );
    expect(result.warnings.join('\n')).toMatch(/1 zone gives an edge head but meets the aquifer's outer edge nowhere \(island\): the head is not used/);
    expect(result.district!.balance.edgeInM3PerDay + result.district!.balance.edgeOutM3PerDay).toBe(0);
  });

  it('is no-flow without one: the canal then loses nothing in steady state without recharge', () => {
    const solve = district(null).district!;
    expect(solve.balance.edgeInM3PerDay + solve.balance.edgeOutM3PerDay).toBe(0);
    expect(Math.abs(solve.balance.lineLossM3PerDay - solve.balance.lineGainM3PerDay)).toBeLessThan(1e-6);
  });
});
