import Flatbush from 'flatbush';

/**
 * A flatbush index over `count` boxes, each given by `addBox(i, add)`. flatbush refuses an empty
 * index, so with no boxes it holds one far-away box that no search meets: callers keep one code path.
 * With `shared`, the index lives in a SharedArrayBuffer (tree.data) that worker threads open with
 * Flatbush.from, so one copy serves them all.
 */
export function boxIndex(count: number, addBox: (i: number, add: (minX: number, minY: number, maxX: number, maxY: number) => void) => void, shared = false): Flatbush {
  const tree = new Flatbush(Math.max(1, count), 16, Float64Array, shared ? SharedArrayBuffer : ArrayBuffer);
  const add = (minX: number, minY: number, maxX: number, maxY: number) => void tree.add(minX, minY, maxX, maxY);
  for (let i = 0; i < count; i++) addBox(i, add);
  if (count === 0) tree.add(Infinity, Infinity, Infinity, Infinity);
  tree.finish();
  return tree;
}
