import proj4 from 'proj4';
import { UsageError } from '../shared/errors.js';

/** A user's CRS that cannot be used: the user's to fix (a usage error naming the crs setting). */
const refuse = (message: string) => new UsageError(message, 'crs');

/** A metric working CRS with its converter built once (lon/lat degrees <-> metres). */
export interface WorkCrs {
  name: string;
  proj4Def: string;
  epsg: number | null;
  forward(lonLat: [number, number]): [number, number];
  inverse(xy: [number, number]): [number, number];
}

const LON_LAT_WGS84 = '+proj=longlat +datum=WGS84 +no_defs';
const UTM_ZONE_WIDTH_DEG = 6;
// UTM keeps its scale within 0.9996-1.0010 inside a zone [from memory]; beyond 0.2% the CRS does not suit the data
const SCALE_WARN = 0.002;
// Beyond 1 % every spacing and loss is off by as much: a CRS for another part of the world
const SCALE_REFUSE = 0.01;
// WGS 84 defining semi-major axis and flattening, NIMA TR8350.2 (2000) [from memory]
const WGS84_A_M = 6378137;
const WGS84_F = 1 / 298.257223563;
const ACCEPTED = 'accepted: EPSG:32601-32660 (UTM north, WGS 84), EPSG:32701-32760 (UTM south, WGS 84), or a proj4 string starting with "+proj=" in metres';

/** UTM zone number (1-60) holding a longitude; 180 E folds into zone 60 rather than a zone 61. */
export function utmZone(lonDeg: number): number {
  const zone = Math.floor((lonDeg + 180) / UTM_ZONE_WIDTH_DEG) + 1;
  return Math.min(60, Math.max(1, zone));
}

function utmCrs(zone: number, south: boolean): WorkCrs {
  const epsg = (south ? 32700 : 32600) + zone;
  const def = `+proj=utm +zone=${zone}${south ? ' +south' : ''} +datum=WGS84 +units=m +no_defs`;
  return makeCrs(`WGS 84 / UTM zone ${zone}${south ? 'S' : 'N'}`, def, epsg);
}

function makeCrs(name: string, proj4Def: string, epsg: number | null): WorkCrs {
  const converter = proj4(LON_LAT_WGS84, proj4Def);
  return {
    name,
    proj4Def,
    epsg,
    forward: (lonLat) => converter.forward(lonLat) as [number, number],
    inverse: (xy) => converter.inverse(xy) as [number, number],
  };
}

function checkBbox(bbox: [number, number, number, number]): void {
  const [w, s, e, n] = bbox;
  const ok = [w, s, e, n].every(Number.isFinite) && w <= e && s <= n && w >= -180 && e <= 180 && s >= -90 && n <= 90;
  if (!ok) throw new Error(`Unexpected lon/lat bbox: [${bbox.join(', ')}] (want [west, south, east, north] in degrees).`);
}

function userProj4Crs(def: string, centre: [number, number]): WorkCrs {
  // proj4 happily parses strings it cannot use, so a trial transform is the real test
  if (/\+proj=(longlat|latlong|lonlat|latlon)\b/.test(def)) {
    throw refuse(`CRS "${def}" is geographic; doab needs a CRS in metres (${ACCEPTED}).`);
  }
  if (/\+proj=geocent\b/.test(def)) {
    throw refuse(`CRS "${def}" is geocentric (X, Y, Z from the earth's centre), not a map projection; ${ACCEPTED}.`);
  }
  const units = /\+units=(\S+)/.exec(def);
  if (units && units[1] !== 'm') throw refuse(`CRS "${def}" is not in metres (+units=${units[1]}); ${ACCEPTED}.`);
  let crs: WorkCrs;
  let xy: [number, number];
  try {
    crs = makeCrs(def, def, null);
    xy = crs.forward(centre);
  } catch (err) {
    throw refuse(`Unknown CRS "${def}": ${err instanceof Error ? err.message : String(err)}; ${ACCEPTED}.`);
  }
  if (!Number.isFinite(xy[0]) || !Number.isFinite(xy[1])) {
    throw refuse(`CRS "${def}" cannot project the data's centre (${centre.join(', ')}); ${ACCEPTED}.`);
  }
  return crs;
}

/**
 * Point scale of the CRS at a place, east-west: projected length of 0.001 degree of longitude over
 * its length on the ellipsoid, N cos(lat) dlon (N the prime vertical radius of curvature).
 */
export function scaleAt(crs: WorkCrs, lonLat: [number, number]): number {
  const d = 1e-3;
  const [lon, lat] = lonLat;
  const a = crs.forward([lon - d / 2, lat]);
  const b = crs.forward([lon + d / 2, lat]);
  const e2 = WGS84_F * (2 - WGS84_F);
  const phi = (lat * Math.PI) / 180;
  const n = WGS84_A_M / Math.sqrt(1 - e2 * Math.sin(phi) ** 2);
  return Math.hypot(b[0] - a[0], b[1] - a[1]) / ((n * Math.cos(phi) * d * Math.PI) / 180);
}

/**
 * Chooses the metric CRS the geometry stage works in: by default the WGS 84 UTM zone of the bbox
 * centre; a user CRS may be `EPSG:326xx`/`EPSG:327xx` or a proj4 string (`+proj=...`).
 * Example: chooseWorkCrs([30.4, 29.4, 30.6, 29.6]).crs.epsg === 32636
 */
export function chooseWorkCrs(
  bboxLonLat: [number, number, number, number],
  userCrs?: string,
): { crs: WorkCrs; warnings: string[] } {
  checkBbox(bboxLonLat);
  const [w, s, e, n] = bboxLonLat;
  const centre: [number, number] = [(w + e) / 2, (s + n) / 2];
  const warnings: string[] = [];
  if (e - w > UTM_ZONE_WIDTH_DEG) {
    // Transverse Mercator scale error grows with the square of the distance from the central meridian
    warnings.push(
      `The data span ${(e - w).toFixed(2)} degrees of longitude, more than one UTM zone (6 degrees); distances far from the central meridian carry scale error.`,
    );
  }
  let crs: WorkCrs;
  const spec = userCrs?.trim();
  if (spec === undefined || spec === '') {
    crs = utmCrs(utmZone(centre[0]), centre[1] < 0);
  } else if (/^epsg:\d+$/i.test(spec)) {
    const code = Number(spec.slice(5));
    const zone = code % 100;
    const hemi = code - zone;
    if ((hemi !== 32600 && hemi !== 32700) || zone < 1 || zone > 60) {
      throw refuse(`Unsupported CRS "${userCrs}"; ${ACCEPTED}.`);
    }
    crs = utmCrs(zone, hemi === 32700);
  } else if (spec.startsWith('+proj=')) {
    crs = userProj4Crs(spec, centre);
  } else {
    throw refuse(`Unsupported CRS "${userCrs}"; ${ACCEPTED}.`);
  }
  const scale = scaleAt(crs, centre);
  if (!(Math.abs(scale - 1) <= SCALE_REFUSE)) {
    throw refuse(
      `CRS "${userCrs ?? crs.name}" has a scale of ${scale.toFixed(4)} at the data centre: every distance would be off by ${(Math.abs(scale - 1) * 100).toFixed(1)}%; ` +
        `choose a CRS made for the data's area, or leave --crs out for the UTM zone of the data centre.`,
    );
  }
  if (Math.abs(scale - 1) > SCALE_WARN) {
    warnings.push(`${crs.name} has a scale of ${scale.toFixed(4)} at the data centre; distances are off by ${(Math.abs(scale - 1) * 100).toFixed(2)}%.`);
  }
  return { crs, warnings };
}

/** [west, south, east, north] of lines given as parts of interleaved lon/lat (lon0, lat0, lon1, lat1, ...). */
export function boundsOfParts(lines: readonly (readonly Float64Array[])[]): [number, number, number, number] {
  let w = Infinity, s = Infinity, e = -Infinity, n = -Infinity;
  for (const parts of lines) {
    for (const part of parts) {
      for (let i = 0; i < part.length; i += 2) {
        const lon = part[i], lat = part[i + 1];
        if (lon < w) w = lon;
        if (lon > e) e = lon;
        if (lat < s) s = lat;
        if (lat > n) n = lat;
      }
    }
  }
  return [w, s, e, n];
}

/**
 * Positions in lon/lat, as [lon, lat] pairs or interleaved (lon0, lat0, lon1, lat1, ...), to
 * interleaved x,y in the work CRS.
 */
export function projectPositions(crs: WorkCrs, positions: readonly (readonly number[])[] | Float64Array): Float64Array {
  const interleaved = positions instanceof Float64Array;
  const out = new Float64Array(interleaved ? positions.length : positions.length * 2);
  for (let i = 0; i < out.length; i += 2) {
    const [x, y] = crs.forward(interleaved ? [positions[i], positions[i + 1]] : [positions[i / 2][0], positions[i / 2][1]]);
    out[i] = x;
    out[i + 1] = y;
  }
  return out;
}
