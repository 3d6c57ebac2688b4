import Flatbush from 'flatbush';

/**
 * A flatbush index over `count` boxes, each given by `addBox(i, add)`. flatbush refuses an empty
 * index, so with no boxes it holds one far-away box that no search meets: callers keep one code path.
 * With `shared`, the index lives in a SharedArrayBuffer (tree.data) that worker threads open with
 * Flatbush.from, so one copy serves them all. With Float32Array coordinates it takes half the
 * memory; its boxes are widened (below), so it suits only a search followed by an exact test.
 */
export function boxIndex(
  count: number,
  addBox: (i: number, add: (minX: number, minY: number, maxX: number, maxY: number) => void) => void,
  shared = false,
  coordinates: Float64ArrayConstructor | Float32ArrayConstructor = Float64Array,
): Flatbush {
  const tree = new Flatbush(Math.max(1, count), 16, coordinates, shared ? SharedArrayBuffer : ArrayBuffer);
  // 32-bit boxes are widened outwards by more than rounding moves them (half a unit in the last
  // place, |v| 2^-24 [from memory: IEEE 754 binary32 has a 24-bit significand]; here 4 times
  // that), so a search finds every box a 64-bit index would, and a few more, for the caller's
  // exact test to set aside
  const pad = (v: number) => (Math.abs(v) + 1) * 2 ** -22;
  const add =
    coordinates === Float32Array
      ? (minX: number, minY: number, maxX: number, maxY: number) => void tree.add(minX - pad(minX), minY - pad(minY), maxX + pad(maxX), maxY + pad(maxY))
      : (minX: number, minY: number, maxX: number, maxY: number) => void tree.add(minX, minY, maxX, maxY);
  for (let i = 0; i < count; i++) addBox(i, add);
  if (count === 0) tree.add(Infinity, Infinity, Infinity, Infinity);
  tree.finish();
  return tree;
}
