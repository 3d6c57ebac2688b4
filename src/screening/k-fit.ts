// A conductivity multiplier per zone that best fits the wells: least squares in log K (the
// residuals of the wells against log10 of each zone's multiplier), bounded, by Gauss-Newton with
// Levenberg damping on finite-difference sensitivities, re-screening the district for each. Only a
// suggestion: the caller applies it only when the user asks. Pure.
import type { ScreenSettings } from '../shared/settings.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import { screenDistrict } from './screen.js';
import { compareWells, type WellRecord } from './wells.js';

/** Multipliers are kept within these bounds (a factor of 10 either way: K is rarely known better than that, nor worse). */
export const K_MULTIPLIER_MIN = 0.1;
export const K_MULTIPLIER_MAX = 10;
/** Gauss-Newton steps at most, and the step in log10 K for the sensitivities. */
const MAX_STEPS = 6;
/**
 * Each fitted zone costs a screening per step: at most this many zones are fitted (those with the
 * most wells; ties by the zones' order), the others keep 1 and are said to be left out.
 */
export const MAX_FITTED_ZONES = 20;
const SENSITIVITY_STEP = 0.05;

export interface ZoneFit {
  zoneId: string;
  /** The suggested multiplier of the zone's K (1 where no well stands in the zone). */
  multiplier: number;
  /** Wells in the zone behind it. */
  wells: number;
  /** At a bound: the wells would have it go further. */
  atBound: boolean;
  /** Whether the fit moved it: false for a zone with no well, or one past MAX_FITTED_ZONES. */
  fitted: boolean;
}

export interface ConductivityFit {
  zones: ZoneFit[];
  /** RMSE of the wells (m) with the zones' K as given, and with the multipliers, at the fit's own resolution. */
  rmseBeforeM: number;
  rmseAfterM: number;
  screenings: number;
  /** How the fit screened: the district solve at this cell (m), or the strips (null). */
  cellM: number | null;
}

/** Zones with their K multiplied, a copy. */
export function scaleZones(zones: readonly ZoneRecord[], multipliers: readonly number[]): ZoneRecord[] {
  return zones.map((zone, i) => (multipliers[i] === 1 ? zone : { ...zone, kMPerDay: zone.kMPerDay * multipliers[i] }));
}

/**
 * Fits the multipliers. The district solve (when the run has it) screens at twice the run's cell,
 * a quarter of the cells, for speed; the reported residuals come from the run itself.
 */
export function fitConductivity(
  lines: readonly LineRecord[],
  zones: readonly ZoneRecord[],
  settings: ScreenSettings,
  wells: readonly WellRecord[],
  file: string,
  maxFittedZones = MAX_FITTED_ZONES,
): ConductivityFit {
  const fitSettings: ScreenSettings = settings.stripsOnly ? settings : { ...settings, districtCellM: settings.districtCellM * 2 };
  let screenings = 0;
  const residuals = (logM: Float64Array): Float64Array => {
    screenings++;
    const result = screenDistrict(lines as LineRecord[], scaleZones(zones, Array.from(logM, (v) => 10 ** v)), fitSettings, undefined, { coarseCheck: false });
    return Float64Array.from(compareWells(result, wells, file).figures, (figure) => figure.residualM);
  };
  const zoneCount = zones.length;
  let logM: Float64Array = new Float64Array(zoneCount);
  // the wells behind the fit: those with a computed figure at the start; a zone is fitted when one stands in it
  const base = compareWells(screenDistrict(lines as LineRecord[], [...zones], fitSettings, undefined, { coarseCheck: false }), wells, file);
  screenings++;
  let r: Float64Array = Float64Array.from(base.figures, (figure) => figure.residualM);
  const used = base.figures.map((figure) => Number.isFinite(figure.residualM));
  const wellsIn = zones.map((zone) => base.figures.filter((figure, w) => used[w] && figure.zoneId === zone.id).length);
  const byWells = zones.map((_, z) => z).filter((z) => wellsIn[z] > 0).sort((a, b) => wellsIn[b] - wellsIn[a] || a - b);
  const chosen = new Set(byWells.slice(0, Math.max(0, maxFittedZones)));
  const fitted = zones.map((_, z) => chosen.has(z));
  const cost = (values: Float64Array) => values.reduce((sum, v, w) => (used[w] && Number.isFinite(v) ? sum + v * v : sum), 0);
  const count = used.filter(Boolean).length;
  const rmseBefore = count > 0 ? Math.sqrt(cost(r) / count) : NaN;
  let lambda = 1e-3;
  // nothing to fit (no zone with a well within the budget): the first screening is all
  for (let step = 0; step < MAX_STEPS && count > 0 && fitted.some(Boolean); step++) {
    // sensitivities by forward differences, one screening per fitted zone
    const columns: (Float64Array | null)[] = fitted.map((isFitted, z) => {
      if (!isFitted) return null;
      const moved = Float64Array.from(logM);
      moved[z] += SENSITIVITY_STEP;
      const rz = residuals(moved);
      return Float64Array.from(rz, (v, w) => (used[w] && Number.isFinite(v) && Number.isFinite(r[w]) ? (v - r[w]) / SENSITIVITY_STEP : 0));
    });
    const active = columns.map((column, z) => (column ? z : -1)).filter((z) => z >= 0);
    const n = active.length;
    const jtj = new Float64Array(n * n), jtr = new Float64Array(n);
    for (let a = 0; a < n; a++) {
      const ca = columns[active[a]] as Float64Array;
      for (let w = 0; w < ca.length; w++) if (used[w] && Number.isFinite(r[w])) jtr[a] += ca[w] * r[w];
      for (let b = 0; b < n; b++) {
        const cb = columns[active[b]] as Float64Array;
        for (let w = 0; w < ca.length; w++) if (used[w]) jtj[a * n + b] += ca[w] * cb[w];
      }
    }
    const before = cost(r);
    let improved = false;
    for (let attempt = 0; attempt < 4 && !improved; attempt++) {
      const delta = solveDamped(jtj, jtr, n, lambda);
      const next = Float64Array.from(logM);
      active.forEach((z, a) => {
        next[z] = Math.min(Math.log10(K_MULTIPLIER_MAX), Math.max(Math.log10(K_MULTIPLIER_MIN), next[z] - delta[a]));
      });
      const rNext = residuals(next);
      if (cost(rNext) < before) {
        const moved = Math.max(...active.map((z) => Math.abs(next[z] - logM[z])), 0);
        logM = next;
        r = rNext;
        lambda = Math.max(lambda / 10, 1e-6);
        improved = true;
        // a change under 0.2% in every multiplier ends the fit
        if (moved < 1e-3) step = MAX_STEPS;
      } else lambda *= 10;
    }
    if (!improved) break;
  }
  return {
    zones: zones.map((zone, z) => {
      const multiplier = 10 ** logM[z];
      return {
        zoneId: zone.id,
        multiplier,
        wells: wellsIn[z],
        atBound: fitted[z] && (multiplier <= K_MULTIPLIER_MIN * 1.0001 || multiplier >= K_MULTIPLIER_MAX * 0.9999),
        fitted: fitted[z],
      };
    }),
    rmseBeforeM: rmseBefore,
    rmseAfterM: count > 0 ? Math.sqrt(cost(r) / count) : NaN,
    screenings,
    cellM: settings.stripsOnly ? null : fitSettings.districtCellM,
  };
}

/** Solves (JtJ + lambda diag(JtJ)) d = Jtr by Gaussian elimination with partial pivoting (n is the number of zones: small). */
function solveDamped(jtj: Float64Array, jtr: Float64Array, n: number, lambda: number): Float64Array {
  const a = new Float64Array(n * (n + 1));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) a[i * (n + 1) + j] = jtj[i * n + j] + (i === j ? lambda * Math.max(jtj[i * n + i], 1e-12) : 0);
    a[i * (n + 1) + n] = jtr[i];
  }
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let row = col + 1; row < n; row++) if (Math.abs(a[row * (n + 1) + col]) > Math.abs(a[pivot * (n + 1) + col])) pivot = row;
    if (pivot !== col) for (let k = 0; k <= n; k++) { const t = a[col * (n + 1) + k]; a[col * (n + 1) + k] = a[pivot * (n + 1) + k]; a[pivot * (n + 1) + k] = t; }
    const p = a[col * (n + 1) + col];
    if (p === 0) continue;
    for (let row = col + 1; row < n; row++) {
      const factor = a[row * (n + 1) + col] / p;
      for (let k = col; k <= n; k++) a[row * (n + 1) + k] -= factor * a[col * (n + 1) + k];
    }
  }
  const x = new Float64Array(n);
  for (let row = n - 1; row >= 0; row--) {
    let sum = a[row * (n + 1) + n];
    for (let k = row + 1; k < n; k++) sum -= a[row * (n + 1) + k] * x[k];
    const p = a[row * (n + 1) + row];
    x[row] = p === 0 ? 0 : sum / p;
  }
  return x;
}
