// Validation stage: turns parsed GeoJSON features into typed records of lines and zones,
// or throws a DataError naming the file, the feature and the field. Pure: no file access.
import { DataError } from '../io/data-error.js';
import { rechargeToMPerDay } from '../hydraulics/units.js';

export type LineKind = 'canal' | 'drain';

export interface LineRecord {
  index: number;
  id: string;
  name: string | null;
  kind: LineKind;
  /** Stage at the first vertex and at the end of the line (m); equal when constant. */
  stageStartM: number;
  stageEndM: number;
  /** Parts in lon/lat: one per LineString part. */
  partsLonLat: number[][][];
  /** The feature's own attributes, copied into a prototype-free object. */
  properties: Record<string, unknown>;
}

export interface ZoneRecord {
  index: number;
  id: string;
  kMPerDay: number;
  baseM: number;
  groundM: number;
  rechargeMPerDay: number;
  /** Polygons in lon/lat: each is its outer ring then holes. */
  polygonsLonLat: number[][][][];
}

interface FeatureView {
  file: string;
  index: number;
  id: string | undefined;
  geometry: Record<string, unknown> | null;
  properties: Record<string, unknown>;
}

function viewFeature(file: string, feature: unknown, index: number): FeatureView {
  if (feature === null || typeof feature !== 'object' || (feature as { type?: unknown }).type !== 'Feature') {
    throw new DataError({ file, featureIndex: index }, 'is not a GeoJSON Feature');
  }
  const raw = feature as Record<string, unknown>;
  const properties: Record<string, unknown> = Object.create(null);
  if (raw.properties !== null && typeof raw.properties === 'object') {
    for (const [key, value] of Object.entries(raw.properties as object)) properties[key] = value;
  }
  const id = typeof properties.id === 'string' || typeof properties.id === 'number' ? String(properties.id) : undefined;
  const geometry = raw.geometry !== null && typeof raw.geometry === 'object' ? (raw.geometry as Record<string, unknown>) : null;
  return { file, index, id, geometry, properties };
}

function fail(view: FeatureView, field: string | undefined, problem: string): never {
  throw new DataError({ file: view.file, featureIndex: view.index, featureId: view.id, field }, problem);
}

function requiredId(view: FeatureView, seen: Set<string>): string {
  if (view.id === undefined || view.id.trim() === '') fail(view, 'id', 'missing id: every feature needs a unique text id');
  if (seen.has(view.id)) fail(view, 'id', `duplicate id "${view.id}"`);
  seen.add(view.id);
  return view.id;
}

function numberField(view: FeatureView, field: string, fallback?: number): number {
  const value = view.properties[field];
  if (value === undefined || value === null || value === '') {
    if (fallback !== undefined) return fallback;
    fail(view, field, 'missing required number');
  }
  if (typeof value !== 'number') {
    fail(view, field, `expected a number, found ${typeof value} ${JSON.stringify(value)}`);
  }
  if (!Number.isFinite(value)) fail(view, field, `expected a finite number, found ${value}`);
  return value;
}

function checkPosition(view: FeatureView, position: unknown): number[] {
  if (!Array.isArray(position) || position.length < 2) fail(view, 'geometry', 'a position is not an array of at least two numbers');
  const [lon, lat] = position as unknown[];
  if (typeof lon !== 'number' || typeof lat !== 'number' || !Number.isFinite(lon) || !Number.isFinite(lat)) {
    fail(view, 'geometry', `a coordinate is not a finite number: ${JSON.stringify(position)}`);
  }
  if (Math.abs(lon) > 180 || Math.abs(lat) > 90) {
    fail(view, 'geometry', `coordinate ${JSON.stringify(position)} is not longitude/latitude in degrees (RFC 7946); reproject the file to WGS 84`);
  }
  return [lon, lat];
}

function lineParts(view: FeatureView): number[][][] {
  const geometry = view.geometry;
  if (geometry === null) fail(view, 'geometry', 'has no geometry');
  const raw = geometry.type === 'LineString' ? [geometry.coordinates] : geometry.type === 'MultiLineString' ? geometry.coordinates : null;
  if (raw === null) fail(view, 'geometry', `expected LineString or MultiLineString, found ${JSON.stringify(geometry.type)}`);
  if (!Array.isArray(raw) || raw.length === 0) fail(view, 'geometry', 'empty geometry');
  return raw.map((part) => {
    if (!Array.isArray(part) || part.length < 2) fail(view, 'geometry', 'a line part has fewer than two positions');
    return part.map((position) => checkPosition(view, position));
  });
}

function polygonList(view: FeatureView): number[][][][] {
  const geometry = view.geometry;
  if (geometry === null) fail(view, 'geometry', 'has no geometry');
  const raw = geometry.type === 'Polygon' ? [geometry.coordinates] : geometry.type === 'MultiPolygon' ? geometry.coordinates : null;
  if (raw === null) fail(view, 'geometry', `expected Polygon or MultiPolygon, found ${JSON.stringify(geometry.type)}`);
  if (!Array.isArray(raw) || raw.length === 0) fail(view, 'geometry', 'empty geometry');
  return raw.map((polygon) => {
    if (!Array.isArray(polygon) || polygon.length === 0) fail(view, 'geometry', 'a polygon has no rings');
    return polygon.map((ring) => {
      if (!Array.isArray(ring) || ring.length < 4) fail(view, 'geometry', 'a polygon ring has fewer than four positions');
      const positions = ring.map((position) => checkPosition(view, position));
      const first = positions[0], last = positions[positions.length - 1];
      if (first[0] !== last[0] || first[1] !== last[1]) fail(view, 'geometry', 'a polygon ring is not closed (first and last positions differ)');
      return positions;
    });
  });
}

export function readLines(file: string, features: unknown[]): LineRecord[] {
  if (features.length === 0) throw new DataError({ file }, 'has no features: expected canal and drain lines');
  const seen = new Set<string>();
  return features.map((feature, index) => {
    const view = viewFeature(file, feature, index);
    const id = requiredId(view, seen);
    const kindValue = view.properties.kind ?? 'canal';
    if (kindValue !== 'canal' && kindValue !== 'drain') fail(view, 'kind', `expected "canal" or "drain", found ${JSON.stringify(kindValue)}`);
    const hasConstant = view.properties.stage_m !== undefined && view.properties.stage_m !== null;
    let stageStartM: number, stageEndM: number;
    if (hasConstant) {
      stageStartM = stageEndM = numberField(view, 'stage_m');
    } else if (view.properties.stage_start_m !== undefined || view.properties.stage_end_m !== undefined) {
      stageStartM = numberField(view, 'stage_start_m');
      stageEndM = numberField(view, 'stage_end_m');
    } else {
      fail(view, 'stage_m', 'missing water level: give stage_m, or stage_start_m and stage_end_m');
    }
    const name = view.properties.name;
    return {
      index,
      id,
      name: typeof name === 'string' ? name : null,
      kind: kindValue,
      stageStartM,
      stageEndM,
      partsLonLat: lineParts(view),
      properties: view.properties,
    };
  });
}

export function readZones(file: string, features: unknown[]): ZoneRecord[] {
  if (features.length === 0) throw new DataError({ file }, 'has no features: expected aquifer zone polygons');
  const seen = new Set<string>();
  return features.map((feature, index) => {
    const view = viewFeature(file, feature, index);
    const id = requiredId(view, seen);
    const kMPerDay = numberField(view, 'k_m_d');
    if (!(kMPerDay > 0)) fail(view, 'k_m_d', `hydraulic conductivity must be positive, found ${kMPerDay}`);
    const baseM = numberField(view, 'base_m');
    const groundM = numberField(view, 'ground_m');
    if (!(groundM > baseM)) fail(view, 'ground_m', `ground ${groundM} m must lie above the aquifer base ${baseM} m`);
    const rechargeMmPerYear = numberField(view, 'recharge_mm_yr', 0);
    return {
      index,
      id,
      kMPerDay,
      baseM,
      groundM,
      rechargeMPerDay: rechargeToMPerDay(rechargeMmPerYear, 'mm/yr'),
      polygonsLonLat: polygonList(view),
    };
  });
}

/** The line's stage (m) at a chainage (m), varying linearly from its first vertex to its end. */
export function stageAtChainage(line: LineRecord, chainageM: number, lineLengthM: number): number {
  if (line.stageStartM === line.stageEndM || !(lineLengthM > 0)) return line.stageStartM;
  const fraction = Math.min(Math.max(chainageM / lineLengthM, 0), 1);
  return line.stageStartM + (line.stageEndM - line.stageStartM) * fraction;
}
