// The config file: JSON with comments. It sets the screen options, the risk thresholds, the input
// CRS, and how to read the user's attributes (field names, units, defaults). Unknown keys, wrong
// types and unknown units are errors that name the key.
import { parse, printParseErrorCode, type ParseError } from 'jsonc-parser';
import { CONDUCTIVITY_UNITS, LENGTH_UNITS, RECHARGE_UNITS } from '../hydraulics/units.js';
import { DataError } from '../io/data-error.js';
import { cloneRules, DEFAULT_RULES, type InputRules } from './input-rules.js';
import { checkRisk, DEFAULT_SETTINGS, type ScreenSettings } from './settings.js';

export interface RunConfig {
  settings: ScreenSettings;
  rules: InputRules;
  /** CRS of both input files when they do not declare one (or to override it). */
  inputCrs: string | null;
}

export function defaultConfig(): RunConfig {
  return { settings: { ...DEFAULT_SETTINGS, risk: { ...DEFAULT_SETTINGS.risk } }, rules: cloneRules(DEFAULT_RULES), inputCrs: null };
}

type Checker = (value: unknown, key: string) => unknown;

const positive: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) throw new Error(`"${key}" must be a positive number, found ${JSON.stringify(value)}`);
  return value;
};
const nonNegative: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) throw new Error(`"${key}" must be a number, 0 or more, found ${JSON.stringify(value)}`);
  return value;
};
const finite: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new Error(`"${key}" must be a number, found ${JSON.stringify(value)}`);
  return value;
};
const angle: Checker = (value, key) => {
  const v = positive(value, key) as number;
  if (v >= 90) throw new Error(`"${key}" must be below 90 degrees, found ${v}`);
  return v;
};
const nullableText: Checker = (value, key) => {
  if (value !== null && (typeof value !== 'string' || value.trim() === '')) throw new Error(`"${key}" must be text or null, found ${JSON.stringify(value)}`);
  return value;
};
const text: Checker = (value, key) => {
  if (typeof value !== 'string' || value.trim() === '') throw new Error(`"${key}" must be a non-empty attribute name, found ${JSON.stringify(value)}`);
  return value;
};
const oneOf = (choices: readonly string[]): Checker => (value, key) => {
  if (typeof value !== 'string' || !choices.includes(value)) throw new Error(`"${key}" must be one of ${choices.map((c) => `"${c}"`).join(', ')}, found ${JSON.stringify(value)}`);
  return value;
};
const bool: Checker = (value, key) => {
  if (typeof value !== 'boolean') throw new Error(`"${key}" must be true or false, found ${JSON.stringify(value)}`);
  return value;
};
const words: Checker = (value, key) => {
  if (!Array.isArray(value) || value.length === 0 || value.some((w) => typeof w !== 'string' || w.trim() === '')) {
    throw new Error(`"${key}" must be a list of words, found ${JSON.stringify(value)}`);
  }
  return value;
};

type Section = { [key: string]: Checker | Section };

const SCHEMA: Section = {
  stepM: positive,
  maxGapM: positive,
  maxAngleDeg: angle,
  crs: nullableText,
  inputCrs: nullableText,
  rankBy: oneOf(['loss', 'risk']),
  writeTransects: bool,
  spacingJump: positive,
  dupuitRatioMin: positive,
  baseSpreadFraction: positive,
  bankWidthM: nonNegative,
  risk: { waterloggedDepthM: positive, potentialDepthM: positive },
  fields: {
    lines: { id: text, kind: text, name: text, stage: text, stageStart: text, stageEnd: text },
    zones: { id: text, k: text, base: text, ground: text, recharge: text },
  },
  units: { k: oneOf(CONDUCTIVITY_UNITS), recharge: oneOf(RECHARGE_UNITS), elevation: oneOf(LENGTH_UNITS) },
  defaults: { kind: oneOf(['canal', 'drain']), recharge: finite },
  kindWords: { canal: words, drain: words },
};

/** Checks an object against a section of the schema, key by key, and returns the values found. */
function checkSection(section: Section, value: unknown, path: string): Map<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new Error(`"${path || 'the config'}" must be a JSON object, found ${JSON.stringify(value)}`);
  }
  // jsonc-parser turns a "__proto__" key into the object's prototype, where Object.entries misses it
  const prototype = Object.getPrototypeOf(value);
  if (prototype !== Object.prototype && prototype !== null) throw new Error(`unknown key "${path ? `${path}.` : ''}__proto__"`);
  const found = new Map<string, unknown>();
  for (const [key, child] of Object.entries(value)) {
    const keyPath = path ? `${path}.${key}` : key;
    const rule = Object.hasOwn(section, key) ? section[key] : undefined;
    if (!rule) throw new Error(`unknown key "${keyPath}" (known here: ${Object.keys(section).join(', ')})`);
    found.set(key, typeof rule === 'function' ? rule(child, keyPath) : checkSection(rule, child, keyPath));
  }
  return found;
}

function assign(target: Record<string, unknown>, found: Map<string, unknown> | undefined): void {
  if (!found) return;
  for (const [key, value] of found) target[key] = value;
}

/** Parses the config text over the defaults; throws DataError naming the file and the key. */
export function parseConfig(file: string, configText: string): RunConfig {
  const errors: ParseError[] = [];
  const value = parse(configText, errors, { allowTrailingComma: true, disallowComments: false });
  if (errors.length > 0) {
    const first = errors[0];
    const line = configText.slice(0, first.offset).split('\n').length;
    throw new DataError({ file }, `not valid JSON: ${printParseErrorCode(first.error)} at line ${line}`);
  }
  const config = defaultConfig();
  try {
    const found = checkSection(SCHEMA, value, '');
    for (const [key, child] of found) {
      if (key === 'risk') assign(config.settings.risk as unknown as Record<string, unknown>, child as Map<string, unknown>);
      else if (key === 'fields') {
        const sections = child as Map<string, Map<string, unknown>>;
        assign(config.rules.fields.lines as unknown as Record<string, unknown>, sections.get('lines'));
        assign(config.rules.fields.zones as unknown as Record<string, unknown>, sections.get('zones'));
      } else if (key === 'units') assign(config.rules.units as unknown as Record<string, unknown>, child as Map<string, unknown>);
      else if (key === 'defaults') assign(config.rules.defaults as unknown as Record<string, unknown>, child as Map<string, unknown>);
      else if (key === 'kindWords') assign(config.rules.kindWords as unknown as Record<string, unknown>, child as Map<string, unknown>);
      else if (key === 'inputCrs') config.inputCrs = child as string | null;
      else (config.settings as unknown as Record<string, unknown>)[key] = child;
    }
  } catch (error) {
    throw new DataError({ file }, (error as Error).message);
  }
  checkRisk(file, config.settings.risk);
  return config;
}
