// The CRS an input file is written in, resolved to a transform to lon/lat (WGS 84). EPSG codes
// come from the epsg-index registry (one small JSON file per code, read on demand); WKT from a
// .prj and proj4 strings go to proj4 as they are.
import proj4 from 'proj4';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

export interface SourceCrs {
  /** How the CRS was named: "EPSG:32643", "WKT (.prj)", a proj4 string. */
  label: string;
  /** null when the coordinates are already lon/lat on WGS 84 (or a datum within its tolerance). */
  toLonLat: ((x: number, y: number) => [number, number]) | null;
  warnings: string[];
}

const LON_LAT = '+proj=longlat +datum=WGS84 +no_defs';
const require = createRequire(import.meta.url);
const LON_LAT_CODES = new Set([4326, 4979, 4258, 4269]);

/** The EPSG code in `EPSG:n`, `EPSG::n`, `urn:ogc:def:crs:EPSG::n` or `.../EPSG/0/n`; null otherwise. */
export function epsgCodeOf(spec: string): number | null {
  const match = /^(?:urn:ogc:def:crs:)?EPSG:(?:[\d.]*:)?(\d+)$/i.exec(spec.trim()) ?? /opengis\.net\/def\/crs\/EPSG\/[\d.]+\/(\d+)$/i.exec(spec.trim());
  return match ? Number(match[1]) : null;
}

function isCrs84(spec: string): boolean {
  return /^urn:ogc:def:crs:OGC:(?:1\.3:)?CRS84$/i.test(spec.trim()) || /opengis\.net\/def\/crs\/OGC\/1\.3\/CRS84$/i.test(spec.trim());
}

function registryProj4(code: number): string {
  let entry: { proj4?: string; kind?: string };
  try {
    const path = require.resolve(`epsg-index/s/${code}.json`);
    entry = JSON.parse(readFileSync(path, 'utf8'));
  } catch {
    throw new Error(`EPSG:${code} is not a coordinate reference system in the EPSG registry`);
  }
  // only map CRSs have the two horizontal axes doab reads: no geocentric, vertical or compound ones
  if (entry.kind !== 'CRS-PROJCRS' && entry.kind !== 'CRS-GEOGCRS') {
    throw new Error(`EPSG:${code} is a ${(entry.kind ?? 'unknown').replace(/^CRS-/, '')} coordinate reference system, not a projected or geographic 2D one`);
  }
  if (!entry.proj4) throw new Error(`EPSG:${code} (${entry.kind}) has no usable definition`);
  return entry.proj4;
}

// proj4js cannot load grid-shift files, and doab fetches nothing at run time: drop the grid and
// say so, since the datum shift is then left out altogether.
function withoutGrids(definition: string, warnings: string[], label: string): string {
  return definition.replace(/\s*\+nadgrids=(\S+)/g, (whole, grids: string) => {
    if (grids === '@null') return whole;
    warnings.push(`${label}: grid shift ${grids} is not available; the datum shift is left out and positions may be off by up to a few hundred metres; give --input-crs a proj4 string with +towgs84 for this datum`);
    return '';
  });
}

function transformFrom(definition: string): (x: number, y: number) => [number, number] {
  const converter = proj4(definition, LON_LAT);
  return (x, y) => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return [x, y];
    const [lon, lat] = converter.forward([x, y]);
    return [lon, lat];
  };
}

/**
 * The other way: lon/lat (WGS 84) into a CRS named as resolveSourceCrs takes it (a DEM's, say);
 * null when that CRS is lon/lat on WGS 84 already. Throws as resolveSourceCrs does.
 */
export function lonLatToCrs(spec: string): ((lon: number, lat: number) => [number, number]) | null {
  const resolved = resolveSourceCrs(spec);
  if (!resolved.toLonLat) return null;
  const text = spec.trim();
  const code = epsgCodeOf(text);
  const authority = /AUTHORITY\s*\[\s*"EPSG"\s*,\s*"?(\d+)"?\s*\]\s*\]\s*$/i.exec(text) ?? /ID\s*\[\s*"EPSG"\s*,\s*(\d+)\s*\]\s*\]\s*$/i.exec(text);
  const definition = code !== null ? registryProj4(code) : authority ? registryProj4(Number(authority[1])) : text;
  const converter = proj4(LON_LAT, withoutGrids(definition, [], 'CRS'));
  return (lon, lat) => {
    const [x, y] = converter.forward([lon, lat]);
    return [x, y];
  };
}

/** Resolves a CRS named in a file or on the command line; throws an Error saying what is accepted. */
export function resolveSourceCrs(spec: string): SourceCrs {
  const text = spec.trim();
  const warnings: string[] = [];
  if (isCrs84(text)) return { label: 'OGC:CRS84', toLonLat: null, warnings };
  const code = epsgCodeOf(text);
  if (code !== null) {
    const label = `EPSG:${code}`;
    if (LON_LAT_CODES.has(code)) return { label, toLonLat: null, warnings };
    const definition = withoutGrids(registryProj4(code), warnings, label);
    return { label, toLonLat: checked(label, () => transformFrom(definition)), warnings };
  }
  if (text.startsWith('+proj=')) {
    if (/\+proj=(?:longlat|latlong)\b/.test(text) && /WGS84/i.test(text)) return { label: text, toLonLat: null, warnings };
    return { label: text, toLonLat: checked(text, () => transformFrom(withoutGrids(text, warnings, 'proj4 string'))), warnings };
  }
  if (/^(?:PROJCS|GEOGCS|PROJCRS|GEOGCRS|GEODCRS)\s*\[/i.test(text)) {
    const authority = /AUTHORITY\s*\[\s*"EPSG"\s*,\s*"?(\d+)"?\s*\]\s*\]\s*$/i.exec(text) ?? /ID\s*\[\s*"EPSG"\s*,\s*(\d+)\s*\]\s*\]\s*$/i.exec(text);
    if (authority) return resolveSourceCrs(`EPSG:${authority[1]}`);
    if (/^GEOG/i.test(text) && /WGS[ _]?(?:19)?84/i.test(text)) return { label: 'WKT (WGS 84 lon/lat)', toLonLat: null, warnings };
    return { label: wktLabel(text), toLonLat: checked('the WKT definition', () => transformFrom(text)), warnings };
  }
  throw new Error(`unrecognised CRS "${text.slice(0, 80)}"; use EPSG:<code>, a proj4 string starting with "+proj=", or WKT`);
}

function checked<T>(what: string, make: () => T): T {
  try {
    return make();
  } catch (error) {
    throw new Error(`proj4 cannot use ${what.slice(0, 80)}: ${error instanceof Error ? error.message : String(error)}`);
  }
}

/** A WKT definition by name and, where it carries one, its EPSG code: "WKT: WGS_1984_UTM_Zone_43N (EPSG:32643)". */
export function wktLabel(text: string): string {
  const name = /^\s*[A-Z_]+\s*\[\s*"([^"]{1,120})"/i.exec(text)?.[1];
  // the authority of the whole CRS is the last one, just before its closing bracket
  const code = /(?:AUTHORITY\s*\[\s*"EPSG"\s*,\s*"?(\d+)"?\s*\]|ID\s*\[\s*"EPSG"\s*,\s*(\d+)\s*\])\s*\]\s*$/i.exec(text);
  const epsg = code ? code[1] ?? code[2] : null;
  return `WKT${name ? `: ${name}` : ''}${epsg ? ` (EPSG:${epsg})` : ''}`;
}
