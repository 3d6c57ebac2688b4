// doab's column container for tile files: typed columns come back bit for bit, and a file that is
// not one, cut short, altered, or whose header asks for more than the file holds is refused with
// what is wrong, before any column is made from it.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { decodeColumnFile, encodeColumnFile, isColumnFile } from '../../src/shared/column-file.js';

function whole(pieces: Uint8Array[]): ArrayBuffer {
  const bytes = Buffer.concat(pieces);
  // an ArrayBuffer of its own, as the reader makes one
  const buffer = new ArrayBuffer(bytes.length);
  new Uint8Array(buffer).set(bytes);
  return buffer;
}

/** The bytes with a fresh checksum, as a deliberate forger would write them. */
function resealed(buffer: ArrayBuffer): ArrayBuffer {
  const bytes = new Uint8Array(buffer);
  const body = bytes.subarray(0, bytes.length - 32);
  bytes.set(createHash('sha256').update(body).digest(), bytes.length - 32);
  return buffer;
}

describe('the column container', () => {
  const columns = {
    a: Float64Array.from([1.5, NaN, -0, Infinity]),
    b: Int32Array.from([-1, 2, 3]),
    c: Uint8Array.from([255, 0, 7, 9, 1]),
    d: Uint32Array.from([4294967295]),
    e: new Float32Array(0),
  };

  it('gives back every column bit for bit, and the meta as written', () => {
    const decoded = decodeColumnFile(whole(encodeColumnFile({ tile: { index: 2, count: 3 }, note: 'x' }, columns)));
    expect(decoded.meta).toEqual({ tile: { index: 2, count: 3 }, note: 'x' });
    for (const [name, column] of Object.entries(columns)) {
      const back = decoded.columns[name];
      expect(back.constructor).toBe(column.constructor);
      expect(Buffer.from(back.buffer, back.byteOffset, back.byteLength).equals(Buffer.from(column.buffer, column.byteOffset, column.byteLength)), name).toBe(true);
    }
  });

  it('refuses what is not one, cut short, altered, or a header that asks for more than is there', () => {
    const good = whole(encodeColumnFile({}, columns));
    expect(isColumnFile(new Uint8Array(good))).toBe(true);
    expect(() => decodeColumnFile(whole([Buffer.from('{"type":"FeatureCollection"}')]))).toThrow('not a doab tile file');
    expect(() => decodeColumnFile(good.slice(0, good.byteLength - 40))).toThrow('checksum does not match');
    const altered = good.slice(0);
    new Uint8Array(altered)[60] ^= 1;
    expect(() => decodeColumnFile(altered)).toThrow('checksum does not match');
    // a header claiming a column far longer than the file, resealed so that the checksum holds
    const text = Buffer.from(good).toString('latin1').replace('"length":4', '"length":9');
    expect(() => decodeColumnFile(resealed(whole([Buffer.from(text, 'latin1')])))).toThrow('its column a runs past the end of the file');
    const cut = Buffer.from(good).toString('latin1').replace('"length":3', '"length":-');
    expect(() => decodeColumnFile(resealed(whole([Buffer.from(cut, 'latin1')])))).toThrow('its header is not JSON');
    const strange = Buffer.from(good).toString('latin1').replace('"type":"i32"', '"type":"i64"');
    expect(() => decodeColumnFile(resealed(whole([Buffer.from(strange, 'latin1')])))).toThrow('a column it cannot describe');
  });
});
