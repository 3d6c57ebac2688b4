// Zones that should share an edge but were digitised with a small gap between them: the strip is
// still solved across the gap (joined to a neighbour zone) and the run says so; a real hole in
// the aquifer leaves the transects unsolved, with a warning, not a silent zero.
import { describe, expect, it } from 'vitest';
import { box, line, screenLocal } from './local-district.js';

const lines = [
  line('A', { kind: 'canal', stage_m: 105 }, [[0, 0], [2000, 0]]),
  line('B', { kind: 'canal', stage_m: 103 }, [[0, -400], [2000, -400]]),
];
const zone = { k_m_d: 10, base_m: 90, ground_m: 108 };

describe('gaps between zones', () => {
  it('bridges a 1 m digitising gap and still gives the closed-form seepage', () => {
    const result = screenLocal(lines, [box('N', zone, [-3000, -199.5, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -200.5])]);
    expect(result.strips).toHaveLength(1);
    // q = K (h0^2 - hL^2) / (2L) = 10 (225 - 169) / 800 = 0.7 m^2/d (Dupuit; Woessner and Poeter (2020), section 7.3 [published])
    expect(result.strips[0].qAM2PerDay).toBeCloseTo(0.7, 2);
    expect(result.warnings.join('\n')).toMatch(/cross small gaps between zones \(up to 1\.0 m\)/);
  });

  it('leaves a 100 m hole unsolved and says how many transect sides it cost', () => {
    const result = screenLocal(lines, [box('N', zone, [-3000, -150, 5000, 3000]), box('S', zone, [-3000, -3000, 5000, -250])]);
    expect(result.counts.facingsByReason['outside-aquifer']).toBeGreaterThan(0);
    expect(result.warnings.join('\n')).toMatch(/\d+ transect sides leave the aquifer zones/);
    expect(result.totals.lossM3PerDay).toBe(0);
  });
});
