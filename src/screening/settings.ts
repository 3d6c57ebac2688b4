// Every setting of a screening run with its default, and the risk classes.
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
