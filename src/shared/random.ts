// A small seeded generator of uniform draws in [0, 1): mulberry32, a public-domain 32-bit
// generator [from memory]. The same seed gives the same draws on every machine: for generated
// networks (benches, tests) and for the spread from uncertain K.
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
