// Checks against piezometers on districts of our own: wells on a strip read back the Dupuit closed
// form, a known conductivity error is recovered by the fit, and bad wells are named.
import { describe, expect, it } from 'vitest';
import { fitConductivity, scaleZones } from '../../src/screening/k-fit.js';
import { screenDistrict } from '../../src/screening/screen.js';
import { checkWells, compareWells, type WellRecord } from '../../src/screening/wells.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';
import { box, checkedLocal, line, lonLat } from './local-district.js';

const YEAR_DAYS = 365.25; // Julian year, as src/shared/units.ts [published]
const BASE = 90, H_CANAL = 15, H_DRAIN = 12, L = 400, LENGTH = 3000, K = 10, RECHARGE_MM_YR = 400;
const N = RECHARGE_MM_YR / 1000 / YEAR_DAYS;

// the lines run on the centres of the district grid's cells (its 20 m cells snap to multiples of the
// cell; the layout's origin is one), and the aquifer ends half a cell beyond each line
const Y0 = 10;
const district = (k: number, stripsOnly = true) =>
  checkedLocal(
    [
      line('C', { kind: 'canal', stage_m: BASE + H_CANAL }, [[0, Y0], [LENGTH, Y0]]),
      line('D', { kind: 'drain', stage_m: BASE + H_DRAIN }, [[0, Y0 - L], [LENGTH, Y0 - L]]),
    ],
    [box('Z', { k_m_d: k, base_m: BASE, ground_m: 120, recharge_mm_yr: RECHARGE_MM_YR }, [0, Y0 - L - 10, LENGTH, Y0 + 10])],
    { stripsOnly },
  );

// Dupuit-Forchheimer between two lines with recharge: h^2(x) = h0^2 - (h0^2 - hL^2) x/L + (N/K) x (L - x), x from the
// canal (Bear (1972), Dynamics of Fluids in Porous Media, section 8.2 [from memory])
const closedForm = (x: number, k = K) => BASE + Math.sqrt(H_CANAL ** 2 - ((H_CANAL ** 2 - H_DRAIN ** 2) * x) / L + (N / k) * x * (L - x));

function wellsAt(distances: number[], along = 1500, k = K): WellRecord[] {
  return distances.map((x, i) => {
    const [[lon, lat]] = lonLat([[along + 37 * i, Y0 - x]]);
    return { index: i, id: `W-${i}`, lon, lat, observedM: closedForm(x, k), date: null };
  });
}

describe('wells against the strips', () => {
  it('read back the closed form to 1 mm where they stand on a strip', () => {
    const { lines, zones, settings } = district(K);
    const result = screenDistrict(lines, zones, settings);
    const comparison = compareWells(result, wellsAt([20, 100, 200, 250, 380]), 'wells.geojson');
    for (const figure of comparison.figures) {
      expect(figure.method).toBe('strips');
      expect(Math.abs(figure.residualM)).toBeLessThan(0.001);
    }
    expect(comparison.all.count).toBe(5);
    expect(comparison.all.rmseM).toBeLessThan(0.001);
    expect(comparison.byZone).toEqual([{ zoneId: 'Z', summary: comparison.all }]);
  });

  it('read the district solve where it ran: within 2 cm of the closed form at the default cell', () => {
    const { lines, zones, settings } = district(K, false);
    const comparison = compareWells(screenDistrict(lines, zones, settings), wellsAt([60, 200, 330]), 'wells.geojson');
    for (const figure of comparison.figures) {
      expect(figure.method).toBe('district');
      expect(Math.abs(figure.residualM)).toBeLessThan(0.02);
    }
  });

  it('say so for a well outside every zone', () => {
    const { lines, zones, settings } = district(K);
    const [[lon, lat]] = lonLat([[1500, 900]]);
    const comparison = compareWells(screenDistrict(lines, zones, settings), [{ index: 0, id: 'far', lon, lat, observedM: 100, date: null }], 'wells.geojson');
    expect(comparison.figures[0].note).toBe('outside every aquifer zone');
    expect(comparison.uncovered).toBe(1);
    expect(comparison.all.count).toBe(0);
  });
});

describe('the conductivity fit', () => {
  it('recovers a conductivity halved in the inputs to within 5%', () => {
    // the wells read the water table of K = 10 m/d; the inputs say 5 m/d: the fit should suggest 2
    const { lines, zones, settings } = district(K / 2);
    const fit = fitConductivity(lines, zones, settings, wellsAt([50, 120, 200, 280, 350]), 'wells.geojson');
    expect(fit.zones).toHaveLength(1);
    expect(fit.zones[0].wells).toBe(5);
    expect(Math.abs(fit.zones[0].multiplier / 2 - 1)).toBeLessThan(0.05);
    expect(fit.rmseAfterM).toBeLessThan(fit.rmseBeforeM / 10);
    // applied, the wells fit again
    const refit = compareWells(screenDistrict(lines, scaleZones(zones, fit.zones.map((z) => z.multiplier)), settings), wellsAt([50, 120, 200, 280, 350]), 'wells.geojson');
    expect(refit.all.rmseM).toBeLessThan(0.01);
  });

  it('leaves a zone with no well at 1', () => {
    const { lines, zones, settings } = district(K);
    const [[lon, lat]] = lonLat([[1500, 900]]);
    const fit = fitConductivity(lines, zones, settings, [{ index: 0, id: 'far', lon, lat, observedM: 100, date: null }], 'wells.geojson');
    expect(fit.zones[0]).toMatchObject({ multiplier: 1, wells: 0, atBound: false, fitted: false });
  });

  it('fits no more zones than its budget, and leaves the rest at 1, marked', () => {
    const { lines, zones, settings } = district(K / 2);
    const fit = fitConductivity(lines, zones, settings, wellsAt([50, 200, 350]), 'wells.geojson', 0);
    expect(fit.zones[0]).toMatchObject({ multiplier: 1, wells: 3, fitted: false });
    expect(fit.screenings).toBe(1);
  });
});

describe('bad wells', () => {
  const point = (id: unknown, properties: Record<string, unknown>, coordinates: unknown = [30.5, 29.5]) => ({ type: 'Feature', properties: { id, ...properties }, geometry: { type: 'Point', coordinates } });
  it('names file, feature and field for each problem of each well', () => {
    const { problems } = checkWells('wells.geojson', [point('W-1', { water_table_m: 'high' }), point('W-1', { water_table_m: 101 }), { type: 'Feature', properties: { id: 'W-3', water_table_m: 100 }, geometry: { type: 'LineString', coordinates: [[0, 0], [1, 1]] } }], DEFAULT_RULES);
    const text = problems.map((p) => `${p.place.featureIndex} ${p.place.featureId} ${p.place.field}: ${p.message}`);
    expect(text).toEqual([
      '0 W-1 water_table_m: expected a finite number (the observed water-table elevation), found "high"',
      '1 W-1 id: duplicate id "W-1"',
      '2 W-3 geometry: expected a Point with finite coordinates, found LineString',
    ]);
  });

  it('names the attributes found when the observed elevation is missing from every well', () => {
    const { problems } = checkWells('wells.geojson', [point('W-1', { WL: 101 })], DEFAULT_RULES);
    expect(problems[0].message).toMatch(/no well has the attribute "water_table_m"; attributes found: "id", "WL"\. Name the attribute in the config's "fields\.wells"/);
  });
});
