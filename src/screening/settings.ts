// Every setting of a screening run with its default, and the config file that can change them.
// Unknown keys and wrong types are errors that name the key.
import { DataError } from '../io/data-error.js';

export type RankBy = 'loss' | 'risk';

export interface RiskThresholds {
  /** A water table less than this far below ground is waterlogged (m). */
  waterloggedDepthM: number;
  /** Between the waterlogged depth and this depth the land is potentially waterlogged (m). */
  potentialDepthM: number;
}

export interface ScreenSettings {
  stepM: number;
  maxGapM: number;
  maxAngleDeg: number;
  /** The work CRS named by the user, or null for the UTM zone of the data's centre. */
  crs: string | null;
  rankBy: RankBy;
  writeTransects: boolean;
  /** A relative jump in spacing between neighbouring stations that ends a strip. */
  spacingJump: number;
  /** Dupuit-Forchheimer is a fair assumption when L / mean saturated thickness is at least this (common practice). */
  dupuitRatioMin: number;
  /** Land beside each line left out of the depth check: its banks and service road (m). */
  bankWidthM: number;
  /** Bases along a transect may differ by this fraction of the mean saturated thickness before a flag. */
  baseSpreadFraction: number;
  risk: RiskThresholds;
}

// Default risk thresholds: Government of India, Ministry of Water Resources, working group on
// waterlogging (1991): water table within 2 m of the surface is waterlogged, 2 to 3 m potentially
// waterlogged, deeper than 3 m safe [published].
export const DEFAULT_SETTINGS: ScreenSettings = Object.freeze({
  stepM: 100,
  maxGapM: 3000,
  maxAngleDeg: 20,
  crs: null,
  rankBy: 'loss',
  writeTransects: false,
  spacingJump: 0.25,
  dupuitRatioMin: 5,
  baseSpreadFraction: 0.1,
  bankWidthM: 10,
  risk: Object.freeze({ waterloggedDepthM: 2, potentialDepthM: 3 }),
}) as ScreenSettings;

type Checker = (value: unknown, key: string) => unknown;

const positive: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) throw new Error(`"${key}" must be a positive number, found ${JSON.stringify(value)}`);
  return value;
};
const angle: Checker = (value, key) => {
  const v = positive(value, key) as number;
  if (v >= 90) throw new Error(`"${key}" must be below 90 degrees, found ${v}`);
  return v;
};
const nullableText: Checker = (value, key) => {
  if (value !== null && typeof value !== 'string') throw new Error(`"${key}" must be text or null, found ${JSON.stringify(value)}`);
  return value;
};
const rankBy: Checker = (value, key) => {
  if (value !== 'loss' && value !== 'risk') throw new Error(`"${key}" must be "loss" or "risk", found ${JSON.stringify(value)}`);
  return value;
};
const bool: Checker = (value, key) => {
  if (typeof value !== 'boolean') throw new Error(`"${key}" must be true or false, found ${JSON.stringify(value)}`);
  return value;
};

const TOP_LEVEL: Record<string, Checker> = {
  stepM: positive,
  maxGapM: positive,
  maxAngleDeg: angle,
  crs: nullableText,
  rankBy,
  writeTransects: bool,
  spacingJump: positive,
  dupuitRatioMin: positive,
  baseSpreadFraction: positive,
  bankWidthM: (value, key) => {
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) throw new Error(`"${key}" must be a number of metres, 0 or more, found ${JSON.stringify(value)}`);
    return value;
  },
};
const RISK_KEYS: Record<string, Checker> = { waterloggedDepthM: positive, potentialDepthM: positive };

/** Applies a parsed config object over the defaults; throws DataError naming the key. */
export function settingsFromConfig(file: string, config: unknown, base: ScreenSettings = DEFAULT_SETTINGS): ScreenSettings {
  if (config === null || typeof config !== 'object' || Array.isArray(config)) {
    throw new DataError({ file }, 'the config must be a JSON object');
  }
  const settings: ScreenSettings = { ...base, risk: { ...base.risk } };
  try {
    for (const [key, value] of Object.entries(config)) {
      if (key === 'risk') {
        if (value === null || typeof value !== 'object' || Array.isArray(value)) throw new Error('"risk" must be an object');
        for (const [riskKey, riskValue] of Object.entries(value)) {
          const check = Object.hasOwn(RISK_KEYS, riskKey) ? RISK_KEYS[riskKey] : undefined;
          if (!check) throw new Error(`unknown key "risk.${riskKey}" (known: ${Object.keys(RISK_KEYS).join(', ')})`);
          (settings.risk as unknown as Record<string, unknown>)[riskKey] = check(riskValue, `risk.${riskKey}`);
        }
        continue;
      }
      const check = Object.hasOwn(TOP_LEVEL, key) ? TOP_LEVEL[key] : undefined;
      if (!check) throw new Error(`unknown key "${key}" (known: ${[...Object.keys(TOP_LEVEL), 'risk'].join(', ')})`);
      (settings as unknown as Record<string, unknown>)[key] = check(value, key);
    }
  } catch (error) {
    throw new DataError({ file }, (error as Error).message);
  }
  checkRisk(file, settings.risk);
  return settings;
}

export function checkRisk(file: string, risk: RiskThresholds): void {
  if (!(risk.potentialDepthM > risk.waterloggedDepthM)) {
    throw new DataError({ file }, `"risk.potentialDepthM" (${risk.potentialDepthM}) must exceed "risk.waterloggedDepthM" (${risk.waterloggedDepthM})`);
  }
}

export type RiskClass = 'ponded' | 'waterlogged' | 'potential' | 'safe';
export const RISK_CLASSES: readonly RiskClass[] = ['ponded', 'waterlogged', 'potential', 'safe'];

/** Risk class from the smallest depth of the water table below ground (m). */
export function riskClass(minDepthM: number, risk: RiskThresholds): RiskClass {
  if (minDepthM <= 0) return 'ponded';
  if (minDepthM < risk.waterloggedDepthM) return 'waterlogged';
  if (minDepthM < risk.potentialDepthM) return 'potential';
  return 'safe';
}
