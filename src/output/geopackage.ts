// One OGC GeoPackage 1.3 (OGC 12-128r18) [published] holding a run: the strips, lines and
// (when asked) transects in the work CRS with an R-tree index each, the ranking as an attributes
// table, the run record as metadata, and the SLD styles in the layer_styles table desktop GIS reads
// on opening. Built by better-sqlite3 in the run's temporary file when the run's atomic writer
// reaches it. Same result and options, same bytes.
import { closedRing, quoteId, WKB_LINESTRING, WKB_MULTILINESTRING, WKB_POLYGON } from './layer-rows.js';
import Database from 'better-sqlite3';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import type { ScreenResult } from '../screening/screen.js';
import type { BuiltFile } from './atomic-write.js';
import type { WorkCrs } from '../geometry/work-crs.js';
import { doabLineFields, lineRow, rankingRow, RANKING_COLUMNS, stripProperties, transectRow, transectSides } from './layers.js';
import { linesSld, stripsSld, type LinesLook, type StripsLook } from './sld.js';

export interface GeoPackageOptions {
  /** run.json's text, stored as the GeoPackage's metadata (application/json). */
  runRecord: string;
  /** The run's start (ISO 8601): every timestamp in the file; the epoch when null or absent, so a rerun is byte-identical. */
  startedAt?: string | null;
  /** The report's look, for the styles (src/index.ts passes src/report/palette.ts and map-svg.ts's figures). */
  look: { strips: StripsLook; lines: LinesLook };
}

// GeoPackage 1.3 clause 1.1.1.1.1 [published]: application_id 'GPKG', user_version 10300
export const GPKG_APPLICATION_ID = 0x47504b47;
export const GPKG_USER_VERSION = 10300;
const FIXED_EPOCH = '1970-01-01T00:00:00.000Z';
// a work CRS given as a proj4 string has no EPSG code; GDAL numbers such CRSs from 100000 too
const CUSTOM_SRS_ID = 100000;
const GEOMETRY_COLUMN = 'geom';

type SqlType = 'TEXT' | 'REAL' | 'INTEGER' | 'BOOLEAN';
interface Column {
  name: string;
  type: SqlType;
}



// doab's own numbers carry a unit in their name; a field of doab's that is null in every feature
// keeps its type by that name (a strips-only run has no district figures)
const UNIT_SUFFIX = /_(m|d|ha|km|yr|share|ratio|ratio_min)$/;

/** What a field's values so far were: text, real, integer, boolean. */
interface ValuesSeen {
  doabReal: boolean;
  text: boolean;
  real: boolean;
  integer: boolean;
  boolean: boolean;
}

const valuesSeen = (doabReal: boolean): ValuesSeen => ({ doabReal, text: false, real: false, integer: false, boolean: false });

function see(seen: ValuesSeen, value: unknown): void {
  if (value === null || value === undefined) return;
  if (typeof value === 'number') {
    if (seen.doabReal || !Number.isInteger(value) || Math.abs(value) >= 1e21) seen.real = true;
    else seen.integer = true;
  } else if (typeof value === 'boolean') seen.boolean = true;
  else seen.text = true;
}

/**
 * A field's type from its values, as GDAL reads the GeoJSON layer: text when any value is text (or
 * an object), real when any number has a fraction or when doab writes the field as real, integer
 * otherwise; true/false alone make a boolean.
 */
function columnType(name: string, seen: ValuesSeen): SqlType {
  if (seen.text) return 'TEXT';
  if (seen.real) return 'REAL';
  if (seen.integer) return 'INTEGER';
  if (seen.boolean) return 'BOOLEAN';
  return seen.doabReal && UNIT_SUFFIX.test(name) ? 'REAL' : 'TEXT';
}

function sqlValue(value: unknown, type: SqlType): string | number | null {
  if (value === null || value === undefined) return null;
  if (type === 'TEXT') return typeof value === 'string' ? value : typeof value === 'number' ? String(value) : JSON.stringify(value);
  if (typeof value === 'boolean') return value ? 1 : 0;
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  return null;
}

/** Columns in the order their keys first appear; names SQLite would take as one (it ignores case) or ours (fid, geom) get a suffix. */
function columnsOf(count: number, rowOf: (i: number) => Record<string, unknown>, isDoabReal: (key: string) => boolean): { columns: Column[]; keys: string[] } {
  // one pass over the rows, each made and let go: a layer's records are never all held
  const keys: string[] = [];
  const seen = new Map<string, ValuesSeen>();
  for (let i = 0; i < count; i++) {
    const row = rowOf(i);
    for (const key of Object.keys(row)) {
      let values = seen.get(key);
      if (!values) {
        values = valuesSeen(isDoabReal(key));
        seen.set(key, values);
        keys.push(key);
      }
      see(values, row[key]);
    }
  }
  const taken = new Set(['fid', GEOMETRY_COLUMN]);
  const columns = keys.map((key) => {
    let name = key === '' ? 'field' : key;
    for (let n = 2; taken.has(name.toLowerCase()); n++) name = `${key}_${n}`;
    taken.add(name.toLowerCase());
    return { name, type: columnType(key, seen.get(key)!) };
  });
  return { columns, keys };
}

// ---- geometry: GeoPackage binary header (clause 2.1.3) then little-endian WKB (ISO 13249-3) [published]

interface Envelope {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

const emptyEnvelope = (): Envelope => ({ minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity });

function extend(env: Envelope, coords: Float64Array): void {
  for (let i = 0; i < coords.length; i += 2) {
    if (coords[i] < env.minX) env.minX = coords[i];
    if (coords[i] > env.maxX) env.maxX = coords[i];
    if (coords[i + 1] < env.minY) env.minY = coords[i + 1];
    if (coords[i + 1] > env.maxY) env.maxY = coords[i + 1];
  }
}


/** A geometry blob: `kind` polygon (one ring per part), multilinestring or linestring (one part). */
function geometryBlob(srsId: number, kind: number, parts: Float64Array[]): { blob: Buffer; env: Envelope } {
  const env = emptyEnvelope();
  for (const part of parts) extend(env, part);
  const points = parts.reduce((n, part) => n + part.length / 2, 0);
  const wkbBytes = kind === WKB_POLYGON ? 9 + 4 * parts.length + 16 * points
    : kind === WKB_MULTILINESTRING ? 9 + 9 * parts.length + 16 * points
      : 9 + 16 * points;
  const buffer = Buffer.alloc(8 + 32 + wkbBytes);
  buffer.write('GP', 0, 'latin1');
  buffer.writeUInt8(0, 2);
  // flags: little-endian (bit 0), envelope [minx, maxx, miny, maxy] (indicator 1 in bits 1-3)
  buffer.writeUInt8(0b0000_0011, 3);
  buffer.writeInt32LE(srsId, 4);
  buffer.writeDoubleLE(env.minX, 8);
  buffer.writeDoubleLE(env.maxX, 16);
  buffer.writeDoubleLE(env.minY, 24);
  buffer.writeDoubleLE(env.maxY, 32);
  let at = 40;
  const header = (type: number) => {
    buffer.writeUInt8(1, at);
    buffer.writeUInt32LE(type, at + 1);
    at += 5;
  };
  const pointsOf = (part: Float64Array) => {
    buffer.writeUInt32LE(part.length / 2, at);
    at += 4;
    for (let i = 0; i < part.length; i++, at += 8) buffer.writeDoubleLE(part[i], at);
  };
  header(kind);
  if (kind === WKB_LINESTRING) pointsOf(parts[0]);
  else {
    buffer.writeUInt32LE(parts.length, at);
    at += 4;
    for (const part of parts) {
      if (kind === WKB_MULTILINESTRING) header(WKB_LINESTRING);
      pointsOf(part);
    }
  }
  if (at !== buffer.length) throw new Error(`Unexpected geometry size: wrote ${at} of ${buffer.length} bytes.`);
  return { blob: buffer, env };
}


// ---- the work CRS's definition

const require = createRequire(import.meta.url);

/** OGC WKT 1 of a UTM zone on WGS 84, as the EPSG registry words it. */
function utmWkt(zone: number, south: boolean, epsg: number | null): string {
  const authority = (code: number) => `AUTHORITY["EPSG","${code}"]`;
  return (
    `PROJCS["WGS 84 / UTM zone ${zone}${south ? 'S' : 'N'}",GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,${authority(7030)}],${authority(6326)}],` +
    `PRIMEM["Greenwich",0,${authority(8901)}],UNIT["degree",0.0174532925199433,${authority(9122)}],${authority(4326)}],PROJECTION["Transverse_Mercator"],` +
    `PARAMETER["latitude_of_origin",0],PARAMETER["central_meridian",${6 * zone - 183}],PARAMETER["scale_factor",0.9996],PARAMETER["false_easting",500000],` +
    `PARAMETER["false_northing",${south ? 10000000 : 0}],UNIT["metre",1,${authority(9001)}],AXIS["Easting",EAST],AXIS["Northing",NORTH]` +
    `${epsg !== null ? `,${authority(epsg)}` : ''}]`
  );
}

/**
 * The work CRS's WKT: the EPSG registry's (epsg-index) when it has the code; built for a UTM zone
 * on WGS 84 given as a proj4 string; 'undefined' otherwise, as GeoPackage clause 1.1.2.1.1 allows.
 */
export function workCrsWkt(crs: WorkCrs): string {
  if (crs.epsg !== null) {
    try {
      const entry = JSON.parse(readFileSync(require.resolve(`epsg-index/s/${crs.epsg}.json`), 'utf8')) as { wkt?: string };
      if (entry.wkt) return entry.wkt;
    } catch {
      // not in the registry: built below when it is a UTM zone
    }
    const utm = /^32([67])(\d\d)$/.exec(String(crs.epsg));
    if (utm && Number(utm[2]) >= 1 && Number(utm[2]) <= 60) return utmWkt(Number(utm[2]), utm[1] === '7', crs.epsg);
    return 'undefined';
  }
  const def = crs.proj4Def;
  const zone = /\+proj=utm\b/.test(def) ? /\+zone=(\d+)/.exec(def) : null;
  const wgs84 = /\+datum=WGS84\b/.test(def) || (/\+ellps=WGS84\b/.test(def) && !/\+towgs84=/.test(def));
  if (zone && wgs84 && Number(zone[1]) >= 1 && Number(zone[1]) <= 60) return utmWkt(Number(zone[1]), /\+south\b/.test(def), null);
  return 'undefined';
}

// ---- the file

// GeoPackage 1.3 annex C table definitions [published]
const CORE_SQL = `
CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER PRIMARY KEY, organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT);
CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE,
  description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id));
CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name), CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id));
CREATE TABLE gpkg_extensions (table_name TEXT, column_name TEXT, extension_name TEXT NOT NULL, definition TEXT NOT NULL,
  scope TEXT NOT NULL, CONSTRAINT ge_tce UNIQUE (table_name, column_name, extension_name));
CREATE TABLE gpkg_metadata (id INTEGER CONSTRAINT m_pk PRIMARY KEY ASC NOT NULL, md_scope TEXT NOT NULL DEFAULT 'dataset',
  md_standard_uri TEXT NOT NULL, mime_type TEXT NOT NULL DEFAULT 'text/xml', metadata TEXT NOT NULL DEFAULT '');
CREATE TABLE gpkg_metadata_reference (reference_scope TEXT NOT NULL, table_name TEXT, column_name TEXT, row_id_value INTEGER,
  timestamp DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')), md_file_id INTEGER NOT NULL, md_parent_id INTEGER,
  CONSTRAINT crmr_mfi_fk FOREIGN KEY (md_file_id) REFERENCES gpkg_metadata(id),
  CONSTRAINT crmr_mpi_fk FOREIGN KEY (md_parent_id) REFERENCES gpkg_metadata(id));
CREATE TABLE layer_styles (id INTEGER PRIMARY KEY AUTOINCREMENT, f_table_catalog TEXT(256), f_table_schema TEXT(256),
  f_table_name TEXT(256), f_geometry_column TEXT(256), styleName TEXT(30), styleQML TEXT, styleSLD TEXT, useAsDefault BOOLEAN,
  description TEXT, owner TEXT(30), ui TEXT(30), update_time DATETIME);
`;

// GeoPackage 1.3 annex F.3 [published]: the R-tree kept in step with its table; they run only
// when a GIS edits the file (the ST_ functions are the reader's, e.g. GDAL's)
function rtreeTriggers(t: string, c: string, i = 'fid'): string {
  const r = quoteId(`rtree_${t}_${c}`), tq = quoteId(t), cq = quoteId(c), name = (s: string) => quoteId(`rtree_${t}_${c}_${s}`);
  const insert = (row: 'NEW') => `INSERT OR REPLACE INTO ${r} VALUES (${row}.${i}, ST_MinX(${row}.${cq}), ST_MaxX(${row}.${cq}), ST_MinY(${row}.${cq}), ST_MaxY(${row}.${cq}));`;
  return `
CREATE TRIGGER ${name('insert')} AFTER INSERT ON ${tq} WHEN (new.${cq} NOT NULL AND NOT ST_IsEmpty(NEW.${cq})) BEGIN ${insert('NEW')} END;
CREATE TRIGGER ${name('update1')} AFTER UPDATE OF ${cq} ON ${tq} WHEN OLD.${i} = NEW.${i} AND (NEW.${cq} NOTNULL AND NOT ST_IsEmpty(NEW.${cq})) BEGIN ${insert('NEW')} END;
CREATE TRIGGER ${name('update2')} AFTER UPDATE OF ${cq} ON ${tq} WHEN OLD.${i} = NEW.${i} AND (NEW.${cq} ISNULL OR ST_IsEmpty(NEW.${cq})) BEGIN DELETE FROM ${r} WHERE id = OLD.${i}; END;
CREATE TRIGGER ${name('update3')} AFTER UPDATE ON ${tq} WHEN OLD.${i} != NEW.${i} AND (NEW.${cq} NOTNULL AND NOT ST_IsEmpty(NEW.${cq})) BEGIN DELETE FROM ${r} WHERE id = OLD.${i}; ${insert('NEW')} END;
CREATE TRIGGER ${name('update4')} AFTER UPDATE ON ${tq} WHEN OLD.${i} != NEW.${i} AND (NEW.${cq} ISNULL OR ST_IsEmpty(NEW.${cq})) BEGIN DELETE FROM ${r} WHERE id IN (OLD.${i}, NEW.${i}); END;
CREATE TRIGGER ${name('delete')} AFTER DELETE ON ${tq} WHEN old.${cq} NOT NULL BEGIN DELETE FROM ${r} WHERE id = OLD.${i}; END;
`;
}

interface Layer {
  table: string;
  geometryType: 'POLYGON' | 'MULTILINESTRING' | 'LINESTRING';
  description: string;
  columns: Column[];
  keys: string[];
  count: number;
  /** Row i's record, made as it is inserted (and, before, as the column types are found). */
  row: (i: number) => Record<string, unknown>;
  /** Row i's geometry, made as it is inserted: a layer's blobs are never all held. */
  geometry: (i: number) => { blob: Buffer; env: Envelope };
}

function stripsTable(result: ScreenResult, srsId: number): Layer {
  const count = result.strips.length;
  const row = (i: number) => stripProperties(result.strips[i]);
  const { columns, keys } = columnsOf(count, row, () => true);
  const geometry = (i: number) => geometryBlob(srsId, WKB_POLYGON, [closedRing(result.strips[i].strip.ringM)]);
  return { table: 'strips', geometryType: 'POLYGON', description: 'Strips between facing lines, ranked (as strips.geojson)', columns, keys, count, row, geometry };
}

function linesTable(result: ScreenResult, srsId: number): Layer {
  // the fields doab adds (all real numbers but the texts), as against the input's own attributes
  const own = new Set(doabLineFields(result));
  // the kind as the solve read it (the input may name it otherwise or in its own words): the style's filter
  const row = (i: number) => ({ ...lineRow(result, i), kind_used: result.lines[i].kind });
  own.add('kind_used');
  const count = result.lines.length;
  const { columns, keys } = columnsOf(count, row, (key) => own.has(key));
  const geometry = (i: number) => geometryBlob(srsId, WKB_MULTILINESTRING, result.geometries[i].parts);
  return { table: 'lines', geometryType: 'MULTILINESTRING', description: 'Canals and drains with their losses (as canals.geojson, plus kind_used)', columns, keys, count, row, geometry };
}

function transectsTable(result: ScreenResult, srsId: number): Layer {
  const { stations, facings } = result;
  // the same facings in the same order as transectsLayer writes them
  const sides = transectSides(result);
  const row = (k: number) => transectRow(result, sides[k]);
  const geometry = (k: number) => {
    const i = sides[k], s = i >> 1;
    return geometryBlob(srsId, WKB_LINESTRING, [Float64Array.of(stations.x[s], stations.y[s], facings.endX[i], facings.endY[i])]);
  };
  const { columns, keys } = columnsOf(sides.length, row, () => true);
  return { table: 'transects', geometryType: 'LINESTRING', description: 'Transects from stations to their partner lines (as transects.geojson)', columns, keys, count: sides.length, row, geometry };
}

function timestampOf(startedAt: string | null | undefined): string {
  if (!startedAt) return FIXED_EPOCH;
  const time = Date.parse(startedAt);
  if (!Number.isFinite(time)) throw new Error(`Unexpected startedAt value: ${startedAt}.`);
  return new Date(time).toISOString();
}

function fill(db: Database.Database, result: ScreenResult, options: GeoPackageOptions): void {
  const stamp = timestampOf(options.startedAt);
  const { crs } = result;
  const srsId = crs.epsg ?? CUSTOM_SRS_ID;
  db.exec(CORE_SQL);
  const srs = db.prepare('INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)');
  srs.run('Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system');
  srs.run('Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system');
  srs.run('WGS 84 geodetic', 4326, 'EPSG', 4326, workCrsWkt({ ...crs, epsg: 4326 }), 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid');
  if (srsId !== 4326) {
    srs.run(crs.name, srsId, crs.epsg !== null ? 'EPSG' : 'doab', crs.epsg ?? CUSTOM_SRS_ID, workCrsWkt(crs), `doab work CRS: ${crs.proj4Def}`);
  }
  const contents = db.prepare('INSERT INTO gpkg_contents VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)');
  const extension = db.prepare('INSERT INTO gpkg_extensions VALUES (?, ?, ?, ?, ?)');

  // one layer's records at a time
  const layers = [stripsTable, linesTable, ...(result.settings.writeTransects ? [transectsTable] : [])];
  for (const table of layers) {
    const layer = table(result, srsId);
    const t = quoteId(layer.table);
    db.exec(`CREATE TABLE ${t} (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, ${GEOMETRY_COLUMN} ${layer.geometryType}${layer.columns.map((c) => `, ${quoteId(c.name)} ${c.type}`).join('')})`);
    const insert = db.prepare(`INSERT INTO ${t} VALUES (?, ?${', ?'.repeat(layer.columns.length)})`);
    const rtreeName = `rtree_${layer.table}_${GEOMETRY_COLUMN}`;
    db.exec(`CREATE VIRTUAL TABLE ${quoteId(rtreeName)} USING rtree(id, minx, maxx, miny, maxy)`);
    const rtree = db.prepare(`INSERT INTO ${quoteId(rtreeName)} VALUES (?, ?, ?, ?, ?)`);
    const env = emptyEnvelope();
    for (let i = 0; i < layer.count; i++) {
      const row = layer.row(i);
      const { blob, env: e } = layer.geometry(i);
      insert.run(i + 1, blob, ...layer.keys.map((key, k) => sqlValue(row[key], layer.columns[k].type)));
      // an R-tree holds 32-bit floats, rounded outwards by SQLite, so a search never misses a feature
      if (Number.isFinite(e.minX)) rtree.run(i + 1, e.minX, e.maxX, e.minY, e.maxY);
      env.minX = Math.min(env.minX, e.minX), env.minY = Math.min(env.minY, e.minY);
      env.maxX = Math.max(env.maxX, e.maxX), env.maxY = Math.max(env.maxY, e.maxY);
    }
    const has = Number.isFinite(env.minX);
    contents.run(layer.table, 'features', layer.table, layer.description, stamp, has ? env.minX : null, has ? env.minY : null, has ? env.maxX : null, has ? env.maxY : null, srsId);
    db.prepare('INSERT INTO gpkg_geometry_columns VALUES (?, ?, ?, ?, 0, 0)').run(layer.table, GEOMETRY_COLUMN, layer.geometryType, srsId);
    extension.run(layer.table, GEOMETRY_COLUMN, 'gpkg_rtree_index', 'http://www.geopackage.org/spec/#extension_rtree', 'write-only');
    db.exec(rtreeTriggers(layer.table, GEOMETRY_COLUMN));
  }

  // the ranking as ranking.csv holds it, typed (no spreadsheet quoting: a GeoPackage is no spreadsheet)
  const rankRow = (i: number) => rankingRow(result.strips[i], i + 1) as Record<string, unknown>;
  const rankSeen = new Map(RANKING_COLUMNS.map((key) => [key, valuesSeen(true)]));
  for (let i = 0; i < result.strips.length; i++) {
    const row = rankRow(i);
    for (const key of RANKING_COLUMNS) see(rankSeen.get(key)!, row[key]);
  }
  const rankColumns: Column[] = RANKING_COLUMNS.map((key) => ({ name: key, type: key === 'rank' ? 'INTEGER' : columnType(key, rankSeen.get(key)!) }));
  db.exec(`CREATE TABLE ranking (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL${rankColumns.map((c) => `, ${quoteId(c.name)} ${c.type}`).join('')})`);
  const rankInsert = db.prepare(`INSERT INTO ranking VALUES (?${', ?'.repeat(rankColumns.length)})`);
  for (let i = 0; i < result.strips.length; i++) {
    const row = rankRow(i);
    rankInsert.run(i + 1, ...rankColumns.map((c) => sqlValue(row[c.name], c.type)));
  }
  contents.run('ranking', 'attributes', 'ranking', 'Strips ranked by loss per km (as ranking.csv)', stamp, null, null, null, null, null);

  // the run record (metadata extension, GeoPackage 1.3 clause F.8 [published])
  db.prepare("INSERT INTO gpkg_metadata VALUES (1, 'dataset', 'https://www.iana.org/assignments/media-types/application/json', 'application/json', ?)").run(options.runRecord);
  db.prepare("INSERT INTO gpkg_metadata_reference VALUES ('geopackage', NULL, NULL, NULL, ?, 1, NULL)").run(stamp);
  for (const table of ['gpkg_metadata', 'gpkg_metadata_reference']) {
    extension.run(table, null, 'gpkg_metadata', 'http://www.geopackage.org/spec/#extension_metadata', 'read-write');
  }

  // styles: the SLD texts, default for their layer; no QML (the reader builds its own from the SLD)
  const style = db.prepare("INSERT INTO layer_styles VALUES (?, '', '', ?, ?, ?, '', ?, 1, ?, 'doab', NULL, ?)");
  style.run(1, 'strips', GEOMETRY_COLUMN, 'doab risk classes', stripsSld(options.look.strips), 'Strips filled by risk class, as the doab report', stamp);
  style.run(2, 'lines', GEOMETRY_COLUMN, 'doab loss per km', linesSld(options.look.lines), 'Lines by loss per km, drains dashed, as the doab report', stamp);
  contents.run('layer_styles', 'attributes', 'layer_styles', 'Styles desktop GIS applies on opening (SLD 1.1)', stamp, null, null, null, null, null);

  db.pragma(`application_id = ${GPKG_APPLICATION_ID}`);
  db.pragma(`user_version = ${GPKG_USER_VERSION}`);
}

// SQLite's page cache while building (KiB, as a negative cache_size) [from memory: SQLite PRAGMA
// cache_size]: enough for the R-trees' pages, far less than the file of a large district
const CACHE_KIB = 32 * 1024;

/**
 * The run as one GeoPackage file, built by SQLite straight into the temporary file the run's atomic
 * writer gives it (src/output/atomic-write.ts), when that writer reaches it: never held in memory
 * whole, and a full disk or a size limit is met by that writer. No journal (the file is new and is
 * only renamed into place once whole), so nothing is written beside it.
 */
export function geopackageFile(result: ScreenResult, options: GeoPackageOptions): BuiltFile {
  return { buildAt: (path) => writeGeopackage(path, result, options) };
}

/** Builds the run's GeoPackage in the file at `path`, which must be new and empty. */
export function writeGeopackage(path: string, result: ScreenResult, options: GeoPackageOptions): void {
  const db = new Database(path);
  try {
    db.pragma('journal_mode = OFF');
    db.pragma('locking_mode = EXCLUSIVE');
    db.pragma(`cache_size = -${CACHE_KIB}`);
    db.transaction(() => fill(db, result, options))();
  } finally {
    db.close();
  }
}
