import { describe, expect, it } from 'vitest';
import { fitView, pathData, type MapView } from '../../src/report/svg-path.js';

/** Absolute vertices of "M x y l dx dy dx dy ... [z]" path data. */
function vertices(d: string): [number, number][] {
  const m = /^M(\S+) (\S+?)(?:l(.*?))?(z?)$/.exec(d);
  if (!m) throw new Error(`unexpected path data ${d}`);
  const out: [number, number][] = [[Number(m[1]), Number(m[2])]];
  const deltas = m[3] ? m[3].trim().split(' ').map(Number) : [];
  for (let i = 0; i < deltas.length; i += 2) {
    const [x, y] = out[out.length - 1];
    out.push([Math.round((x + deltas[i]) * 10) / 10, Math.round((y + deltas[i + 1]) * 10) / 10]);
  }
  return out;
}

const ONE_PX_PER_M: MapView = { minX: 0, maxY: 100, pxPerM: 1, padPx: 0, widthPx: 200, heightPx: 100 };

describe('fitView', () => {
  it('fits the wider side and keeps the aspect ratio, with a band below', () => {
    const view = fitView([1000, 2000, 5000, 3000], 1000, 20, 1000, 40);
    expect(view.pxPerM).toBeCloseTo(960 / 4000, 12);
    expect(view.heightPx).toBe(Math.ceil(1000 * view.pxPerM + 40 + 40));
    const tall = fitView([0, 0, 100, 10_000], 1000, 20, 1000, 40);
    expect(tall.pxPerM).toBeCloseTo(920 / 10_000, 12);
  });
});

describe('pathData', () => {
  it('flips y so that north is up, in tenths of a pixel', () => {
    expect(pathData(ONE_PX_PER_M, [10.04, 90, 20.26, 80], 1, false)).toBe('M10 10l10.3 10');
  });

  it('drops vertices that add nothing at the drawn scale and keeps the ends of a line', () => {
    const coords: number[] = [];
    for (let i = 0; i <= 100; i++) coords.push(i * 1.5, 50 + (i % 2) * 0.1);
    expect(vertices(pathData(ONE_PX_PER_M, coords, 1, false))).toEqual([[0, 50], [150, 50]]);
    // a bend of 20 px stays
    const bent = [0, 50, 50, 50, 100, 30];
    expect(vertices(pathData(ONE_PX_PER_M, bent, 1, false))).toEqual([[0, 50], [50, 50], [100, 70]]);
  });

  it('reduces a finely digitised rectangle to its corners and closes it with z', () => {
    const ring: number[] = [];
    for (let x = 0; x < 100; x++) ring.push(x, 0);
    for (let y = 0; y < 50; y++) ring.push(100, y);
    for (let x = 100; x > 0; x--) ring.push(x, 50);
    for (let y = 50; y > 0; y--) ring.push(0, y);
    ring.push(0, 0);
    const d = pathData(ONE_PX_PER_M, ring, 1, true);
    expect(d.endsWith('z')).toBe(true);
    expect(vertices(d)).toEqual([[0, 100], [100, 100], [100, 50], [0, 50]]);
  });

  it('keeps three vertices of a ring smaller than a pixel, so every strip is drawn', () => {
    const ring = [10, 10, 10.3, 10, 10.3, 10.2, 10, 10.2, 10, 10];
    const d = pathData(ONE_PX_PER_M, ring, 1, true);
    expect(vertices(d)).toHaveLength(3);
  });

  it('takes relative moves between rounded points, so a long line ends where it should', () => {
    const view: MapView = { minX: 0, maxY: 0, pxPerM: 0.37, padPx: 3, widthPx: 1000, heightPx: 1000 };
    const coords: number[] = [];
    for (let i = 0; i <= 500; i++) coords.push(i * 7.3, -((i * i) % 97) * 5.1);
    const points = vertices(pathData(view, coords, 0.01, false));
    const last = points[points.length - 1];
    expect(last[0]).toBe(Math.round((500 * 7.3 * 0.37 + 3) * 10) / 10);
    expect(last[1]).toBe(Math.round((((500 * 500) % 97) * 5.1 * 0.37 + 3) * 10) / 10);
  });
});
