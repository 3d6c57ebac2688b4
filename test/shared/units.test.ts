// Unit factors against their definitions.
import { describe, expect, it } from 'vitest';
import {
  CONDUCTIVITY_UNITS,
  DAYS_PER_YEAR,
  LENGTH_UNITS,
  METRES_PER_FOOT,
  RECHARGE_UNITS,
  SECONDS_PER_DAY,
  kFromMPerDay,
  kToMPerDay,
  lengthToM,
  m3PerDayToM3PerYear,
  rechargeFromMPerDay,
  rechargeToMPerDay,
} from '../../src/shared/units.js';
import { expectNear } from '../hydraulics/strip-fixtures.js';

describe('time', () => {
  it('1 d = 24 h = 86 400 s', () => {
    // BIPM, The International System of Units (SI Brochure, 9th ed., 2019), table of non-SI units
    // accepted for use with the SI: day, d = 24 h = 86 400 s [from memory]
    expect(SECONDS_PER_DAY).toBe(24 * 60 * 60);
    expect(SECONDS_PER_DAY).toBe(86_400);
  });

  it('a year is the Julian year of 365.25 d', () => {
    // the Julian year, a = 365.25 d = 31 557 600 s, as defined by the International Astronomical
    // Union (IAU Style Manual, G.A. Wilkins 1989) [from memory]
    expect(DAYS_PER_YEAR).toBe(365.25);
    expect(DAYS_PER_YEAR * SECONDS_PER_DAY).toBe(31_557_600);
    expect(m3PerDayToM3PerYear(1)).toBe(365.25);
    expect(m3PerDayToM3PerYear(2000)).toBe(730_500);
  });
});

describe('hydraulic conductivity', () => {
  it('1 m/s = 86 400 m/d and 1 cm/s = 864 m/d exactly', () => {
    // 1 cm/s = 0.01 m/s x 86 400 s/d = 864 m/d [derived: 1 cm = 0.01 m, 1 d = 86 400 s, SI Brochure, BIPM, 9th ed. 2019]
    expect(kToMPerDay(1, 'm/d')).toBe(1);
    expect(kToMPerDay(1, 'm/s')).toBe(86_400);
    expect(kToMPerDay(1, 'cm/s')).toBe(864);
    expect(kToMPerDay(250, 'cm/s')).toBe(216_000);
    expect(kFromMPerDay(864, 'cm/s')).toBe(1);
    expect(kFromMPerDay(86_400, 'm/s')).toBe(1);
  });

  it("Fetter's well-sorted sand, 1e-3 to 1e-1 cm/s, is 0.864 to 86.4 m/d", () => {
    // range from C.W. Fetter, Applied Hydrogeology, table of K for unconsolidated sediments [from memory]
    expectNear(kToMPerDay(1e-3, 'cm/s'), 0.864, 1e-15, 'lower end');
    expectNear(kToMPerDay(1e-1, 'cm/s'), 86.4, 1e-13, 'upper end');
  });

  it.each(CONDUCTIVITY_UNITS.map((u) => [u]))('%s converts there and back', (unit) => {
    for (const value of [1e-9, 3.7e-4, 1, 42, 1e4]) {
      expectNear(kFromMPerDay(kToMPerDay(value, unit), unit), value, 1e-15 * value, `${value} ${unit}`);
    }
  });
});

describe('recharge', () => {
  it('mm/yr uses the Julian year: 365.25 mm/yr = 1 mm/d', () => {
    expectNear(rechargeToMPerDay(365.25, 'mm/yr'), 1e-3, 1e-18, '365.25 mm/yr');
    expectNear(rechargeToMPerDay(100, 'mm/yr'), 0.1 / 365.25, 1e-19, '100 mm/yr');
    expect(rechargeToMPerDay(2e-3, 'm/d')).toBe(2e-3);
    expectNear(rechargeFromMPerDay(1e-3, 'mm/yr'), 365.25, 1e-12, '1 mm/d');
    // a 365-day year would give 0.1/365; the two differ by 0.07 %
    expect(rechargeToMPerDay(100, 'mm/yr')).toBeLessThan(0.1 / 365);
  });

  it.each(RECHARGE_UNITS.map((u) => [u]))('%s converts there and back', (unit) => {
    for (const value of [-50, 0.3, 1, 800]) {
      expectNear(rechargeFromMPerDay(rechargeToMPerDay(value, unit), unit), value, 1e-14 * Math.abs(value), `${value} ${unit}`);
    }
  });
});

describe('length', () => {
  it('1 ft = 0.3048 m exactly (international yard and pound agreement, 1959)', () => {
    // The 1959 agreement defined the yard as 0.9144 m, so the foot is 0.3048 m exactly: notice of
    // the U.S. National Bureau of Standards, Federal Register, 1 July 1959; NIST Special
    // Publication 811 (2008), appendix B [from memory]
    expect(METRES_PER_FOOT).toBe(0.3048);
    expect(lengthToM(1, 'ft')).toBe(0.3048);
    expectNear(lengthToM(3, 'ft'), 0.9144, 1e-15, 'one yard');
    // the international mile, 5280 ft = 1609.344 m [derived]
    expectNear(lengthToM(5280, 'ft'), 1609.344, 1e-12, 'one mile');
    expect(lengthToM(123.4, 'm')).toBe(123.4);
    expect(LENGTH_UNITS).toEqual(['m', 'ft']);
  });
});
