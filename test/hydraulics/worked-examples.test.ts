// Worked examples with their answers, each checked to the precision it was given with.
// Sign convention of the solver: ownSeepageM2PerDay = q(0) and partnerSeepageM2PerDay = -q(L), where q is
// the flow towards line b; a book's "q at x" maps to those with the signs shown in each test.
import { describe, expect, it } from 'vitest';
import { solveStrip, type StripProblem, type StripSolution } from '../../src/hydraulics/solve-strip.js';
import { rechargeToMPerDay } from '../../src/shared/units.js';
import { expectNear } from './strip-fixtures.js';

function solved(problem: StripProblem): StripSolution {
  const result = solveStrip(problem);
  if (!result.ok) throw new Error(`Unexpected failure: ${result.reason} (${result.detail}).`);
  return result;
}

/** |got - printed| within half a unit of the printed number's last digit. */
function expectPrinted(got: number, printed: string, what: string): void {
  const decimals = printed.includes('.') ? printed.split('.')[1].length : 0;
  expectNear(got, Number(printed), 0.5 * 10 ** -decimals, `${what} (printed ${printed})`);
}

describe('two rivers with recharge: C.W. Fetter, Applied Hydrogeology, Dupuit example [from memory]', () => {
  // Two rivers 1000 m apart, K = 0.5 m/d, water 20 m and 18 m above the base, 15 cm/yr of rain
  // less 10 cm/yr of evaporation. Inputs seen second-hand, printed answers recalled (REFERENCES.md).
  // The book's q(x) is the flow towards the second river: q(0) = seepage a, q(L) = -seepage b.
  const rivers = (rechargeMPerDay: number): StripProblem => ({
    ownStageM: 20,
    partnerStageM: 18,
    baseM: 0,
    zones: [{ lengthM: 1000, kMPerDay: 0.5, rechargeMPerDay, groundM: 30 }],
  });
  // The book most likely turned 5 cm/yr into m/d with a 365-day year; we do the same here.
  const bookRecharge = 0.05 / 365;

  it('printed answers: q(0) -0.05 m^2/d, q(L) 0.087 m^2/d, divide 361 m, h_max 20.9 m', () => {
    const s = solved(rivers(bookRecharge));
    expectPrinted(s.ownSeepageM2PerDay, '-0.05', 'q at the first river');
    expectPrinted(-s.partnerSeepageM2PerDay, '0.087', 'q at the second river');
    expectPrinted(s.divideOffsetM, '361', 'divide from the first river (m)');
    expectPrinted(s.peakWaterTableM, '20.9', 'maximum height of the water table (m)');
    expect(s.peakOffsetM).toBe(s.divideOffsetM);
  });

  it('recomputed to more digits [derived]: -0.04949, 0.08749, 361.3 m, 20.875 m', () => {
    // q(0) = 0.5 (400 - 324)/2000 - (0.05/365)(500) = 0.019 - 0.068493 = -0.049493
    // x_d = 500 - 0.5 (76)/(2 (0.05/365) 1000) = 500 - 138.7 = 361.3
    // h_max^2 = 362 + (0.05/365)(10^6)/2 + 0.5 (76^2)/(4 (0.05/365) 10^6) = 362 + 68.493 + 5.2706 = 435.76
    const s = solved(rivers(bookRecharge));
    expectPrinted(s.ownSeepageM2PerDay, '-0.04949', 'q(0)');
    expectPrinted(-s.partnerSeepageM2PerDay, '0.08749', 'q(L)');
    expectPrinted(s.divideOffsetM, '361.3', 'divide');
    expectPrinted(s.peakWaterTableM, '20.875', 'h_max');
  });

  it('a 365.25-day year (doab units) still gives the printed answers', () => {
    const s = solved(rivers(rechargeToMPerDay(50, 'mm/yr')));
    expect(rechargeToMPerDay(50, 'mm/yr')).not.toBe(bookRecharge);
    expectPrinted(s.ownSeepageM2PerDay, '-0.05', 'q(0)');
    expectPrinted(-s.partnerSeepageM2PerDay, '0.087', 'q(L)');
    expectPrinted(s.divideOffsetM, '361', 'divide');
    expectPrinted(s.peakWaterTableM, '20.9', 'h_max');
  });

  it('without recharge: 0.019 m^2/d from the first river to the second', () => {
    // q = K (h0^2 - hL^2)/(2L) = 0.5 (400 - 324)/2000 = 0.019 [derived; REFERENCES.md]
    const s = solved(rivers(0));
    expectPrinted(s.ownSeepageM2PerDay, '0.019', 'q(0)');
    expectNear(s.ownSeepageM2PerDay, 0.019, 1e-15, 'q(0) exactly');
    expectNear(s.partnerSeepageM2PerDay, -0.019, 1e-15, 'the second river gains the same');
    expect(s.divideOffsetM).toBeNaN();
  });
});

describe('irrigated strip between two canals, from the equations of Woessner and Poeter (2020), 7.3', () => {
  // Our own numbers worked by hand with the published equations of W.W. Woessner and E.P. Poeter
  // (2020), Hydrogeologic Properties of Earth Materials and Principles of Groundwater Flow, The
  // Groundwater Project, section 7.3 [published equations; numbers derived]:
  // canals 300 m apart, stages 105 m and 103 m over a base at 95 m (h0 = 10 m, hL = 8 m), K = 6 m/d,
  // percolation from paddies N = 3 mm/d = 0.003 m/d.
  //   h0^2 - hL^2 = 100 - 64 = 36;  K (h0^2 - hL^2)/(2L) = 6 (36)/600 = 0.36;  N L/2 = 0.45
  //   q(0) = 0.36 - 0.45 = -0.09 m^2/d   (canal a gains 0.09)
  //   q(L) = 0.36 + 0.45 =  0.81 m^2/d   (canal b gains 0.81); together N L = 0.9
  //   divide inside since N L^2/K = 0.003 (90000)/6 = 45 > 36
  //   x_d = L/2 - K (36)/(2 N L) = 150 - 216/1.8 = 150 - 120 = 30 m
  //   u_max = (100 + 64)/2 + N L^2/(4K) + K (36^2)/(4 N L^2) = 82 + 11.25 + 7776/1080 = 82 + 11.25 + 7.2
  //         = 100.45 m^2, h_max = 10.0225 m (10.0225^2 = 100.4505), peak 105.0225 m
  //   check: u(30) = 100 - 36 (30/300) + (0.003/6)(30)(270) = 100 - 3.6 + 4.05 = 100.45
  const problem: StripProblem = {
    ownStageM: 105,
    partnerStageM: 103,
    baseM: 95,
    zones: [{ lengthM: 300, kMPerDay: 6, rechargeMPerDay: 0.003, groundM: 110 }],
  };

  it('both canals gain: 0.09 and 0.81 m^2/d', () => {
    const s = solved(problem);
    expectNear(s.ownSeepageM2PerDay, -0.09, 1e-12, 'seepage a');
    expectNear(s.partnerSeepageM2PerDay, -0.81, 1e-12, 'seepage b');
  });

  it('divide 30 m from canal a, peak 105.0225 m, depth below ground 4.9775 m', () => {
    const s = solved(problem);
    expectNear(s.divideOffsetM, 30, 1e-9, 'divide');
    expectNear(s.peakOffsetM, 30, 1e-9, 'peak offset');
    expectPrinted(s.peakWaterTableM, '105.0225', 'peak head');
    expectNear((s.peakWaterTableM - 95) ** 2, 100.45, 1e-9, 'u_max');
    expectPrinted(s.minDepthM, '4.9775', 'smallest depth');
    expectNear(s.fluxAt(30), 0, 1e-12, 'no flow at the divide');
  });
});

describe('two zones with recharge, worked by hand [derived]', () => {
  // The zone solution of Woessner and Poeter (2020) 7.3 in each zone, joined by continuity of u and q
  // at the edge (x = 400 m): with a_i = K_i/l_i, (a_1 + a_2) U_1 = a_1 U_0 + a_2 U_2 + N_1 l_1 + N_2 l_2.
  // h0 = 12, hL = 10; zone 1: 400 m, K 4, N 1e-4 (a_1 = 0.01, N l = 0.04);
  // zone 2: 500 m, K 10, N 2e-4 (a_2 = 0.02, N l = 0.1).
  //   0.03 U_1 = 0.01 (144) + 0.02 (100) + 0.14 = 3.58  =>  U_1 = 358/3 = 119.333 m^2
  //   q(0) = -(K_1/(2 l_1))(U_1 - U_0) - N_1 l_1/2 = 0.005 (74/3) - 0.02 = 0.31/3 = 0.10333 m^2/d
  //   q(L) = -(K_2/(2 l_2))(U_2 - U_1) + N_2 l_2/2 = 0.01 (58/3) + 0.05 = 0.73/3 = 0.24333 m^2/d
  //   q(0) + 0.14 = q(L); q > 0 throughout, so no divide and the peak is canal a.
  it('canal a loses 0.10333, canal b gains 0.24333 m^2/d; h at the edge sqrt(358/3)', () => {
    const s = solved({
      ownStageM: 12,
      partnerStageM: 10,
      baseM: 0,
      zones: [
        { lengthM: 400, kMPerDay: 4, rechargeMPerDay: 1e-4, groundM: 20 },
        { lengthM: 500, kMPerDay: 10, rechargeMPerDay: 2e-4, groundM: 20 },
      ],
    });
    expectNear(s.ownSeepageM2PerDay, 0.31 / 3, 1e-12, 'seepage a');
    expectNear(s.partnerSeepageM2PerDay, -0.73 / 3, 1e-12, 'seepage b');
    expectNear(s.headAt(400), Math.sqrt(358 / 3), 1e-12, 'head at the zone edge');
    expect(s.divideOffsetM).toBeNaN();
    expect(s.peakOffsetM).toBe(0);
  });
});
