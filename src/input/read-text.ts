import { isUtf8 } from 'node:buffer';
import { readFileSync, statSync } from 'node:fs';
import { visit } from 'jsonc-parser';
import { DataError } from '../shared/errors.js';

/**
 * The text of a file's bytes, as UTF-8: a leading byte-order mark is dropped (RFC 8259 section 8.1
 * lets a parser ignore it; Windows tools write one), and UTF-16, which some exports write, is named
 * rather than read as noise.
 */
export function decodeText(path: string, bytes: Uint8Array): string {
  const start = refuseUtf16(path, bytes);
  return Buffer.from(bytes.buffer, bytes.byteOffset + start, bytes.length - start).toString('utf8');
}

/**
 * Refuses UTF-16 from a file's first bytes (512 are enough) and gives how many bytes lead the
 * text: 3 for a UTF-8 byte-order mark, else 0.
 */
export function refuseUtf16(path: string, head: Uint8Array): number {
  const utf16 = (head[0] === 0xff && head[1] === 0xfe) || (head[0] === 0xfe && head[1] === 0xff);
  // without a byte-order mark, UTF-16 text of ASCII characters has a zero byte in every pair
  let zeros = 0;
  const probe = Math.min(head.length, 512);
  for (let i = 0; i < probe; i++) if (head[i] === 0) zeros++;
  if (utf16 || (probe >= 16 && zeros >= probe / 4)) {
    const order = head[0] === 0xfe ? 'big-endian' : 'little-endian';
    throw new DataError({ file: path }, `is UTF-16 encoded (${utf16 ? `${order}, with a byte-order mark` : 'no byte-order mark'}), not UTF-8: save it as UTF-8`);
  }
  return head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf ? 3 : 0;
}

/**
 * Pieces of a file as valid UTF-8 for a strict decoder: an invalid sequence becomes U+FFFD, as
 * Buffer#toString makes it for a whole file, and a character cut between two pieces waits for the next.
 */
export class Utf8Pieces {
  private carry: Buffer | null = null;

  mend(piece: Buffer): Buffer {
    const bytes = this.carry ? Buffer.concat([this.carry, piece]) : piece;
    const cut = completeLength(bytes);
    this.carry = cut < bytes.length ? Buffer.from(bytes.subarray(cut)) : null;
    const whole = bytes.subarray(0, cut);
    return isUtf8(whole) ? whole : Buffer.from(whole.toString('utf8'), 'utf8');
  }

  /** What is left at the end of the file: a cut character, as U+FFFD. */
  finish(): Buffer | null {
    const rest = this.carry;
    this.carry = null;
    return rest ? Buffer.from(rest.toString('utf8'), 'utf8') : null;
  }
}

// bytes up to the last whole character: a lead byte within the last three whose sequence runs past the end is cut
function completeLength(bytes: Uint8Array): number {
  for (let i = bytes.length - 1; i >= Math.max(0, bytes.length - 4); i--) {
    const byte = bytes[i];
    if ((byte & 0xc0) === 0x80) continue;
    const length = byte >= 0xf0 ? 4 : byte >= 0xe0 ? 3 : byte >= 0xc0 ? 2 : 1;
    return bytes.length - i < length ? i : bytes.length;
  }
  return bytes.length;
}

// a config or a run record is a few kilobytes; anything much larger is not one
const MAX_SMALL_TEXT_BYTES = 16 * 1024 * 1024;

/** A small text file the user named (a config, a run record); a failure names the file. */
export function readTextFile(path: string): string {
  try {
    const stats = statSync(path);
    if (!stats.isFile()) throw new DataError({ file: path }, stats.isDirectory() ? 'is a folder, not a file' : 'not a regular file (a device, pipe or socket); give a file');
    if (stats.size > MAX_SMALL_TEXT_BYTES) throw new DataError({ file: path }, `is ${(stats.size / 1024 / 1024).toFixed(0)} MB: too large for a config or run record`);
    return decodeText(path, readFileSync(path));
  } catch (error) {
    if (error instanceof DataError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError({ file: path }, code === 'ENOENT' ? 'file not found' : `cannot be read (${code ?? String(error)})`);
  }
}

export interface DuplicateKey {
  key: string;
  /** Where the object that holds it twice sits: keys and list indices from the top. */
  path: (string | number)[];
}

/** How deep lists and objects nest in JSON text, read without recursion (a hostile file may nest 100,000 deep). */
export function jsonDepth(text: string): number {
  let depth = 0, deepest = 0, inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) { if (++depth > deepest) deepest = depth; }
    else if (c === 0x5d || c === 0x7d) depth--;
  }
  return deepest;
}

// deeper than this the scan below (recursive in its parser) is not run: the feature checks refuse such values anyway
const DUPLICATE_SCAN_DEPTH = 256;

/**
 * Keys that an object of the JSON text holds more than once (JSON.parse keeps the last, silently);
 * the first `limit`. Text nested deeper than a GIS writes is not scanned (its nesting is refused elsewhere).
 */
export function duplicateKeys(text: string, limit = 10): DuplicateKey[] {
  const found: DuplicateKey[] = [];
  if (jsonDepth(text) > DUPLICATE_SCAN_DEPTH) return found;
  const stack: Set<string>[] = [];
  visit(text, {
    onObjectBegin: () => void stack.push(new Set()),
    onObjectEnd: () => void stack.pop(),
    onObjectProperty: (key, _offset, _length, _line, _character, pathSupplier) => {
      const keys = stack[stack.length - 1];
      if (keys.has(key) && found.length < limit) found.push({ key, path: pathSupplier() });
      keys.add(key);
    },
  });
  return found;
}
