// Unit helpers for what users type. Every factor is exact by definition:
// 1 d = 86 400 s; 1 m = 100 cm = 1000 mm; 1 ft = 0.3048 m and 1 in = 0.0254 m (international yard and pound, 1959 agreement);
// a year is the Julian year of 365.25 d (the IAU definition), so a yearly figure is a long-run mean.

export const SECONDS_PER_DAY = 86_400;
export const DAYS_PER_YEAR = 365.25;
export const METRES_PER_FOOT = 0.3048;

export const METRES_PER_INCH = 0.0254;

export type ConductivityUnit = 'm/d' | 'm/s' | 'cm/s' | 'ft/d';
export type RechargeUnit = 'mm/yr' | 'm/d' | 'in/yr' | 'mm/d';
export type LengthUnit = 'm' | 'ft';

export const CONDUCTIVITY_UNITS: readonly ConductivityUnit[] = ['m/d', 'm/s', 'cm/s', 'ft/d'];
export const RECHARGE_UNITS: readonly RechargeUnit[] = ['mm/yr', 'm/d', 'in/yr', 'mm/d'];
export const LENGTH_UNITS: readonly LengthUnit[] = ['m', 'ft'];

const K_TO_M_PER_DAY: Record<ConductivityUnit, number> = {
  'm/d': 1,
  'm/s': SECONDS_PER_DAY,
  'cm/s': SECONDS_PER_DAY / 100,
  'ft/d': METRES_PER_FOOT,
};

// metres of water a day per unit of recharge, as numerator over denominator so that each
// conversion is one multiplication and one division of exact factors
const RECHARGE_TO_M_PER_DAY: Record<RechargeUnit, [number, number]> = {
  'm/d': [1, 1],
  'mm/d': [1, 1000],
  'mm/yr': [1, 1000 * DAYS_PER_YEAR],
  'in/yr': [METRES_PER_INCH, DAYS_PER_YEAR],
};

export function kToMPerDay(value: number, unit: ConductivityUnit): number {
  return value * K_TO_M_PER_DAY[unit];
}

export function kFromMPerDay(kMPerDay: number, unit: ConductivityUnit): number {
  return kMPerDay / K_TO_M_PER_DAY[unit];
}

export function rechargeToMPerDay(value: number, unit: RechargeUnit): number {
  const [numerator, denominator] = RECHARGE_TO_M_PER_DAY[unit];
  return (value * numerator) / denominator;
}

export function rechargeFromMPerDay(rechargeMPerDay: number, unit: RechargeUnit): number {
  const [numerator, denominator] = RECHARGE_TO_M_PER_DAY[unit];
  return (rechargeMPerDay * denominator) / numerator;
}

export function lengthToM(value: number, unit: LengthUnit): number {
  return unit === 'm' ? value : value * METRES_PER_FOOT;
}

export function m3PerDayToM3PerYear(m3PerDay: number): number {
  return m3PerDay * DAYS_PER_YEAR;
}
