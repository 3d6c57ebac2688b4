// doab's own container for typed columns: a tile's solved transects travel from the tile's process
// to the gathering one in it, bit for bit. Layout (little-endian):
//   the 16 bytes "doab columns 1\n\0" (ASCII, then a NUL)
//   u32 length of the header, the header as UTF-8 JSON, zero bytes up to a multiple of 8
//   each column's bytes in the order the header lists them, each padded to a multiple of 8
//   the SHA-256 of every byte before it (32 bytes)
// The header is { meta: <any JSON>, columns: [{ name, type, length }] }. Nothing here knows what
// the columns mean.
import { createHash } from 'node:crypto';

export type ColumnArray = Float64Array | Float32Array | Int32Array | Uint32Array | Uint8Array;
export type Columns = Record<string, ColumnArray>;

const MAGIC = Buffer.from('doab columns 1\n\0', 'latin1');
const CHECKSUM_BYTES = 32;
/** The header may hold at most this many bytes (it names columns and settings, never data). */
export const MAX_HEADER_BYTES = 16 * 1024 * 1024;
const TYPES = {
  f64: Float64Array,
  f32: Float32Array,
  i32: Int32Array,
  u32: Uint32Array,
  u8: Uint8Array,
} as const;
type TypeName = keyof typeof TYPES;

function typeName(column: ColumnArray): TypeName {
  if (column instanceof Float64Array) return 'f64';
  if (column instanceof Float32Array) return 'f32';
  if (column instanceof Int32Array) return 'i32';
  if (column instanceof Uint32Array) return 'u32';
  if (column instanceof Uint8Array) return 'u8';
  throw new Error('Unexpected column type.');
}

const padding = (n: number) => (8 - (n % 8)) % 8;

/** Looks like a column file (its first bytes), whatever its state further on. */
export function isColumnFile(start: Uint8Array): boolean {
  return start.length >= MAGIC.length && Buffer.from(start.buffer, start.byteOffset, MAGIC.length).equals(MAGIC);
}

export const COLUMN_FILE_MAGIC_BYTES = MAGIC.length;

/** The file's bytes, in pieces (no copy of the columns), checksum last. */
export function encodeColumnFile(meta: unknown, columns: Columns): Uint8Array[] {
  const names = Object.keys(columns);
  if (names.some((name) => Buffer.byteLength(name) > 200)) throw new Error('Unexpected long column name.');
  const header = Buffer.from(JSON.stringify({ meta, columns: names.map((name) => ({ name, type: typeName(columns[name]), length: columns[name].length })) }), 'utf8');
  if (header.length > MAX_HEADER_BYTES) throw new Error(`Unexpected header of ${header.length} bytes.`);
  const length = Buffer.alloc(4);
  length.writeUInt32LE(header.length);
  const pieces: Uint8Array[] = [MAGIC, length, header, new Uint8Array(padding(MAGIC.length + 4 + header.length))];
  for (const name of names) {
    const column = columns[name];
    const bytes = new Uint8Array(column.buffer, column.byteOffset, column.byteLength);
    pieces.push(bytes, new Uint8Array(padding(bytes.length)));
  }
  const hash = createHash('sha256');
  for (const piece of pieces) hash.update(piece);
  pieces.push(hash.digest());
  return pieces;
}

/**
 * Reads a column file from its whole bytes (an ArrayBuffer of its own, so that columns are views
 * on 8-byte boundaries). Throws an Error whose message says what is wrong, for the caller to name
 * the file: not a column file, cut short, a checksum that does not match, a header that lies.
 */
export function decodeColumnFile(buffer: ArrayBuffer): { meta: unknown; columns: Columns } {
  const bytes = new Uint8Array(buffer);
  if (!isColumnFile(bytes)) throw new Error('it is not a doab tile file (its first bytes are not doab\'s)');
  if (bytes.length < MAGIC.length + 4 + CHECKSUM_BYTES) throw new Error('it is cut short');
  const body = bytes.subarray(0, bytes.length - CHECKSUM_BYTES);
  const sum = createHash('sha256').update(body).digest();
  if (!sum.equals(bytes.subarray(bytes.length - CHECKSUM_BYTES))) throw new Error('its checksum does not match its contents: it is cut short or damaged');
  const view = new DataView(buffer);
  const headerBytes = view.getUint32(MAGIC.length, true);
  if (headerBytes > MAX_HEADER_BYTES || MAGIC.length + 4 + headerBytes > body.length) throw new Error('its header is longer than the file');
  let header: { meta?: unknown; columns?: unknown };
  try {
    header = JSON.parse(Buffer.from(buffer, MAGIC.length + 4, headerBytes).toString('utf8'));
  } catch {
    throw new Error('its header is not JSON');
  }
  if (!header || typeof header !== 'object' || !Array.isArray(header.columns)) throw new Error('its header lists no columns');
  let offset = MAGIC.length + 4 + headerBytes;
  offset += padding(offset);
  const columns: Columns = {};
  for (const entry of header.columns as { name?: unknown; type?: unknown; length?: unknown }[]) {
    const { name, type, length } = entry ?? {};
    if (typeof name !== 'string' || typeof type !== 'string' || !(type in TYPES) || !Number.isSafeInteger(length) || (length as number) < 0) {
      throw new Error('its header lists a column it cannot describe');
    }
    const Type = TYPES[type as TypeName];
    const byteLength = (length as number) * Type.BYTES_PER_ELEMENT;
    // checked against the file before a view is made: a header cannot ask for more than is there
    if (offset + byteLength > body.length) throw new Error(`its column ${name} runs past the end of the file`);
    columns[name] = new Type(buffer, offset, length as number);
    offset += byteLength + padding(byteLength);
  }
  if (offset !== body.length) throw new Error('it holds bytes its header does not list');
  return { meta: header.meta, columns };
}
