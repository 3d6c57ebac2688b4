import { readFileSync, statSync } from 'node:fs';
import { visit } from 'jsonc-parser';
import { DataError } from '../shared/errors.js';

/**
 * The text of a file's bytes, as UTF-8: a leading byte-order mark is dropped (RFC 8259 section 8.1
 * lets a parser ignore it; Windows tools write one), and UTF-16, which some exports write, is named
 * rather than read as noise.
 */
export function decodeText(path: string, bytes: Uint8Array): string {
  const utf16 = (bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff);
  // without a byte-order mark, UTF-16 text of ASCII characters has a zero byte in every pair
  let zeros = 0;
  const probe = Math.min(bytes.length, 512);
  for (let i = 0; i < probe; i++) if (bytes[i] === 0) zeros++;
  if (utf16 || (probe >= 16 && zeros >= probe / 4)) {
    const order = bytes[0] === 0xfe ? 'big-endian' : 'little-endian';
    throw new DataError({ file: path }, `is UTF-16 encoded (${utf16 ? `${order}, with a byte-order mark` : 'no byte-order mark'}), not UTF-8: save it as UTF-8`);
  }
  const start = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  return Buffer.from(bytes.buffer, bytes.byteOffset + start, bytes.length - start).toString('utf8');
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
