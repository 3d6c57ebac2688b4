// Counts a run will need, checked against the settings' budgets before anything is allocated, so a
// --step of a millimetre on a district (or a hostile config) is refused with the figure, not by
// running out of memory.
import { UsageError } from '../shared/errors.js';
import type { ScreenSettings } from '../shared/settings.js';
import type { LineRecord } from './district-inputs.js';

// mean Earth radius, IUGG [from memory]; an estimate for a budget needs no better
const EARTH_RADIUS_M = 6_371_008.8;

/** Length of a lon/lat polyline, interleaved (lon0, lat0, lon1, lat1, ...), in m by the haversine formula: a budget's estimate, not a measure. */
function roughLengthM(part: Float64Array): number {
  let sum = 0;
  for (let i = 2; i < part.length; i += 2) {
    const lon1 = part[i - 2], lat1 = part[i - 1], lon2 = part[i], lat2 = part[i + 1];
    const p1 = (lat1 * Math.PI) / 180, p2 = (lat2 * Math.PI) / 180;
    const dp = p2 - p1, dl = ((lon2 - lon1) * Math.PI) / 180;
    const a = Math.sin(dp / 2) ** 2 + Math.cos(p1) * Math.cos(p2) * Math.sin(dl / 2) ** 2;
    sum += 2 * EARTH_RADIUS_M * Math.asin(Math.min(1, Math.sqrt(a)));
  }
  return sum;
}

/** About how many stations the lines will get at the settings' step. */
export function estimateStations(lines: readonly LineRecord[], stepM: number): number {
  let stations = 0;
  for (const line of lines) for (const part of line.partsLonLat) stations += Math.ceil(roughLengthM(part) / stepM) + 1;
  return stations;
}

/** Refuses a run whose stations would pass the budget (a usage error naming the step and the budget). */
export function checkRunBudget(lines: readonly LineRecord[], settings: ScreenSettings): void {
  const stations = estimateStations(lines, settings.stepM);
  if (stations > settings.maxStations) {
    throw new UsageError(
      `a step of ${settings.stepM} m gives about ${stations.toExponential(2)} stations on these lines, more than the budget of ${settings.maxStations} ` +
        '(--step / stepM sets the spacing, --max-stations / maxStations the budget)',
      'stepM',
    );
  }
}
