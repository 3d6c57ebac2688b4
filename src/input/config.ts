// The config file: JSON with comments. It sets the screen options, the risk thresholds, the input
// CRS, and how to read the user's attributes (field names, units, defaults). Unknown keys, wrong
// types and unknown units are errors that name the key.
import { parse, printParseErrorCode, type ParseError } from 'jsonc-parser';
import { CONDUCTIVITY_UNITS, LENGTH_UNITS, RECHARGE_UNITS } from '../shared/units.js';
import { DataError, UsageError } from '../shared/errors.js';
import { duplicateKeys, jsonDepth } from './read-text.js';
import { cloneRules, DEFAULT_RULES, type InputRules } from '../shared/input-rules.js';
import {
  checkRisk,
  defaultSettings,
  finite,
  oneOf,
  setSetting,
  SETTING_KEYS,
  SETTINGS,
  shown,
  type Checker,
  type ScreenSettings,
  type SettingKey,
} from '../shared/settings.js';

export interface RunConfig {
  settings: ScreenSettings;
  rules: InputRules;
}

export function defaultConfig(): RunConfig {
  return { settings: defaultSettings(), rules: cloneRules(DEFAULT_RULES) };
}

const text: Checker = (value, key) => {
  if (typeof value !== 'string' || value.trim() === '') throw new Error(`"${key}" must be a non-empty attribute name, found ${shown(value)}`);
  return value;
};
const words: Checker = (value, key) => {
  if (!Array.isArray(value) || value.length === 0 || value.some((w) => typeof w !== 'string' || w.trim() === '')) {
    throw new Error(`"${key}" must be a list of words, found ${shown(value)}`);
  }
  return value;
};

const nonNegativeNumber: Checker = (value, key) => {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) throw new Error(`"${key}" must be a number of 0 or more, found ${shown(value)}`);
  return value;
};
const positiveOrNull: Checker = (value, key) => {
  if (value === null) return null;
  if (typeof value !== 'number' || !Number.isFinite(value) || !(value > 0)) throw new Error(`"${key}" must be a positive number, or null for none, found ${shown(value)}`);
  return value;
};

type Section = { [key: string]: Checker | Section };

/** The settings' part of the schema, from the settings table (`risk.x` keys nest under "risk"). */
function settingsSection(): Section {
  const section: Section = {};
  for (const key of SETTING_KEYS) {
    const [head, tail] = key.split('.');
    if (tail === undefined) section[head] = SETTINGS[key].check;
    else ((section[head] ??= {}) as Section)[tail] = SETTINGS[key].check;
  }
  return section;
}

const SCHEMA: Section = {
  ...settingsSection(),
  fields: {
    lines: { id: text, kind: text, name: text, stage: text, stageStart: text, stageEnd: text, bedResistance: text, wettedPerimeter: text, bottomWidth: text, waterDepth: text },
    zones: { id: text, k: text, base: text, ground: text, recharge: text, edgeHead: text, kLow: text, kHigh: text, kLogSd: text },
    wells: { id: text, observed: text, date: text },
  },
  units: { k: oneOf(CONDUCTIVITY_UNITS), recharge: oneOf(RECHARGE_UNITS), elevation: oneOf(LENGTH_UNITS) },
  defaults: { kind: oneOf(['canal', 'drain']), recharge: finite, bedResistanceD: nonNegativeNumber, wettedPerimeterM: positiveOrNull, bankSlope: nonNegativeNumber },
  kindWords: { canal: words, drain: words },
};

const RULE_SECTIONS = new Set(['fields', 'units', 'defaults', 'kindWords']);

/** Checks an object against a section of the schema, key by key, and returns the values found. */
function checkSection(section: Section, value: unknown, path: string): Map<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new Error(`"${path || 'the config'}" must be a JSON object, found ${shown(value)}`);
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
/**
 * Parses the config text over the defaults; throws DataError naming the file and the key. `keyPrefix`
 * names where the config sits inside the file (run.json keeps it under "settings").
 */
export function parseConfig(file: string, rawText: string, keyPrefix = ''): RunConfig {
  // a byte-order mark that an editor left at the start is no part of the config
  const configText = rawText.replace(/^\uFEFF/, '');
  // the parser recurses: a config nested deeper than any real one is refused before it is parsed
  const depth = jsonDepth(configText);
  if (depth > 16) throw new DataError({ file }, `nests objects or lists ${depth} levels deep; a doab config nests 3 at most`);
  const errors: ParseError[] = [];
  const value = parse(configText, errors, { allowTrailingComma: true, disallowComments: false });
  if (errors.length > 0) {
    const first = errors[0];
    const line = configText.slice(0, first.offset).split('\n').length;
    throw new DataError({ file }, `not valid JSON: ${printParseErrorCode(first.error)} at line ${line}`);
  }
  const [duplicate] = duplicateKeys(configText, 1);
  if (duplicate) {
    const key = [keyPrefix, ...duplicate.path, duplicate.key].filter((part) => part !== '').join('.');
    throw new DataError({ file }, `the key "${key}" is given twice; JSON keeps only the last one, so give it once`);
  }
  return configFromValue(file, value, keyPrefix);
}

/** A parsed config object checked key by key over the defaults. */
export function configFromValue(file: string, value: unknown, keyPrefix = ''): RunConfig {
  const config = defaultConfig();
  try {
    const found = checkSection(SCHEMA, value, keyPrefix);
    for (const [key, child] of found) {
      if (key === 'fields') {
        const sections = child as Map<string, Map<string, unknown>>;
        assign(config.rules.fields.lines as unknown as Record<string, unknown>, sections.get('lines'));
        assign(config.rules.fields.zones as unknown as Record<string, unknown>, sections.get('zones'));
        assign(config.rules.fields.wells as unknown as Record<string, unknown>, sections.get('wells'));
      } else if (RULE_SECTIONS.has(key)) assign((config.rules as unknown as Record<string, Record<string, unknown>>)[key], child as Map<string, unknown>);
      else if (child instanceof Map) for (const [inner, innerValue] of child) setSetting(config.settings, `${key}.${inner}` as SettingKey, innerValue);
      else setSetting(config.settings, key as SettingKey, child);
    }
  } catch (error) {
    const message = (error as Error).message;
    // a unit doab does not know is a choice of the user's to change, listed with those it knows
    if (/^"(settings\.)?units\./.test(message)) throw new UsageError(`${file}: ${message}`, 'units');
    throw new DataError({ file }, message);
  }
  checkRisk(file, config.settings.risk);
  const drainWords = new Set(config.rules.kindWords.drain.map((word) => word.trim().toLowerCase()));
  const both = config.rules.kindWords.canal.filter((word) => drainWords.has(word.trim().toLowerCase()));
  if (both.length > 0) throw new DataError({ file }, `"kindWords" gives ${both.map((word) => `"${word}"`).join(', ')} to both canal and drain; a word can name one kind only`);
  return config;
}
