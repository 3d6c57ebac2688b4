// Every setting of a screening run, in one table: its config key, default, check, unit, one-line
// doc and command-line flag. The defaults, the config file's schema, the starting config that
// init-config writes, the settings in run.json and the CLI's options and help are all made from it.
import { DataError, UsageError } from './errors.js';

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
  /** CRS of both input files when they do not declare one (or to override what they declare). */
  inputCrs: string | null;
  /** A title for the report and the run record (the district's name, say); null for none. */
  title: string | null;
  rankBy: RankBy;
  writeTransects: boolean;
  /** A relative jump in spacing between neighbouring stations that ends a strip. */
  spacingJump: number;
  /** Dupuit-Forchheimer is a fair assumption when L / mean saturated thickness is at least this (common practice). */
  dupuitRatioMin: number;
  /** Bases along a transect may differ by this fraction of the mean saturated thickness before a flag. */
  baseSpreadFraction: number;
  /** Land beside each line left out of the depth check: its banks and service road (m). */
  bankWidthM: number;
  /** Skip the district solve: every figure from the strips alone (a quick first pass over a large area). */
  stripsOnly: boolean;
  /** Side of a square cell of the district solve's grid (m). */
  districtCellM: number;
  /** Memory the district solve may use (MB); a grid that would need more is solved at a coarser cell. */
  districtMemoryMB: number;
  /** A strip whose smallest depth differs from the district solve's inside it by more than this is flagged (m). */
  districtDepthToleranceM: number;
  /** A strip whose loss differs from what the district solve has its lines send into it by more than this fraction of the larger is flagged. */
  districtLossTolerance: number;
  /** Largest input file read (MB); a JavaScript string holds at most about 512 MiB, so no more than 500 until inputs stream. */
  maxInputMB: number;
  /** Largest a zipped input may expand to (MB), and the largest expansion ratio of its members. */
  maxUnzippedMB: number;
  maxZipRatio: number;
  /** Most stations a run may place (each costs memory in every stage after it). */
  maxStations: number;
  /**
   * Worker threads for the transect solve; null for the machine's cores. Changes no output, so a
   * run's result and record leave it out (it may then be absent).
   */
  workers?: number | null;
  risk: RiskThresholds;
}

/** A setting's key as the config file writes it: top-level keys, and `risk.<key>` for the thresholds. */
export type SettingKey = Exclude<keyof ScreenSettings, 'risk'> | `risk.${keyof RiskThresholds}`;

/** A value as a message shows it: a number JSON cannot write (1e999 read as Infinity) by what it is, text cut short. */
export function shown(value: unknown): string {
  if (typeof value === 'number' && !Number.isFinite(value)) return `${value} (a number too large to hold)`;
  const text = JSON.stringify(value) ?? String(value);
  return text.length > 80 ? `${text.slice(0, 80)}...` : text;
}

/** Throws an Error saying what is wrong with a value; the caller adds where it came from. */
export type Checker = (value: unknown, key: string) => unknown;

export const positive: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) throw new Error(`"${key}" must be a positive number, found ${shown(value)}`);
  return value;
};
export const nonNegative: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) throw new Error(`"${key}" must be a number, 0 or more, found ${shown(value)}`);
  return value;
};
export const finite: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new Error(`"${key}" must be a number, found ${shown(value)}`);
  return value;
};
const angle: Checker = (value, key) => {
  const v = positive(value, key) as number;
  if (v >= 90) throw new Error(`"${key}" must be below 90 degrees, found ${v}`);
  return v;
};
const inputMegabytes: Checker = (value, key) => {
  const v = positive(value, key) as number;
  // inputs stream, so the bound is the disk and the features kept, not JavaScript's longest text
  if (v > 100_000) throw new Error(`"${key}" can be at most 100000 (MB); found ${v}`);
  return v;
};
const count: Checker = (value, key) => {
  const v = positive(value, key) as number;
  if (!Number.isInteger(v)) throw new Error(`"${key}" must be a whole number, found ${v}`);
  return v;
};
const nullableCount: Checker = (value, key) => (value === null ? null : count(value, key));
const nullableText: Checker = (value, key) => {
  if (value !== null && (typeof value !== 'string' || value.trim() === '')) throw new Error(`"${key}" must be text or null, found ${shown(value)}`);
  return value;
};
export const oneOf = (choices: readonly string[]): Checker => (value, key) => {
  if (typeof value !== 'string' || !choices.includes(value)) throw new Error(`"${key}" must be one of ${choices.map((c) => `"${c}"`).join(', ')}, found ${shown(value)}`);
  return value;
};
export const bool: Checker = (value, key) => {
  if (typeof value !== 'boolean') throw new Error(`"${key}" must be true or false, found ${shown(value)}`);
  return value;
};

export type SettingType = 'number' | 'text' | 'boolean' | 'choice';

export interface SettingSpec {
  default: number | string | boolean | null;
  check: Checker;
  type: SettingType;
  choices?: readonly string[];
  /** Unit of the value ('' when it has none). */
  unit: string;
  doc: string;
  /** The command-line option, as commander writes it (`--step <m>`); none when only a config sets it. */
  flag?: string;
  /** Left out of the starting config that init-config writes (a value most users never change). */
  advanced?: boolean;
}

// The demo's district solve at 20 m takes about 3 s. Halving the cell to 10 m changed the per-line
// losses of the demo's lines that meet no other line at a different stage by under 1%, but C-01's
// by 5% and D-07's by 9.5% (less than 1% of the district's total line exchange): every junction of
// the demo has a stage jump, and across one the exchange grows as the cell shrinks (measured; README).
export const DEFAULT_DISTRICT_CELL_M = 20;

// Default risk thresholds: Government of India, Ministry of Water Resources, working group on
// waterlogging (1991): water table within 2 m of the surface is waterlogged, 2 to 3 m potentially
// waterlogged, deeper than 3 m safe [published].
export const SETTINGS: Readonly<Record<SettingKey, SettingSpec>> = Object.freeze({
  stepM: { default: 100, check: positive, type: 'number', unit: 'm', doc: 'station spacing along each line', flag: '--step <m>' },
  maxGapM: { default: 3000, check: positive, type: 'number', unit: 'm', doc: 'longest transect', flag: '--max-gap <m>' },
  maxAngleDeg: { default: 20, check: angle, type: 'number', unit: 'degrees', doc: 'largest angle from parallel for a partner (below 90)', flag: '--max-angle <deg>' },
  crs: { default: null, check: nullableText, type: 'text', unit: '', doc: 'work CRS: EPSG:326xx/327xx or a +proj string; null for the UTM zone of the data centre', flag: '--crs <crs>' },
  inputCrs: { default: null, check: nullableText, type: 'text', unit: '', doc: 'CRS of the input files (EPSG:<code>, proj4 or WKT); overrides .prj and "crs" members', flag: '--input-crs <crs>' },
  title: { default: null, check: nullableText, type: 'text', unit: '', doc: "a title for the report and the run record (the district's name, say)", flag: '--title <text>' },
  rankBy: { default: 'loss', check: oneOf(['loss', 'risk']), type: 'choice', choices: ['loss', 'risk'], unit: '', doc: 'rank strips by loss per km ("loss") or by smallest depth ("risk")', flag: '--rank-by <key>' },
  writeTransects: { default: false, check: bool, type: 'boolean', unit: '', doc: 'also write the transects layer, every transect with its inputs and results', flag: '--transects' },
  spacingJump: { default: 0.25, check: positive, type: 'number', unit: 'fraction', doc: 'a relative jump in spacing between neighbouring stations that ends a strip', advanced: true },
  dupuitRatioMin: { default: 5, check: positive, type: 'number', unit: '', doc: 'strips narrower than this many mean saturated thicknesses are flagged (common practice)', advanced: true },
  baseSpreadFraction: { default: 0.1, check: positive, type: 'number', unit: 'fraction', doc: 'bases along a transect may differ by this fraction of the mean saturated thickness before a flag', advanced: true },
  bankWidthM: { default: 10, check: nonNegative, type: 'number', unit: 'm', doc: 'land beside each line left out of the depth check (banks, service road)' },
  stripsOnly: { default: false, check: bool, type: 'boolean', unit: '', doc: 'skip the district solve: every loss and depth from the strips alone (a quick first pass over a large area)', flag: '--strips-only' },
  districtCellM: { default: DEFAULT_DISTRICT_CELL_M, check: positive, type: 'number', unit: 'm', doc: 'cell size of the district solve (also solved at twice this size for its uncertainty)', flag: '--cell <m>' },
  districtMemoryMB: { default: 2048, check: positive, type: 'number', unit: 'MB', doc: 'memory the district solve may use; a grid that needs more is solved at a coarser cell, and said', flag: '--memory-mb <mb>' },
  districtDepthToleranceM: { default: 0.5, check: positive, type: 'number', unit: 'm', doc: "strips whose smallest depth differs from the district solve's inside them by more than this are flagged", advanced: true },
  districtLossTolerance: { default: 0.25, check: positive, type: 'number', unit: 'fraction', doc: "strips whose loss differs from the district solve's loss into them by more than this fraction of the larger are flagged", advanced: true },
  maxInputMB: { default: 4096, check: inputMegabytes, type: 'number', unit: 'MB', doc: 'largest input file doab reads (at most 100000); GeoJSON is read as a stream, but every feature is kept in memory', flag: '--max-input-mb <mb>', advanced: true },
  maxUnzippedMB: { default: 1000, check: positive, type: 'number', unit: 'MB', doc: 'largest a zipped shapefile may expand to', advanced: true },
  maxZipRatio: { default: 100, check: positive, type: 'number', unit: '', doc: 'largest expansion ratio of a member of a zipped shapefile (a zip bomb expands thousands of times)', advanced: true },
  maxStations: { default: 5_000_000, check: count, type: 'number', unit: '', doc: 'most stations a run may place; a finer --step over a longer network needs more', flag: '--max-stations <n>', advanced: true },
  workers: { default: null, check: nullableCount, type: 'number', unit: '', doc: "worker threads for the transect solve (null for the machine's cores); outputs are the same for any number", flag: '--workers <n>', advanced: true },
  'risk.waterloggedDepthM': { default: 2, check: positive, type: 'number', unit: 'm', doc: 'a water table less deep than this below ground is waterlogged' },
  'risk.potentialDepthM': { default: 3, check: positive, type: 'number', unit: 'm', doc: 'between the waterlogged depth and this depth the land is potentially waterlogged' },
});

export const SETTING_KEYS = Object.keys(SETTINGS) as SettingKey[];

/** The setting at a key of the table, read from settings. */
export function getSetting(settings: ScreenSettings, key: SettingKey): unknown {
  const [head, tail] = key.split('.');
  const holder = (tail === undefined ? settings : (settings as unknown as Record<string, Record<string, unknown>>)[head]) as unknown as Record<string, unknown>;
  return holder[tail ?? head];
}

/** Sets a setting at a key of the table, after its check; the Error says what is wrong. */
export function setSetting(settings: ScreenSettings, key: SettingKey, value: unknown): void {
  const spec = SETTINGS[key];
  const checked = spec.check(value, key);
  const [head, tail] = key.split('.');
  const holder = (tail === undefined ? settings : (settings as unknown as Record<string, Record<string, unknown>>)[head]) as unknown as Record<string, unknown>;
  holder[tail ?? head] = checked;
}

export function defaultSettings(): ScreenSettings {
  const settings = { risk: {} } as ScreenSettings;
  for (const key of SETTING_KEYS) setSetting(settings, key, SETTINGS[key].default);
  return settings;
}

export const DEFAULT_SETTINGS: ScreenSettings = Object.freeze(defaultSettings());

/** The settings in config-file form (the nested object a config file or run.json holds). */
export function settingsAsConfig(settings: ScreenSettings): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of SETTING_KEYS) {
    const [head, tail] = key.split('.');
    if (tail === undefined) out[head] = getSetting(settings, key);
    else ((out[head] ??= {}) as Record<string, unknown>)[tail] = getSetting(settings, key);
  }
  return out;
}

/** The name commander gives a flag's value: `--max-gap <m>` -> maxGap. */
export function flagAttribute(flag: string): string {
  return flag.split(' ')[0].replace(/^--/, '').replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
}

/** The command-line options over settings: each flag given is checked as the config checks it. */
export function applyFlags(settings: ScreenSettings, options: Record<string, unknown>): void {
  for (const key of SETTING_KEYS) {
    const spec = SETTINGS[key];
    if (!spec.flag) continue;
    const value = options[flagAttribute(spec.flag)];
    if (value === undefined) continue;
    try {
      setSetting(settings, key, value);
    } catch (error) {
      throw new UsageError(`${spec.flag.split(' ')[0]}: ${(error as Error).message.replace(/^"[^"]*" /, '')}`, key);
    }
  }
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
