// The lining planner's core: what lining each reach of a plan would save, and what it does to the
// water table, by screening the district again with the lining in place of the bed (physics, not
// a fixed percentage): once per reach, then once for the programme the budget allows. Pure: lines,
// zones and settings in, figures out; no files.
import type { RiskClass, ScreenSettings } from '../shared/settings.js';
import { DataError } from '../shared/errors.js';
import type { LinedRange, LineRecord, ZoneRecord } from './district-inputs.js';
import { screenDistrict, type FigureMethod, type ScreenExtras, type ScreenResult } from './screen.js';

/** One reach of a plan: a chainage range of a line to line, with its lining and optional cost. */
export interface PlanReach {
  /** Position in the plan's list, for messages. */
  index: number;
  id: string;
  lineId: string;
  /** Chainage along the line (m, from its first vertex, as in strips.geojson); null for the whole line. */
  fromM: number | null;
  toM: number | null;
  /** Resistance of the lined bed (days): the lining's thickness over its conductivity. */
  resistanceD: number;
  /** Wetted perimeter the lining covers (m); null: the line's own. */
  wettedPerimeterM: number | null;
  /** Cost per km lined, in the plan's money; null when not given. */
  costPerKm: number | null;
}

export interface LiningPlan {
  /** The plan file's name, for messages. */
  file: string;
  reaches: PlanReach[];
  /** Years over which the cost is spread for the cost per 1,000 m^3 saved; null when not given. */
  lifeYears: number | null;
  /** The money's name, for the tables (e.g. "EUR"); "money" when not given. */
  currency: string;
  /** What the programme may spend: km lined or money; null for every reach in order. */
  budget: { km: number } | { money: number } | null;
}

/** The district as a planner reads it, for one scenario. */
export interface ScenarioFigures {
  method: FigureMethod;
  /** Each line's net loss (m^3/d), in line order. */
  lineLossM3PerDay: Float64Array;
  /** Net loss of all canals (m^3/d): what the canal network gives the ground. */
  canalLossM3PerDay: number;
  /** Area with the water table less than the waterlogging depth below ground (ha), and in the potential class (ha). */
  waterloggedHa: number;
  potentialHa: number;
  /** Each strip's smallest depth (m) and risk class, by strip id. */
  strips: Map<string, { minDepthM: number; risk: RiskClass | null }>;
}

export interface ReachOutcome {
  reach: PlanReach;
  line: number;
  fromM: number;
  toM: number;
  lengthM: number;
  /** The lined line's own net loss now and lined (m^3/d). */
  lineLossNowM3PerDay: number;
  lineLossLinedM3PerDay: number;
  /** What the canal network keeps (m^3/d): all canals' net loss now less lined, neighbours included. */
  savedM3PerDay: number;
  savedM3PerDayKm: number;
  cost: number | null;
  /** Cost per 1,000 m^3 saved over the plan's life; null without a cost or a life, or with no saving. */
  costPer1000M3: number | null;
  /** Change in waterlogged and potential area (ha; negative where land leaves the class). */
  waterloggedHaChange: number;
  potentialHaChange: number;
  /** Strips whose smallest depth moved by more than a centimetre, with their new figures. */
  affectedStrips: { stripId: string; minDepthNowM: number; minDepthLinedM: number; riskNow: RiskClass | null; riskLined: RiskClass | null }[];
}

export interface ProgrammeStep {
  outcome: ReachOutcome;
  /** Running totals in programme order: km lined, money, water saved (the sum of the reaches' own savings). */
  kmTotal: number;
  costTotal: number | null;
  savedM3PerDayTotal: number;
}

export interface LiningOutcome {
  plan: LiningPlan;
  method: FigureMethod;
  now: ScenarioFigures;
  reaches: ReachOutcome[];
  /** The reaches the budget allows, best first; the ranking key ('per km' or 'per money'). */
  programme: ProgrammeStep[];
  rankedBy: 'saving per km' | 'saving per money';
  /** The whole programme lined at once (reaches interact: the sum of their own savings is not the total). */
  programmeLined: ScenarioFigures | null;
  programmeSavedM3PerDay: number;
  programmeWaterloggedHaChange: number;
  programmePotentialHaChange: number;
  /** The results screened, for drawing: now, and with the whole programme lined. */
  resultNow: ScreenResult;
  resultProgramme: ScreenResult | null;
  /** Screenings run (one per reach, the programme, and now). */
  screenings: number;
}

/** Lines with the given reaches lined: each line's lined ranges, sorted; a copy, the input untouched. */
export function withLining(lines: readonly LineRecord[], lineLengthsM: Float64Array, reaches: readonly PlanReach[], plan: LiningPlan): LineRecord[] {
  const ranges = new Map<number, LinedRange[]>();
  for (const reach of reaches) {
    const { line, fromM, toM } = locateReach(lines, lineLengthsM, reach, plan);
    const perimeterM = reach.wettedPerimeterM ?? lines[line].wettedPerimeterM;
    if (!(perimeterM > 0)) {
      throw new DataError(
        { file: plan.file, featureIndex: reach.index, featureId: reach.id, field: 'wetted_perimeter_m' },
        `line "${reach.lineId}" has no wetted perimeter (its bed is clean and none was given): give the reach's "wetted_perimeter_m"`,
      );
    }
    const list = ranges.get(line) ?? [];
    list.push({ fromM, toM, bedResistanceD: reach.resistanceD, wettedPerimeterM: perimeterM });
    ranges.set(line, list);
  }
  return lines.map((line, i) => {
    const list = ranges.get(i);
    if (!list) return line;
    list.sort((a, b) => a.fromM - b.fromM);
    return { ...line, lined: [...(line.lined ?? []), ...list].sort((a, b) => a.fromM - b.fromM) };
  });
}

/** The reach's line and chainage range, checked against the line (names the plan file, reach and field). */
export function locateReach(lines: readonly LineRecord[], lineLengthsM: Float64Array, reach: PlanReach, plan: Pick<LiningPlan, 'file'>): { line: number; fromM: number; toM: number } {
  const line = lines.findIndex((l) => l.id === reach.lineId);
  if (line < 0) {
    throw new DataError({ file: plan.file, featureIndex: reach.index, featureId: reach.id, field: 'line' }, `no line "${reach.lineId}" in the run's canals (ids as in canals.geojson)`);
  }
  const lengthM = lineLengthsM[line];
  const fromM = reach.fromM ?? 0, toM = reach.toM ?? lengthM;
  if (!(fromM >= 0) || !(toM > fromM)) {
    throw new DataError({ file: plan.file, featureIndex: reach.index, featureId: reach.id, field: 'from_m' }, `the chainage range ${fromM} to ${toM} m is empty or negative: give from_m < to_m`);
  }
  // a metre of slack for chainage read off a map at the line's end
  if (fromM >= lengthM || toM > lengthM + 1) {
    throw new DataError({ file: plan.file, featureIndex: reach.index, featureId: reach.id, field: 'to_m' }, `the chainage range ${fromM} to ${toM} m runs past the end of line "${reach.lineId}", ${lengthM.toFixed(1)} m long`);
  }
  return { line, fromM, toM: Math.min(toM, lengthM) };
}

export function scenarioFigures(result: ScreenResult): ScenarioFigures {
  const lineLossM3PerDay = Float64Array.from(result.lineFigures, (figure) => figure.netLossM3PerDay);
  let canalLossM3PerDay = 0;
  result.lines.forEach((line, i) => {
    if (line.kind === 'canal' && Number.isFinite(lineLossM3PerDay[i])) canalLossM3PerDay += lineLossM3PerDay[i];
  });
  let waterloggedHa = 0, potentialHa = 0;
  if (result.district) {
    waterloggedHa = result.district.areaByRiskHa.ponded + result.district.areaByRiskHa.waterlogged;
    potentialHa = result.district.areaByRiskHa.potential;
  } else {
    // strips alone: the shallow area of each strip; the potential class from the strips whose smallest depth is in it
    for (const strip of result.strips) {
      waterloggedHa += Number.isFinite(strip.riskAreaHa) ? strip.riskAreaHa : 0;
      if (strip.risk === 'potential') potentialHa += (strip.lengthM * strip.strip.spacingMeanM) / 10_000;
    }
  }
  const strips = new Map(result.strips.map((strip) => [strip.stripId, { minDepthM: strip.district?.minDepthM ?? strip.minDepthM, risk: strip.district?.risk ?? strip.risk }]));
  return { method: result.district ? 'district' : 'strips', lineLossM3PerDay, canalLossM3PerDay, waterloggedHa, potentialHa, strips };
}

/** A strip's smallest depth that moved by more than this (m) counts as affected. */
const AFFECTED_DEPTH_M = 0.01;

function compare(now: ScenarioFigures, lined: ScenarioFigures) {
  const affectedStrips: ReachOutcome['affectedStrips'] = [];
  for (const [stripId, before] of now.strips) {
    const after = lined.strips.get(stripId);
    if (!after || !(Math.abs(after.minDepthM - before.minDepthM) > AFFECTED_DEPTH_M)) continue;
    affectedStrips.push({ stripId, minDepthNowM: before.minDepthM, minDepthLinedM: after.minDepthM, riskNow: before.risk, riskLined: after.risk });
  }
  affectedStrips.sort((a, b) => Math.abs(b.minDepthLinedM - b.minDepthNowM) - Math.abs(a.minDepthLinedM - a.minDepthNowM) || (a.stripId < b.stripId ? -1 : 1));
  return {
    savedM3PerDay: now.canalLossM3PerDay - lined.canalLossM3PerDay,
    waterloggedHaChange: lined.waterloggedHa - now.waterloggedHa,
    potentialHaChange: lined.potentialHa - now.potentialHa,
    affectedStrips,
  };
}

const DAYS_PER_YEAR = 365.25;

/**
 * Screens the district now, with each reach lined on its own, and with the programme the budget
 * allows lined at once. `onScreening` hears each screening as it starts (for progress).
 */
export function planLining(
  lines: readonly LineRecord[],
  zones: readonly ZoneRecord[],
  settings: ScreenSettings,
  plan: LiningPlan,
  onScreening: (done: number, total: number) => void = () => {},
  extras: ScreenExtras = {},
): LiningOutcome {
  const total = plan.reaches.length + 2;
  onScreening(0, total);
  const resultNow = screenDistrict(lines as LineRecord[], zones as ZoneRecord[], settings, undefined, { ...extras, coarseCheck: false });
  const now = scenarioFigures(resultNow);
  // every reach is checked before the first reach is screened, so a bad plan stops at once
  const located = plan.reaches.map((reach) => ({ reach, ...locateReach(lines, resultNow.lineLengthsM, reach, plan) }));
  withLining(lines, resultNow.lineLengthsM, plan.reaches, plan);
  const reaches: ReachOutcome[] = located.map(({ reach, line, fromM, toM }, i) => {
    onScreening(i + 1, total);
    const lined = scenarioFigures(screenDistrict(withLining(lines, resultNow.lineLengthsM, [reach], plan), zones as ZoneRecord[], settings, undefined, { ...extras, coarseCheck: false }));
    const change = compare(now, lined);
    const lengthM = toM - fromM;
    const cost = reach.costPerKm === null ? null : (reach.costPerKm * lengthM) / 1000;
    const savedM3PerYear = change.savedM3PerDay * DAYS_PER_YEAR;
    return {
      reach,
      line,
      fromM,
      toM,
      lengthM,
      lineLossNowM3PerDay: now.lineLossM3PerDay[line],
      lineLossLinedM3PerDay: lined.lineLossM3PerDay[line],
      savedM3PerDay: change.savedM3PerDay,
      savedM3PerDayKm: change.savedM3PerDay / (lengthM / 1000),
      cost,
      costPer1000M3: cost !== null && plan.lifeYears !== null && savedM3PerYear > 0 ? cost / ((savedM3PerYear * plan.lifeYears) / 1000) : null,
      waterloggedHaChange: change.waterloggedHaChange,
      potentialHaChange: change.potentialHaChange,
      affectedStrips: change.affectedStrips,
    };
  });

  const { steps, rankedBy } = programme(reaches, plan);
  onScreening(total - 1, total);
  let resultProgramme: ScreenResult | null = null, programmeLined: ScenarioFigures | null = null;
  let programmeSaved = 0, programmeWaterlogged = 0, programmePotential = 0;
  if (steps.length > 0) {
    resultProgramme = screenDistrict(withLining(lines, resultNow.lineLengthsM, steps.map((step) => step.outcome.reach), plan), zones as ZoneRecord[], settings, undefined, { ...extras, coarseCheck: false });
    programmeLined = scenarioFigures(resultProgramme);
    const change = compare(now, programmeLined);
    programmeSaved = change.savedM3PerDay;
    programmeWaterlogged = change.waterloggedHaChange;
    programmePotential = change.potentialHaChange;
  }
  onScreening(total, total);
  return {
    plan,
    method: now.method,
    now,
    reaches,
    programme: steps,
    rankedBy,
    programmeLined,
    programmeSavedM3PerDay: programmeSaved,
    programmeWaterloggedHaChange: programmeWaterlogged,
    programmePotentialHaChange: programmePotential,
    resultNow,
    resultProgramme,
    screenings: 1 + reaches.length + (steps.length > 0 ? 1 : 0),
  };
}

/**
 * The programme: reaches that save water, best first (saving per km, or per money when the budget
 * is money and every reach has a cost), taken in that order while the budget lasts; a reach that
 * would pass the budget is passed over for the next that fits. Ties by reach id.
 */
export function programme(reaches: readonly ReachOutcome[], plan: LiningPlan): { steps: ProgrammeStep[]; rankedBy: LiningOutcome['rankedBy'] } {
  const byMoney = plan.budget !== null && 'money' in plan.budget;
  const rankedBy = byMoney ? ('saving per money' as const) : ('saving per km' as const);
  const key = (o: ReachOutcome) => (byMoney ? o.savedM3PerDay / (o.cost as number) : o.savedM3PerDayKm);
  const order = reaches.filter((o) => o.savedM3PerDay > 0).sort((a, b) => key(b) - key(a) || (a.reach.id < b.reach.id ? -1 : 1));
  const steps: ProgrammeStep[] = [];
  let km = 0, money = 0, saved = 0;
  const everyCost = reaches.every((o) => o.cost !== null);
  for (const outcome of order) {
    const nextKm = km + outcome.lengthM / 1000, nextMoney = money + (outcome.cost ?? 0);
    if (plan.budget && 'km' in plan.budget && nextKm > plan.budget.km + 1e-9) continue;
    if (plan.budget && 'money' in plan.budget && nextMoney > plan.budget.money + 1e-9) continue;
    km = nextKm;
    money = nextMoney;
    saved += outcome.savedM3PerDay;
    steps.push({ outcome, kmTotal: km, costTotal: everyCost ? money : null, savedM3PerDayTotal: saved });
  }
  return { steps, rankedBy };
}
