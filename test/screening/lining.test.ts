// The lining planner against outside references: lining a canal facing a drain saves what the
// Dupuit-Forchheimer strip with a resistive bed gives in closed form; more resistance saves more;
// the programme follows its budget; a bad plan names the file, the reach and the key.
import { describe, expect, it } from 'vitest';
import { parseLiningPlan } from '../../src/input/lining-plan.js';
import { planLining, programme, type LiningPlan, type ReachOutcome } from '../../src/screening/lining.js';
import { DataError } from '../../src/shared/errors.js';
import { liningSection } from '../../src/report/lining-section.js';
import { profileOfFacing } from '../../src/screening/profile.js';
import { box, checkedLocal, line } from './local-district.js';

// A canal and a drain 400 m apart, 3 km long, in one zone that ends at their ends (no flow around them)
const K = 10, BASE = 90, H_CANAL = 15, H_DRAIN = 12, L = 400, LENGTH = 3000;
const district = (stripsOnly: boolean) =>
  checkedLocal(
    [
      line('C', { kind: 'canal', stage_m: BASE + H_CANAL, wetted_perimeter_m: 8 }, [[0, 0], [LENGTH, 0]]),
      line('D', { kind: 'drain', stage_m: BASE + H_DRAIN }, [[0, -L], [LENGTH, -L]]),
    ],
    [box('Z', { k_m_d: K, base_m: BASE, ground_m: 110, recharge_mm_yr: 0 }, [0, -L, LENGTH, 0])],
    { stripsOnly },
  );

function plan(resistanceD: number, extra: Partial<LiningPlan> = {}): LiningPlan {
  return {
    file: 'plan.json',
    reaches: [{ index: 0, id: 'R-1', lineId: 'C', fromM: null, toM: null, resistanceD, wettedPerimeterM: null, costPerKm: 100_000 }],
    lifeYears: 25,
    currency: 'money',
    budget: null,
    ...extra,
  };
}

describe('lining a canal that faces a drain', () => {
  it('saves what the closed form of a resistive bed gives, per metre of canal', () => {
    const { lines, zones, settings } = district(true);
    const resistanceD = 200;
    const outcome = planLining(lines, zones, settings, plan(resistanceD));
    const reach = outcome.reaches[0];
    expect(outcome.method).toBe('strips');
    // clean bed: q = K (h0^2 - hL^2) / (2L) (Dupuit-Forchheimer discharge; Bear (1972), Dynamics of Fluids
    // in Porous Media, section 8.2 [from memory]). Lined: the bed passes C (H - h0) with C = (P/2)/c per
    // side (H. Bouwer (1978), Groundwater Hydrology [from memory]), so (K/2L) h0^2 + C h0 - (K hL^2/2L + C H) = 0 [derived]
    const qClean = (K * (H_CANAL ** 2 - H_DRAIN ** 2)) / (2 * L);
    const C = 8 / 2 / resistanceD, a = K / (2 * L);
    const h0 = (-C + Math.sqrt(C * C + 4 * a * (a * H_DRAIN ** 2 + C * H_CANAL))) / (2 * a);
    const qLined = C * (H_CANAL - h0);
    // per metre of canal, over the canal's solved length (its stations cover its length)
    const perMetreNow = reach.lineLossNowM3PerDay / LENGTH, perMetreLined = reach.lineLossLinedM3PerDay / LENGTH;
    expect(perMetreNow / qClean).toBeGreaterThan(0.99);
    expect(perMetreNow / qClean).toBeLessThan(1.01);
    expect(perMetreLined / qLined).toBeGreaterThan(0.99);
    expect(perMetreLined / qLined).toBeLessThan(1.01);
    // the canal is the only canal: what the canals keep is what it stops losing
    expect(reach.savedM3PerDay).toBeCloseTo(reach.lineLossNowM3PerDay - reach.lineLossLinedM3PerDay, 6);
    // cost per 1,000 m^3 over the life: cost / (saved per year x years / 1000), undiscounted [derived]
    expect(reach.costPer1000M3).toBeCloseTo((100_000 * 3) / ((reach.savedM3PerDay * 365.25 * 25) / 1000), 6);
  });

  it('saves more with a more resistant lining', () => {
    const { lines, zones, settings } = district(true);
    const saved = [50, 200, 1000].map((c) => planLining(lines, zones, settings, plan(c)).reaches[0]);
    expect(saved[0].savedM3PerDay).toBeGreaterThan(0);
    expect(saved[1].savedM3PerDay).toBeGreaterThan(saved[0].savedM3PerDay);
    expect(saved[2].savedM3PerDay).toBeGreaterThan(saved[1].savedM3PerDay);
    // lining lowers the water table between the lines: the strip's smallest depth grows
    for (const outcome of saved) for (const strip of outcome.affectedStrips) expect(strip.minDepthLinedM).toBeGreaterThan(strip.minDepthNowM);
  });

  it('saves what the strips say on a parallel pair, by the district solve too', () => {
    const strips = district(true), whole = district(false);
    const byStrips = planLining(strips.lines, strips.zones, strips.settings, plan(200)).reaches[0];
    const byDistrict = planLining(whole.lines, whole.zones, whole.settings, plan(200));
    expect(byDistrict.method).toBe('district');
    // the strips are exact between two parallel lines: the district solve agrees within 3% at its default cell
    expect(byDistrict.reaches[0].savedM3PerDay / byStrips.savedM3PerDay).toBeGreaterThan(0.97);
    expect(byDistrict.reaches[0].savedM3PerDay / byStrips.savedM3PerDay).toBeLessThan(1.03);
  });

  it('lines only the chainage range asked: half the canal saves about half', () => {
    const { lines, zones, settings } = district(true);
    const whole = planLining(lines, zones, settings, plan(200)).reaches[0];
    const half = planLining(lines, zones, settings, plan(200, { reaches: [{ ...plan(200).reaches[0], fromM: 0, toM: LENGTH / 2 }] })).reaches[0];
    expect(half.lengthM).toBeCloseTo(LENGTH / 2, 6);
    expect(half.savedM3PerDay / whole.savedM3PerDay).toBeGreaterThan(0.45);
    expect(half.savedM3PerDay / whole.savedM3PerDay).toBeLessThan(0.55);
  });
});

describe("the lining's report section", () => {
  it('draws a transect of the lined reach before and after: the water table lower beside the lined canal', () => {
    const { lines, zones, settings } = district(true);
    const outcome = planLining(lines, zones, settings, plan(200));
    const html = liningSection(outcome);
    expect(html).toContain('<section id="lining">');
    expect(html).toContain('Before and after');
    const polylines = [...html.matchAll(/class="profile-water-table" points="([^"]*)"/g)].map((m) => m[1].split(' ').map((p) => p.split(',').map(Number)));
    expect(polylines).toHaveLength(2);
    expect(polylines[0]).not.toEqual(polylines[1]);
    // what the two drawings show: on the drawn transect the canal's bank head drops once it is lined
    const strip = outcome.resultNow.strips[0];
    const stripLined = outcome.resultProgramme!.strips[0];
    const facing = strip.lineAId === 'C' ? strip.facingsA[Math.floor(strip.facingsA.length / 2)] : strip.facingsB[Math.floor(strip.facingsB.length / 2)];
    const before = profileOfFacing(outcome.resultNow, strip, facing)!, after = profileOfFacing(outcome.resultProgramme!, stripLined, facing)!;
    expect(after.bankHeadAM).toBeLessThan(before.bankHeadAM - 0.1);
    expect(after.seepageAM2PerDay).toBeLessThan(before.seepageAM2PerDay);
  });
});

describe('the programme', () => {
  const outcome = (id: string, km: number, saved: number, cost: number): ReachOutcome =>
    ({ reach: { index: 0, id, lineId: 'X', fromM: 0, toM: km * 1000, resistanceD: 100, wettedPerimeterM: null, costPerKm: cost / km }, lengthM: km * 1000, savedM3PerDay: saved, savedM3PerDayKm: saved / km, cost }) as ReachOutcome;
  const reaches = [outcome('A', 4, 400, 100), outcome('B', 2, 300, 300), outcome('C', 3, 150, 30), outcome('D', 1, -5, 10)];

  it('takes the best saving per km first while the km budget lasts, passing over a reach that does not fit', () => {
    const { steps, rankedBy } = programme(reaches, plan(1, { budget: { km: 5 } }));
    expect(rankedBy).toBe('saving per km');
    // per km: B 150, A 100, C 50; D saves nothing. B (2 km), then A (4 km) does not fit, C (3 km) does
    expect(steps.map((s) => s.outcome.reach.id)).toEqual(['B', 'C']);
    expect(steps.map((s) => s.kmTotal)).toEqual([2, 5]);
    expect(steps[1].savedM3PerDayTotal).toBe(450);
  });

  it('ranks by saving per money under a money budget', () => {
    const { steps, rankedBy } = programme(reaches, plan(1, { budget: { money: 140 } }));
    expect(rankedBy).toBe('saving per money');
    // per money: C 5, A 4, B 1: C (30), then A (130 in all), then B does not fit
    expect(steps.map((s) => s.outcome.reach.id)).toEqual(['C', 'A']);
    expect(steps[1].costTotal).toBe(130);
  });
});

describe('a bad lining plan', () => {
  const bad = (text: string) => () => parseLiningPlan('plan.json', text);
  const reach = '{"id": "R-1", "line": "C", "lining": {"resistance_d": 100}}';
  it.each([
    ['{"reaches": []}', /plan\.json.*reaches.*at least one reach/],
    [`{"reaches": [${reach}, ${reach}]}`, /plan\.json.*R-1.*given twice/],
    ['{"reaches": [{"id": "R-1", "line": "C"}]}', /plan\.json.*R-1.*lining.*no lining/],
    ['{"reaches": [{"id": "R-1", "line": "C", "lining": {"thickness_m": 0.1}}]}', /R-1.*lining.*"k_m_d"/],
    ['{"reaches": [{"id": "R-1", "line": "C", "lining": {"resistance_d": -3}}]}', /R-1.*lining\.resistance_d.*positive/],
    ['{"reaches": [{"id": "R-1", "line": "C", "lining": {"resistance_d": 5}, "form_m": 3}]}', /R-1.*form_m.*unknown key/],
    ['{"reaches": [{"id": "R-1", "line": "C", "from_m": 500, "to_m": 100, "lining": {"resistance_d": 5}}]}', /R-1.*to_m.*beyond from_m/],
    [`{"budget": {"money": 10}, "reaches": [${reach}]}`, /R-1.*cost_per_km.*budget is in money/],
    [`{"budget": {"km": 1, "money": 10}, "reaches": [${reach}]}`, /budget.*one of/],
    ['{"reaches": [1]}', /plan\.json.*reach 0 must be a JSON object/],
    ['{"reaches": [', /not valid JSON/],
  ])('refuses %s', (text, message) => {
    expect(bad(text)).toThrow(DataError);
    expect(bad(text)).toThrow(message);
  });

  it('names a reach whose line is not in the run, or whose range runs past its end', () => {
    const { lines, zones, settings } = district(true);
    expect(() => planLining(lines, zones, settings, plan(100, { reaches: [{ ...plan(100).reaches[0], lineId: 'C-99' }] }))).toThrow(/plan\.json.*R-1.*line.*no line "C-99"/);
    expect(() => planLining(lines, zones, settings, plan(100, { reaches: [{ ...plan(100).reaches[0], fromM: 100, toM: 9000 }] }))).toThrow(/R-1.*to_m.*past the end of line "C"/);
  });

  it('refuses a plan of more reaches than the screenings a run may take, before any work', () => {
    const many = Array.from({ length: 201 }, (_, i) => `{"id": "R-${i}", "line": "C", "lining": {"resistance_d": 5}}`).join(',');
    expect(bad(`{"reaches": [${many}]}`)).toThrow(/201 reaches: at most 200/);
  });
});
