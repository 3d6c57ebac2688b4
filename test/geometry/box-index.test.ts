// The 32-bit box index finds every box the 64-bit one finds (and may find a few more): the
// widening outwards covers the rounding to 32-bit floats, at coordinates up to those of a UTM
// northing and beyond. Checked against the 64-bit index itself on seeded random boxes and queries,
// with boxes that touch the query exactly at their edge (where a rounding inwards would miss).
import { describe, expect, it } from 'vitest';
import { boxIndex } from '../../src/geometry/box-index.js';
import { seededRandom } from '../../src/shared/random.js';

describe('a 32-bit box index', () => {
  for (const origin of [0, 500_000, 9_999_000, 1e8]) {
    it(`finds every box a 64-bit index finds, boxes near ${origin} m`, () => {
      const next = seededRandom(origin + 7);
      const n = 5000;
      const boxes = Array.from({ length: n }, () => {
        const x = origin + next() * 20_000, y = origin + next() * 20_000;
        return [x, y, x + next() * 50, y + next() * 50];
      });
      const wide = boxIndex(n, (i, add) => add(boxes[i][0], boxes[i][1], boxes[i][2], boxes[i][3]));
      const narrow = boxIndex(n, (i, add) => add(boxes[i][0], boxes[i][1], boxes[i][2], boxes[i][3]), false, Float32Array);
      let extra = 0;
      for (let q = 0; q < 2000; q++) {
        // half the queries end exactly on some box's edge
        const b = boxes[Math.floor(next() * n)];
        const query = q % 2 === 0 ? [b[2], b[3], b[2] + next() * 100, b[3] + next() * 100] : [origin + next() * 20_000, origin + next() * 20_000, 0, 0];
        if (q % 2 === 1) (query[2] = query[0] + next() * 300), (query[3] = query[1] + next() * 300);
        const exact = new Set(wide.search(query[0], query[1], query[2], query[3]));
        const found = new Set(narrow.search(query[0], query[1], query[2], query[3]));
        for (const i of exact) expect(found.has(i), `box ${i}, query ${q}`).toBe(true);
        extra += found.size - exact.size;
      }
      // a few more, not a flood, at projected coordinates (a UTM northing is under 1e7 m); at 1e8 m
      // a unit in the last place is 8 m and the widening lets in more, still only as candidates
      if (origin <= 1e7) expect(extra).toBeLessThan(200);
    });
  }

  it('takes about half the memory of a 64-bit one', () => {
    const n = 100_000;
    const add = (i: number, put: (a: number, b: number, c: number, d: number) => void) => put(i, i, i + 1, i + 1);
    const ratio = boxIndex(n, add, false, Float32Array).data.byteLength / boxIndex(n, add).data.byteLength;
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(0.7);
  });
});
