import proj4 from 'proj4';

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
    throw new Error(`CRS "${def}" is geographic; doab needs a CRS in metres (${ACCEPTED}).`);
  }
  const units = /\+units=(\S+)/.exec(def);
  if (units && units[1] !== 'm') throw new Error(`CRS "${def}" is not in metres (+units=${units[1]}); ${ACCEPTED}.`);
  let crs: WorkCrs;
  let xy: [number, number];
  try {
    crs = makeCrs(def, def, null);
    xy = crs.forward(centre);
  } catch (err) {
    throw new Error(`Unknown CRS "${def}": ${(err as Error).message}; ${ACCEPTED}.`);
  }
  if (!Number.isFinite(xy[0]) || !Number.isFinite(xy[1])) {
    throw new Error(`CRS "${def}" cannot project the data's centre (${centre.join(', ')}); ${ACCEPTED}.`);
  }
  return crs;
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
      throw new Error(`Unsupported CRS "${userCrs}"; ${ACCEPTED}.`);
    }
    crs = utmCrs(zone, hemi === 32700);
    const lonOffset = Math.abs(centre[0] - (zone * 6 - 183));
    if (Math.min(lonOffset, 360 - lonOffset) > UTM_ZONE_WIDTH_DEG / 2) {
      warnings.push(`The data centre (${centre[0].toFixed(3)} E) lies outside UTM zone ${zone} of ${spec}; distances carry extra scale error.`);
    }
  } else if (spec.startsWith('+proj=')) {
    crs = userProj4Crs(spec, centre);
  } else {
    throw new Error(`Unsupported CRS "${userCrs}"; ${ACCEPTED}.`);
  }
  return { crs, warnings };
}
