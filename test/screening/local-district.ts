// Small invented districts laid out in metres of UTM zone 36N, screened in process.
import { expect } from 'vitest';
import { chooseWorkCrs } from '../../src/geometry/work-crs.js';
import { checkLines, checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';
import { screenDistrict, type ScreenResult } from '../../src/screening/screen.js';
import { DEFAULT_SETTINGS, type ScreenSettings } from '../../src/shared/settings.js';

const WORK_CRS = 'EPSG:32636';
const { crs } = chooseWorkCrs([30.4, 29.4, 30.6, 29.6], WORK_CRS);
const E0 = 300_000, N0 = 3_265_000;

/** Positions given in metres from an invented origin, as lon/lat. */
export const lonLat = (points: number[][]) => points.map(([x, y]) => crs.inverse([E0 + x, N0 + y]));

export function line(id: string, properties: Record<string, unknown>, points: number[][]) {
  return { type: 'Feature', properties: { id, ...properties }, geometry: { type: 'LineString', coordinates: lonLat(points) } };
}

export function box(id: string, properties: Record<string, unknown>, [x0, y0, x1, y1]: number[]) {
  const ring = lonLat([[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]);
  return { type: 'Feature', properties: { id, ...properties }, geometry: { type: 'Polygon', coordinates: [ring] } };
}

/** Checks the features (no error allowed): the records, and the settings of the layout's work CRS. */
export function checkedLocal(lineFeatures: object[], zoneFeatures: object[], settings: Partial<ScreenSettings> = {}) {
  const lines = checkLines('lines.geojson', lineFeatures, DEFAULT_RULES);
  const zones = checkZones('zones.geojson', zoneFeatures, DEFAULT_RULES);
  expect([...lines.problems, ...zones.problems].filter((p) => p.severity === 'error')).toEqual([]);
  return { lines: lines.records, zones: zones.records, settings: { ...DEFAULT_SETTINGS, crs: WORK_CRS, ...settings } };
}

/** Checks the features (no problem allowed) and screens them in the same work CRS as the layout. */
export function screenLocal(lineFeatures: object[], zoneFeatures: object[], settings: Partial<ScreenSettings> = {}): ScreenResult {
  const lines = checkLines('lines.geojson', lineFeatures, DEFAULT_RULES);
  const zones = checkZones('zones.geojson', zoneFeatures, DEFAULT_RULES);
  // warnings (a default applied to every feature, say) are the tests' own business; errors are not
  expect([...lines.problems, ...zones.problems].filter((p) => p.severity === 'error')).toEqual([]);
  return screenDistrict(lines.records, zones.records, { ...DEFAULT_SETTINGS, crs: WORK_CRS, ...settings });
}
