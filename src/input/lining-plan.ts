// Reads a lining plan: a small JSON file of our own layout naming the reaches to line, the lining
// (its resistance, or its thickness and conductivity: no default lining is assumed), optional costs
// and a budget. Every problem names the file, the reach (index and id) and the key; unknown keys
// are refused so that a misspelt one never falls back silently.
import { parse, printParseErrorCode, type ParseError } from 'jsonc-parser';
import { DataError } from '../shared/errors.js';
import type { LiningPlan, PlanReach } from '../screening/lining.js';
import { duplicateKeys, jsonDepth, readTextFile } from './read-text.js';

/** Each reach costs a screening of the whole district: a plan of more is refused before any work. */
export const MAX_PLAN_REACHES = 200;

const PLAN_KEYS = new Set(['lining', 'life_years', 'currency', 'budget', 'reaches']);
const REACH_KEYS = new Set(['id', 'line', 'from_m', 'to_m', 'lining', 'wetted_perimeter_m', 'cost_per_km']);
const LINING_KEYS = new Set(['resistance_d', 'thickness_m', 'k_m_d']);

type Place = { featureIndex?: number; featureId?: string; field?: string };

export function readLiningPlan(file: string): LiningPlan {
  return parseLiningPlan(file, readTextFile(file));
}

export function parseLiningPlan(file: string, rawText: string): LiningPlan {
  const fail = (place: Place, message: string): never => {
    throw new DataError({ file, ...place }, message);
  };
  const text = rawText.replace(/^\uFEFF/, '');
  const depth = jsonDepth(text);
  if (depth > 8) fail({}, `nests objects or lists ${depth} levels deep; a lining plan nests 4 at most`);
  const errors: ParseError[] = [];
  const value: unknown = parse(text, errors, { allowTrailingComma: true, disallowComments: false });
  if (errors.length > 0) fail({}, `not valid JSON: ${printParseErrorCode(errors[0].error)} at line ${text.slice(0, errors[0].offset).split('\n').length}`);
  const [duplicate] = duplicateKeys(text, 1);
  if (duplicate) fail({}, `the key "${[...duplicate.path, duplicate.key].join('.')}" is given twice; give it once`);
  const plan = objectOf(value, {}, 'the plan', fail);
  unknownKeys(plan, PLAN_KEYS, {}, fail);

  const planLining = plan.lining === undefined ? null : liningResistance(plan.lining, { field: 'lining' }, fail);
  const lifeYears = plan.life_years === undefined ? null : positive(plan.life_years, { field: 'life_years' }, 'years', fail);
  const currency = plan.currency === undefined ? 'money' : text1(plan.currency, { field: 'currency' }, fail);
  let budget: LiningPlan['budget'] = null;
  if (plan.budget !== undefined) {
    const b = objectOf(plan.budget, { field: 'budget' }, '"budget"', fail);
    unknownKeys(b, new Set(['km', 'money']), { field: 'budget' }, fail);
    if ((b.km === undefined) === (b.money === undefined)) fail({ field: 'budget' }, 'give one of "km" (length to line) or "money" (what the programme may spend)');
    budget = b.km !== undefined ? { km: positive(b.km, { field: 'budget.km' }, 'km', fail) } : { money: positive(b.money, { field: 'budget.money' }, currency, fail) };
  }
  if (!Array.isArray(plan.reaches) || plan.reaches.length === 0) fail({ field: 'reaches' }, 'must be a list of at least one reach: {"id": ..., "line": ..., "from_m": ..., "to_m": ...}');
  const list = plan.reaches as unknown[];
  if (list.length > MAX_PLAN_REACHES) fail({ field: 'reaches' }, `${list.length} reaches: at most ${MAX_PLAN_REACHES} (each is a screening of the whole district); split the plan`);
  const ids = new Set<string>();
  const reaches: PlanReach[] = list.map((item, index) => {
    const at: Place = { featureIndex: index };
    const reach = objectOf(item, at, `reach ${index}`, fail);
    const id = text1(reach.id, { ...at, field: 'id' }, fail);
    const place = { featureIndex: index, featureId: id };
    if (ids.has(id)) fail({ ...place, field: 'id' }, `the reach id "${id}" is given twice; ids must be unique`);
    ids.add(id);
    unknownKeys(reach, REACH_KEYS, place, fail);
    const lineId = text1(reach.line, { ...place, field: 'line' }, fail);
    const fromM = reach.from_m === undefined ? null : nonNegative(reach.from_m, { ...place, field: 'from_m' }, fail);
    const toM = reach.to_m === undefined ? null : nonNegative(reach.to_m, { ...place, field: 'to_m' }, fail);
    if (fromM !== null && toM !== null && !(toM > fromM)) fail({ ...place, field: 'to_m' }, `to_m ${toM} must be beyond from_m ${fromM}`);
    const resistanceD = reach.lining !== undefined ? liningResistance(reach.lining, { ...place, field: 'lining' }, fail) : planLining;
    if (resistanceD === null) {
      fail({ ...place, field: 'lining' }, 'no lining: give the reach\'s "lining", or the plan\'s, as {"resistance_d": ...} or {"thickness_m": ..., "k_m_d": ...} (doab assumes no lining material of its own)');
    }
    const wettedPerimeterM = reach.wetted_perimeter_m === undefined ? null : positive(reach.wetted_perimeter_m, { ...place, field: 'wetted_perimeter_m' }, 'm', fail);
    const costPerKm = reach.cost_per_km === undefined ? null : nonNegative(reach.cost_per_km, { ...place, field: 'cost_per_km' }, fail);
    if (budget && 'money' in budget && costPerKm === null) fail({ ...place, field: 'cost_per_km' }, 'the budget is in money, so every reach needs its "cost_per_km"');
    return { index, id, lineId, fromM, toM, resistanceD: resistanceD as number, wettedPerimeterM, costPerKm };
  });
  return { file, reaches, lifeYears, currency, budget };
}

/** The lining's resistance (days): given, or its thickness over its conductivity. */
function liningResistance(value: unknown, place: Place, fail: (place: Place, message: string) => never): number {
  const lining = objectOf(value, place, `"${place.field}"`, fail);
  unknownKeys(lining, LINING_KEYS, place, fail);
  if (lining.resistance_d !== undefined) {
    if (lining.thickness_m !== undefined || lining.k_m_d !== undefined) fail(place, 'give "resistance_d", or "thickness_m" and "k_m_d", not both');
    return positive(lining.resistance_d, { ...place, field: `${place.field}.resistance_d` }, 'days', fail);
  }
  if (lining.thickness_m === undefined || lining.k_m_d === undefined) fail(place, 'give "resistance_d" (days), or the lining\'s "thickness_m" and its hydraulic conductivity "k_m_d"');
  const thickness = positive(lining.thickness_m, { ...place, field: `${place.field}.thickness_m` }, 'm', fail);
  const k = positive(lining.k_m_d, { ...place, field: `${place.field}.k_m_d` }, 'm/d', fail);
  // a layer of thickness t and conductivity K resists seepage by c = t / K (H. Bouwer (1978), Groundwater Hydrology [from memory])
  return thickness / k;
}

function objectOf(value: unknown, place: Place, what: string, fail: (place: Place, message: string) => never): Record<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) fail(place, `${what} must be a JSON object`);
  const prototype = Object.getPrototypeOf(value);
  if (prototype !== Object.prototype && prototype !== null) fail(place, 'unknown key "__proto__"');
  return value as Record<string, unknown>;
}

function unknownKeys(object: Record<string, unknown>, known: Set<string>, place: Place, fail: (place: Place, message: string) => never): void {
  for (const key of Object.keys(object)) {
    if (!known.has(key)) fail({ ...place, field: key }, `unknown key "${key}" (known here: ${[...known].join(', ')})`);
  }
}

function text1(value: unknown, place: Place, fail: (place: Place, message: string) => never): string {
  if (typeof value !== 'string' || value.trim() === '' || value.length > 200) fail(place, 'must be a non-empty text of at most 200 characters');
  return value as string;
}

function number1(value: unknown, place: Place, fail: (place: Place, message: string) => never): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) fail(place, `must be a finite number, found ${JSON.stringify(value)?.slice(0, 60)}`);
  return value as number;
}

function positive(value: unknown, place: Place, unit: string, fail: (place: Place, message: string) => never): number {
  const n = number1(value, place, fail);
  if (!(n > 0)) fail(place, `must be positive (${unit}), found ${n}`);
  return n;
}

function nonNegative(value: unknown, place: Place, fail: (place: Place, message: string) => never): number {
  const n = number1(value, place, fail);
  if (!(n >= 0)) fail(place, `must be 0 or more, found ${n}`);
  return n;
}
