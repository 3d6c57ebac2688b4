// A run written into a PostGIS database: the strips, lines and ranking as the GeoPackage holds
// them, in a schema of the user's choosing, geometry in the work CRS (its SRID registered when the
// database lacks it), keyed by run id, with a table of runs. One transaction: a failure anywhere
// leaves the database as it was.
import { closedRing, quoteId, WKB_LINESTRING, WKB_MULTILINESTRING, WKB_POLYGON } from './layer-rows.js';
import type pg from 'pg';
import type { ScreenResult } from '../screening/screen.js';
import type { WorkCrs } from '../geometry/work-crs.js';
import { workCrsWkt } from './geopackage.js';
import { lineRows, rankingRow, RANKING_COLUMNS, stripProperties, transectRows, transectSides } from './layers.js';

export interface PostgisOptions {
  /** Connection string; the password best comes from PGPASSWORD or a password file (pg reads both). */
  url: string;
  /** Schema to write into, created when missing: letters, digits and underscores, at most 63. */
  schema: string;
  /** The run's key in every table. */
  runId: string;
  /** run.json's text, stored in the runs table. */
  runRecord: string;
  /** What a run id already in the schema does: its rows are replaced, or the write is refused. */
  ifExists: 'replace' | 'refuse';
}

// PostgreSQL truncates identifiers beyond NAMEDATALEN - 1 = 63 bytes [published]
const MAX_IDENTIFIER_BYTES = 63;
// PostGIS's user SRIDs run from 900000 to 998999 (spatial_ref_sys's check constraint) [published]
const USER_SRID_FIRST = 900000, USER_SRID_LAST = 998999;
// the wire protocol counts a statement's parameters in 16 bits [published]; stay well below
const MAX_PARAMETERS = 30000, MAX_BATCH_ROWS = 1000;
// one advisory lock for every doab write, so two runs never race for a run id or a user SRID
const ADVISORY_LOCK_KEY = 0x646f6162; // 'doab'
const GEOMETRY_COLUMN = 'geom';


/** The connection string without its password, for messages. */
export function redactedUrl(url: string): string {
  try {
    const parsed = new URL(url);
    if (parsed.password !== '') parsed.password = '***';
    parsed.searchParams.forEach((_, key) => {
      if (key.toLowerCase() === 'password') parsed.searchParams.set(key, '***');
    });
    return parsed.toString();
  } catch {
    return '(connection string)';
  }
}

export function checkSchemaName(schema: string): void {
  if (!/^[A-Za-z_][A-Za-z0-9_]{0,62}$/.test(schema)) {
    throw new Error(`Unexpected schema name: ${JSON.stringify(schema)} (letters, digits and underscores, not starting with a digit, at most ${MAX_IDENTIFIER_BYTES}).`);
  }
}

type PgType = 'text' | 'double precision' | 'bigint' | 'boolean';
interface Column {
  name: string;
  key: string;
  type: PgType;
}

/** A field's type from its values, as the GeoPackage types it: text wins, then real, integer, boolean. */
function columnType(values: Iterable<unknown>, doabReal: boolean): PgType {
  let text = false, real = false, integer = false, boolean = false;
  for (const value of values) {
    if (value === null || value === undefined) continue;
    if (typeof value === 'number') {
      if (doabReal || !Number.isSafeInteger(value)) real = true;
      else integer = true;
    } else if (typeof value === 'boolean') boolean = true;
    else text = true;
  }
  if (text) return 'text';
  if (real) return 'double precision';
  if (integer) return 'bigint';
  if (boolean) return 'boolean';
  return doabReal ? 'double precision' : 'text';
}

function pgValue(value: unknown, type: PgType): string | number | boolean | null {
  if (value === null || value === undefined) return null;
  if (type === 'text') return typeof value === 'string' ? value : typeof value === 'number' || typeof value === 'boolean' ? String(value) : JSON.stringify(value);
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (typeof value === 'boolean') return type === 'boolean' ? value : null;
  return null;
}

const byteLength = (name: string) => Buffer.byteLength(name, 'utf8');

/** Columns in the order their keys first appear; a name that is ours, taken (PostgreSQL compares quoted names exactly) or too long gets a suffix. */
function columnsOf(rows: Record<string, unknown>[], reserved: string[], isDoabReal: (key: string) => boolean): Column[] {
  const keys: string[] = [];
  const seen = new Set<string>();
  for (const row of rows) for (const key of Object.keys(row)) if (!seen.has(key)) (seen.add(key), keys.push(key));
  const taken = new Set(reserved);
  return keys.map((key, k) => {
    let name = key === '' || byteLength(key) > MAX_IDENTIFIER_BYTES || key.includes('\u0000') ? `field_${k + 1}` : key;
    for (let n = 2; taken.has(name); n++) name = `${key.slice(0, 40).replace(/\u0000/g, '')}_${n}`;
    taken.add(name);
    return { name, key, type: columnType(rows.map((row) => row[key]), isDoabReal(key)) };
  });
}

// ---- geometry as little-endian WKB (ISO 13249-3) [published], the same rings and parts as the GeoPackage


function checkFinite(parts: Float64Array[], what: string): void {
  for (const part of parts) {
    for (let i = 0; i < part.length; i++) {
      if (!Number.isFinite(part[i])) throw new Error(`Unexpected coordinate in ${what}: ${part[i]} at index ${i}.`);
    }
  }
}

function wkb(kind: typeof WKB_POLYGON | typeof WKB_MULTILINESTRING, parts: Float64Array[]): Buffer {
  const points = parts.reduce((n, part) => n + part.length / 2, 0);
  const size = kind === WKB_POLYGON ? 9 + 4 * parts.length + 16 * points : 9 + 9 * parts.length + 16 * points;
  const buffer = Buffer.alloc(size);
  let at = 0;
  const header = (type: number) => {
    buffer.writeUInt8(1, at);
    buffer.writeUInt32LE(type, at + 1);
    at += 5;
  };
  header(kind);
  buffer.writeUInt32LE(parts.length, at);
  at += 4;
  for (const part of parts) {
    if (kind === WKB_MULTILINESTRING) header(WKB_LINESTRING);
    buffer.writeUInt32LE(part.length / 2, at);
    at += 4;
    for (let i = 0; i < part.length; i++, at += 8) buffer.writeDoubleLE(part[i], at);
  }
  if (at !== size) throw new Error(`Unexpected geometry size: wrote ${at} of ${size} bytes.`);
  return buffer;
}


// ---- the tables

interface Table {
  name: 'strips' | 'lines' | 'transects' | 'ranking';
  /** the key beside run_id */
  key: Column;
  geometryType: 'Polygon' | 'MultiLineString' | null;
  columns: Column[];
  rows: Record<string, unknown>[];
  geometries: Buffer[] | null;
}


function stripsTable(result: ScreenResult): Table {
  const rows = result.strips.map(stripProperties);
  const key: Column = { name: 'strip_id', key: 'strip_id', type: 'text' };
  const columns = columnsOf(rows, ['run_id', GEOMETRY_COLUMN], () => true).filter((c) => c.key !== 'strip_id');
  const geometries = result.strips.map((strip) => {
    const ring = closedRing(strip.strip.ringM);
    checkFinite([ring], `strip ${strip.stripId}`);
    return wkb(WKB_POLYGON, [ring]);
  });
  return { name: 'strips', key, geometryType: 'Polygon', columns, rows, geometries };
}

function linesTable(result: ScreenResult): Table {
  const rows = lineRows(result);
  rows.forEach((row, i) => {
    row.kind_used = result.lines[i].kind;
    row.line_id = result.lines[i].id;
  });
  const key: Column = { name: 'line_id', key: 'line_id', type: 'text' };
  // the input's own attributes come as they are; doab's numbers are real (as the GeoPackage types them)
  const own = new Set(['length_m', 'net_loss_m3_d', 'net_loss_m3_d_km', 'covers_share', 'coarse_cell_diff_m3_d', 'strip_net_loss_m3_d',
    'strip_net_loss_m3_d_km', 'strip_diff_m3_d', 'paired_m', 'unpaired_m', 'solved_sides_m', 'bed_resistance_used_d', 'wetted_perimeter_used_m']);
  const columns = columnsOf(rows, ['run_id', GEOMETRY_COLUMN, 'line_id'], (k) => own.has(k)).filter((c) => c.key !== 'line_id');
  const geometries = result.geometries.map((line, i) => {
    checkFinite(line.parts, `line ${result.lines[i].id}`);
    return wkb(WKB_MULTILINESTRING, line.parts);
  });
  return { name: 'lines', key, geometryType: 'MultiLineString', columns, rows, geometries };
}

/** The transects layer (with --transects), keyed by the transect side's number in the run; each a one-part MultiLineString. */
function transectsTable(result: ScreenResult): Table {
  const rows = transectRows(result);
  const { stations, facings } = result;
  const sides = transectSides(result);
  rows.forEach((row, k) => (row.side_number = sides[k]));
  const key: Column = { name: 'side_number', key: 'side_number', type: 'bigint' };
  const text = new Set(['line', 'side', 'partner', 'reason', 'solve']);
  const columns = columnsOf(rows, ['run_id', GEOMETRY_COLUMN, 'side_number'], (k) => !text.has(k)).filter((c) => c.key !== 'side_number');
  const geometries = sides.map((i) => {
    const station = i >> 1;
    const part = Float64Array.of(stations.x[station], stations.y[station], facings.endX[i], facings.endY[i]);
    checkFinite([part], `transect side ${i}`);
    return wkb(WKB_MULTILINESTRING, [part]);
  });
  return { name: 'transects', key, geometryType: 'MultiLineString', columns, rows, geometries };
}

function rankingTable(result: ScreenResult): Table {
  const rows = result.strips.map((strip, i) => rankingRow(strip, i + 1) as Record<string, unknown>);
  const key: Column = { name: 'rank', key: 'rank', type: 'bigint' };
  const columns = RANKING_COLUMNS.filter((c) => c !== 'rank').map((c): Column => ({ name: c, key: c, type: columnType(rows.map((row) => row[c]), true) }));
  return { name: 'ranking', key, geometryType: null, columns, rows, geometries: null };
}

// ---- the database

type Db = pg.ClientBase;

async function requirePostgis(db: Db): Promise<void> {
  const { rowCount } = await db.query("SELECT 1 FROM pg_extension WHERE extname = 'postgis'");
  if (rowCount) return;
  try {
    await db.query('CREATE EXTENSION IF NOT EXISTS postgis');
  } catch (error) {
    throw new Error(`PostGIS is not installed in this database and doab could not install it (${(error as Error).message}): ask its administrator to run CREATE EXTENSION postgis.`);
  }
}

/** The work CRS's SRID: its EPSG code (registered when missing), or a user SRID holding its proj4 text. */
async function workSrid(db: Db, crs: WorkCrs): Promise<number> {
  if (crs.epsg !== null) {
    const { rowCount } = await db.query('SELECT 1 FROM spatial_ref_sys WHERE srid = $1', [crs.epsg]);
    if (!rowCount) {
      const wkt = workCrsWkt(crs);
      await db.query('INSERT INTO spatial_ref_sys (srid, auth_name, auth_srid, srtext, proj4text) VALUES ($1, $2, $3, $4, $5)',
        [crs.epsg, 'EPSG', crs.epsg, wkt === 'undefined' ? null : wkt, crs.proj4Def]);
    }
    return crs.epsg;
  }
  const same = await db.query<{ srid: number }>(
    "SELECT srid FROM spatial_ref_sys WHERE auth_name = 'doab' AND proj4text = $1 AND srid BETWEEN $2 AND $3 ORDER BY srid LIMIT 1",
    [crs.proj4Def, USER_SRID_FIRST, USER_SRID_LAST],
  );
  if (same.rows.length > 0) return same.rows[0].srid;
  const next = await db.query<{ srid: number }>(
    'SELECT COALESCE(MAX(srid) + 1, $1)::int AS srid FROM spatial_ref_sys WHERE srid BETWEEN $1 AND $2',
    [USER_SRID_FIRST, USER_SRID_LAST],
  );
  const srid = next.rows[0].srid;
  if (srid > USER_SRID_LAST) throw new Error(`No user SRID left between ${USER_SRID_FIRST} and ${USER_SRID_LAST} for the work CRS ${crs.proj4Def}.`);
  const wkt = workCrsWkt(crs);
  await db.query('INSERT INTO spatial_ref_sys (srid, auth_name, auth_srid, srtext, proj4text) VALUES ($1, $2, $1, $3, $4)',
    [srid, 'doab', wkt === 'undefined' ? null : wkt, crs.proj4Def]);
  return srid;
}

async function createTable(db: Db, schema: string, table: Table, srid: number): Promise<void> {
  const s = quoteId(schema), t = `${s}.${quoteId(table.name)}`;
  const geometry = table.geometryType ? `, ${GEOMETRY_COLUMN} geometry(${table.geometryType}, ${srid}) NOT NULL` : '';
  await db.query(
    `CREATE TABLE IF NOT EXISTS ${t} (run_id text NOT NULL REFERENCES ${s}.runs (run_id) ON DELETE CASCADE, ` +
    `${quoteId(table.key.name)} ${table.key.type} NOT NULL${geometry}, PRIMARY KEY (run_id, ${quoteId(table.key.name)}))`,
  );
  if (table.geometryType) {
    await db.query(`CREATE INDEX IF NOT EXISTS ${quoteId(`${table.name}_${GEOMETRY_COLUMN}_gist`)} ON ${t} USING gist (${GEOMETRY_COLUMN})`);
    // an earlier run in another work CRS: its column takes no other SRID
    const { rows } = await db.query<{ srid: number }>(
      'SELECT srid FROM geometry_columns WHERE f_table_schema = $1 AND f_table_name = $2 AND f_geometry_column = $3',
      [schema, table.name, GEOMETRY_COLUMN],
    );
    if (rows.length > 0 && rows[0].srid !== srid) {
      throw new Error(`Table ${schema}.${table.name} holds geometry in SRID ${rows[0].srid}, this run's work CRS is SRID ${srid}: write it into another schema.`);
    }
  }
  // earlier runs may lack some of this run's fields (each district brings its own attributes)
  const existing = await db.query<{ column_name: string; data_type: string }>(
    'SELECT column_name, data_type FROM information_schema.columns WHERE table_schema = $1 AND table_name = $2',
    [schema, table.name],
  );
  const types = new Map(existing.rows.map((row) => [row.column_name, row.data_type]));
  for (const column of table.columns) {
    const had = types.get(column.name);
    if (had === undefined) await db.query(`ALTER TABLE ${t} ADD COLUMN ${quoteId(column.name)} ${column.type}`);
    else if (had === 'double precision' && column.type === 'bigint') column.type = had;
    else if (had !== column.type && had !== 'text') {
      throw new Error(`Column ${column.name} of ${schema}.${table.name} is ${had} from an earlier run, this run's is ${column.type}: write it into another schema.`);
    } else if (had === 'text') column.type = 'text';
  }
}

async function insertRows(db: Db, schema: string, table: Table, runId: string, srid: number): Promise<number> {
  const names = ['run_id', table.key.name, ...(table.geometryType ? [GEOMETRY_COLUMN] : []), ...table.columns.map((c) => c.name)];
  const perRow = names.length;
  const batch = Math.max(1, Math.min(MAX_BATCH_ROWS, Math.floor(MAX_PARAMETERS / perRow)));
  const head = `INSERT INTO ${quoteId(schema)}.${quoteId(table.name)} (${names.map(quoteId).join(', ')}) VALUES `;
  let written = 0;
  for (let from = 0; from < table.rows.length; from += batch) {
    const to = Math.min(table.rows.length, from + batch);
    const values: unknown[] = [];
    const tuples: string[] = [];
    for (let i = from; i < to; i++) {
      const row = table.rows[i];
      const at = values.length;
      const slots = names.map((_, k) => `$${at + k + 1}`);
      values.push(runId, pgValue(row[table.key.key], table.key.type));
      if (table.geometries) {
        slots[2] = `ST_GeomFromWKB($${at + 3}::bytea, ${srid})`;
        values.push(table.geometries[i]);
      }
      for (const column of table.columns) values.push(pgValue(row[column.key], column.type));
      tuples.push(`(${slots.join(', ')})`);
    }
    const { rowCount } = await db.query(head + tuples.join(', '), values);
    written += rowCount ?? 0;
  }
  return written;
}

/** The run's start from its record (started_at), or now when the record has none. */
function startedAtOf(runRecord: string): string | null {
  try {
    const value = (JSON.parse(runRecord) as { started_at?: unknown }).started_at;
    return typeof value === 'string' && Number.isFinite(Date.parse(value)) ? value : null;
  } catch {
    throw new Error('Unexpected run record: not JSON.');
  }
}

/**
 * Writes the run's strips, lines and ranking into `schema` (created when missing) in one transaction,
 * and its record into `schema.runs`. A run id already there is replaced or refused, by `ifExists`.
 * Returns the rows written per table.
 */
export async function writeToPostgis(result: ScreenResult, options: PostgisOptions): Promise<{ tables: Record<string, number> }> {
  const { schema, runId } = options;
  checkSchemaName(schema);
  if (runId === '') throw new Error('Unexpected run id: empty.');
  const startedAt = startedAtOf(options.runRecord);
  // built before connecting: a bad geometry is found before the database is touched
  const tables = [stripsTable(result), linesTable(result), ...(result.settings.writeTransects ? [transectsTable(result)] : []), rankingTable(result)];

  // loaded when a run writes to PostGIS, not at every start of the command
  const { default: pgModule } = await import('pg');
  const client = new pgModule.Client({ connectionString: options.url });
  // an error on an idle connection must not crash the process; the query in flight reports it
  client.on('error', () => {});
  try {
    await client.connect();
  } catch (error) {
    throw new Error(`Cannot connect to ${redactedUrl(options.url)}: ${(error as Error).message}`);
  }
  try {
    await client.query('BEGIN');
    try {
      await client.query('SELECT pg_advisory_xact_lock($1)', [ADVISORY_LOCK_KEY]);
      await requirePostgis(client);
      const srid = await workSrid(client, result.crs);
      const s = quoteId(schema);
      await client.query(`CREATE SCHEMA IF NOT EXISTS ${s}`);
      await client.query(`CREATE TABLE IF NOT EXISTS ${s}.runs (run_id text PRIMARY KEY, started_at timestamptz NOT NULL, record jsonb NOT NULL)`);
      const earlier = await client.query(`SELECT 1 FROM ${s}.runs WHERE run_id = $1`, [runId]);
      if (earlier.rowCount) {
        if (options.ifExists === 'refuse') {
          throw new Error(`Run ${JSON.stringify(runId)} is already in schema ${schema}: choose another run id, or replace it (if-exists replace).`);
        }
        // its strips, lines and ranking go with it (ON DELETE CASCADE)
        await client.query(`DELETE FROM ${s}.runs WHERE run_id = $1`, [runId]);
      }
      await client.query(`INSERT INTO ${s}.runs (run_id, started_at, record) VALUES ($1, COALESCE($2::timestamptz, now()), $3::jsonb)`,
        [runId, startedAt, options.runRecord]);
      const counts: Record<string, number> = { runs: 1 };
      for (const table of tables) {
        await createTable(client, schema, table, srid);
        counts[table.name] = await insertRows(client, schema, table, runId, srid);
      }
      await client.query('COMMIT');
      return { tables: counts };
    } catch (error) {
      await client.query('ROLLBACK').catch(() => {});
      throw error;
    }
  } finally {
    await client.end().catch(() => {});
  }
}
