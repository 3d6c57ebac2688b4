import { describe, expect, it } from 'vitest';
import { burnLines, type BurnedLines } from '../../src/geometry/grid-burn.js';
import { fillZones, polygonCells } from '../../src/geometry/grid-fill.js';
import { cellAt, gridOver, gridSize, MAX_GRID_CELLS, type Grid } from '../../src/geometry/grid.js';
import type { LineGeometry } from '../../src/geometry/lines.js';
import { zonePolygons } from '../../src/geometry/zones.js';
import { seededRandom as seeded } from '../../bench/network.js';

const rect = (x0: number, y0: number, x1: number, y1: number): Float64Array => Float64Array.from([x0, y0, x1, y0, x1, y1, x0, y1, x0, y0]);

function circle(cx: number, cy: number, r: number, n: number): Float64Array {
  const ring = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    ring[2 * i] = cx + r * Math.cos((2 * Math.PI * i) / n);
    ring[2 * i + 1] = cy + r * Math.sin((2 * Math.PI * i) / n);
  }
  return ring;
}

const countOf = (a: Int32Array, value: number): number => a.reduce((n, v) => n + (v === value ? 1 : 0), 0);

/** Even-odd point in polygon over all rings, written out again here as the independent check. */
function inside(rings: Float64Array[], x: number, y: number): boolean {
  let odd = false;
  for (const r of rings) {
    const n = r.length / 2;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const xi = r[2 * i], yi = r[2 * i + 1], xj = r[2 * j], yj = r[2 * j + 1];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) odd = !odd;
    }
  }
  return odd;
}

/** A star-shaped ring around (cx, cy) with random radii: concave, never self-intersecting. */
function star(rnd: () => number, cx: number, cy: number, r: number, n: number): Float64Array {
  const ring = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * (i + 0.8 * rnd())) / n, rr = r * (0.3 + 0.7 * rnd());
    ring[2 * i] = cx + rr * Math.cos(a);
    ring[2 * i + 1] = cy + rr * Math.sin(a);
  }
  return ring;
}

describe('gridOver and gridSize', () => {
  it('snaps the origin to multiples of the cell size and covers the extent', () => {
    expect(gridOver([0, 0, 1000, 500], 100)).toEqual({ originX: 0, originY: 0, columns: 10, rows: 5, cells: 50, cellM: 100 });
    expect(gridOver([12, 7, 988, 493], 100)).toEqual({ originX: 0, originY: 0, columns: 10, rows: 5, cells: 50, cellM: 100 });
    expect(gridOver([-250, -50, 250, 50], 100)).toEqual({ originX: -300, originY: -100, columns: 6, rows: 2, cells: 12, cellM: 100 });
    expect(gridOver([0, 0, 1000, 500], 100, 2)).toEqual({ originX: -200, originY: -200, columns: 14, rows: 9, cells: 126, cellM: 100 });
    // a point still gets a cell
    expect(gridOver([5, 5, 5, 5], 10)).toEqual({ originX: 0, originY: 0, columns: 1, rows: 1, cells: 1, cellM: 10 });
    // UTM-sized coordinates
    const g = gridOver([500123.4, 3300456.7, 512000, 3310000], 25);
    expect([g.originX, g.originY, g.columns, g.rows]).toEqual([500100, 3300450, 476, 382]);
  });

  it('lays the grid over the outer rings of the zones', () => {
    const zones = zonePolygons([{ zone: 0, rings: [rect(120, 80, 380, 310)] }, { zone: 1, rings: [circle(600, 200, 50, 16)] }]);
    expect(gridOver(zones, 50, 1)).toEqual({ originX: 50, originY: 0, columns: 13, rows: 8, cells: 104, cellM: 50 });
    expect(() => gridOver(zonePolygons([]), 50)).toThrow('0 zone polygons');
  });

  it('throws early on a bad cell size, margin or extent, with the value', () => {
    for (const bad of [0, -5, NaN, Infinity]) expect(() => gridOver([0, 0, 10, 10], bad)).toThrow(`Unexpected cellM value: ${bad}.`);
    expect(() => gridSize([0, 0, 10, 10], -1)).toThrow('Unexpected cellM value: -1.');
    expect(() => gridOver([0, 0, 10, 10], 1, 1.5)).toThrow('Unexpected marginCells value: 1.5.');
    expect(() => gridOver([0, 0, 10, 10], 1, -1)).toThrow('Unexpected marginCells value: -1.');
    expect(() => gridOver([10, 0, 0, 10], 1)).toThrow('Unexpected extent: [10, 0, 0, 10].');
    expect(() => gridOver([0, 0, NaN, 10], 1)).toThrow('Unexpected extent: [0, 0, NaN, 10].');
  });

  it('counts the cells of a huge grid as a number, without allocating it', () => {
    const before = process.memoryUsage().arrayBuffers;
    // a 10,000 km square at 1 mm
    expect(gridSize([0, 0, 1e7, 1e7], 1e-3)).toEqual({ columns: 1e10, rows: 1e10, cells: 1e20 });
    expect(gridSize([-1e308, -1e308, 1e308, 1e308], 1e-300).cells).toBe(Infinity);
    expect(gridSize([0, 0, 46341 * 10, 46341 * 10], 10).cells).toBe(46341 * 46341);
    expect(46341 * 46341).toBeGreaterThan(MAX_GRID_CELLS);
    expect(() => gridOver([0, 0, 1e7, 1e7], 1e-3)).toThrow(`${1e20} cells`);
    expect(() => gridOver([0, 0, 46341 * 10, 46341 * 10], 10)).toThrow(`${46341 * 46341} cells`);
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(2 ** 20);
  });

  it('finds the cell of a point, edges going north and east', () => {
    const g = gridOver([0, 0, 30, 20], 10);
    expect([cellAt(g, 0, 0), cellAt(g, 9.99, 9.99), cellAt(g, 10, 0), cellAt(g, 0, 10), cellAt(g, 29.9, 19.9)]).toEqual([0, 0, 1, 3, 5]);
    expect([cellAt(g, -0.01, 5), cellAt(g, 30, 5), cellAt(g, 5, 20)]).toEqual([-1, -1, -1]);
  });
});

describe('fillZones', () => {
  it('fills a square zone with exactly its area in cells', () => {
    const zones = zonePolygons([{ zone: 0, rings: [rect(100, 100, 600, 400)] }]);
    const grid = gridOver(zones, 50, 1);
    const { zone, overlapCells } = fillZones(grid, zones);
    expect(countOf(zone, 0)).toBe((500 * 300) / 50 ** 2);
    expect(countOf(zone, -1)).toBe(grid.cells - 60);
    expect(overlapCells).toBe(0);
    // the margin stays outside
    expect([zone[0], zone[grid.columns + 1]]).toEqual([-1, 0]);
  });

  it('leaves a hole empty, and fills a zone inside the hole', () => {
    const zones = zonePolygons([
      { zone: 0, rings: [rect(0, 0, 1000, 1000), rect(200, 200, 600, 500)] },
      { zone: 1, rings: [rect(200, 200, 600, 500)] },
    ]);
    const { zone, overlapCells } = fillZones(gridOver(zones, 100), zones);
    expect(countOf(zone, 0)).toBe((1000 * 1000 - 400 * 300) / 100 ** 2);
    expect(countOf(zone, 1)).toBe((400 * 300) / 100 ** 2);
    expect(overlapCells).toBe(0);
  });

  it('gives overlapping cells to the lowest zone index, whatever the polygon order, and counts them', () => {
    const a = { zone: 2, rings: [rect(0, 0, 500, 500)] }, b = { zone: 1, rings: [rect(300, 0, 800, 500)] };
    const zones = zonePolygons([a, b]);
    const grid = gridOver(zones, 50);
    const one = fillZones(grid, zones);
    expect([countOf(one.zone, 1), countOf(one.zone, 2), one.overlapCells]).toEqual([100, 60, 40]);
    expect(fillZones(grid, zonePolygons([b, a]))).toEqual(one);
  });

  it('treats the polygons of a MultiPolygon zone as their union', () => {
    const zones = zonePolygons([
      { zone: 0, rings: [rect(0, 0, 200, 200)] },
      { zone: 0, rings: [rect(400, 0, 600, 200)] },
      { zone: 0, rings: [rect(100, 0, 500, 100)] },
    ]);
    const { zone, overlapCells } = fillZones(gridOver(zones, 50), zones);
    expect(countOf(zone, 0)).toBe((2 * 200 * 200 + 200 * 100) / 50 ** 2);
    expect(overlapCells).toBe(0);
  });

  it('fills a circle with about pi r^2 / cell^2 cells', () => {
    const zones = zonePolygons([{ zone: 0, rings: [circle(500_000, 3_300_000, 1000, 256)] }]);
    const { zone } = fillZones(gridOver(zones, 10, 2), zones);
    // the circle area formula: within 1 % for a 256-gon 100 cells across (common practice)
    expect(countOf(zone, 0) / ((Math.PI * 1000 ** 2) / 10 ** 2)).toBeCloseTo(1, 2);
  });

  it('clips a zone larger than the grid', () => {
    const zones = zonePolygons([{ zone: 3, rings: [rect(-1000, -1000, 250, 1000)] }]);
    const { zone } = fillZones(gridOver([0, 0, 500, 500], 100), zones);
    // centres at x = 50 and 150 are inside; 250 is on the east edge, outside by the crossing rule
    expect(countOf(zone, 3)).toBe(2 * 5);
  });

  it('agrees with a point-in-polygon test at every cell centre (random concave zones with holes)', () => {
    const rnd = seeded(7);
    for (let trial = 0; trial < 12; trial++) {
      const list = Array.from({ length: 4 }, (_, k) => {
        const cx = 200 + 600 * rnd(), cy = 200 + 600 * rnd();
        const rings = [star(rnd, cx, cy, 300, 24)];
        if (k % 2 === 0) rings.push(circle(cx, cy, 60, 9));
        return { zone: Math.floor(4 * rnd()), rings };
      });
      const zones = zonePolygons(list);
      const grid = gridOver([0, 0, 1000, 1000], 1000 / 64 + rnd());
      const { zone } = fillZones(grid, zones);
      let mismatches = 0;
      for (let r = 0; r < grid.rows; r++) {
        for (let c = 0; c < grid.columns; c++) {
          const x = grid.originX + (c + 0.5) * grid.cellM, y = grid.originY + (r + 0.5) * grid.cellM;
          let expected = -1;
          list.forEach((p) => {
            if (inside(p.rings, x, y) && (expected < 0 || p.zone < expected)) expected = p.zone;
          });
          if (zone[r * grid.columns + c] !== expected) mismatches++;
        }
      }
      expect(mismatches).toBe(0);
      expect(countOf(zone, -1)).toBeLessThan(grid.cells);
    }
  });
});

describe('polygonCells', () => {
  it('lists the cells of each polygon, ascending, for open and closed rings', () => {
    const grid = gridOver([0, 0, 1000, 1000], 100);
    const open = Float64Array.from([200, 100, 500, 100, 500, 400, 200, 400]);
    const { start, cell } = polygonCells(grid, [[rect(200, 100, 500, 400)], [open], [rect(0, 0, 1000, 1000), rect(100, 100, 900, 900)], [rect(2000, 0, 3000, 100)]]);
    expect(Array.from(start)).toEqual([0, 9, 18, 18 + 36, 18 + 36]);
    expect(Array.from(cell.subarray(0, 9))).toEqual([12, 13, 14, 22, 23, 24, 32, 33, 34]);
    expect(Array.from(cell.subarray(9, 18))).toEqual([12, 13, 14, 22, 23, 24, 32, 33, 34]);
    // the frame: 100 cells less the 64 of the hole
    const frame = cell.subarray(18, 54);
    expect(frame.every((c, i) => i === 0 || c > frame[i - 1])).toBe(true);
    expect(frame.every((c) => c < 10 || c >= 90 || c % 10 === 0 || c % 10 === 9)).toBe(true);
  });

  it('covers a rotated strip with its area in cells, and agrees with point-in-polygon', () => {
    const grid = gridOver([0, 0, 2000, 2000], 10);
    // a 1400 m x 300 m rectangle turned by 30 degrees about (1000, 1000)
    const ring = new Float64Array(8);
    [[-700, -150], [700, -150], [700, 150], [-700, 150]].forEach(([dx, dy], i) => {
      const a = Math.PI / 6;
      ring[2 * i] = 1000 + dx * Math.cos(a) - dy * Math.sin(a);
      ring[2 * i + 1] = 1000 + dx * Math.sin(a) + dy * Math.cos(a);
    });
    const { start, cell } = polygonCells(grid, [[ring]]);
    expect(start[1] / ((1400 * 300) / 100)).toBeCloseTo(1, 2);
    let expected = 0;
    for (let k = 0; k < grid.cells; k++) {
      const x = grid.originX + ((k % grid.columns) + 0.5) * 10, y = grid.originY + (Math.floor(k / grid.columns) + 0.5) * 10;
      if (inside([ring], x, y)) expected++;
    }
    expect(start[1]).toBe(expected);
    for (const k of cell) expect(inside([ring], grid.originX + ((k % grid.columns) + 0.5) * 10, grid.originY + (Math.floor(k / grid.columns) + 0.5) * 10)).toBe(true);
  });

  it('throws on a non-finite coordinate, with the value', () => {
    expect(() => polygonCells(gridOver([0, 0, 10, 10], 1), [[Float64Array.from([0, 0, 5, NaN, 5, 5])]])).toThrow('Polygon 0 has a non-finite coordinate: NaN.');
  });
});

/** Length of segment (x0,y0)-(x1,y1) inside the closed square of cell k (Liang-Barsky, again). */
function clippedLength(grid: Grid, k: number, x0: number, y0: number, x1: number, y1: number): { lengthM: number; fromM: number; toM: number } {
  const cx = grid.originX + (k % grid.columns) * grid.cellM, cy = grid.originY + Math.floor(k / grid.columns) * grid.cellM;
  const dx = x1 - x0, dy = y1 - y0;
  let a = 0, b = 1;
  for (const [p, q] of [[-dx, x0 - cx], [dx, cx + grid.cellM - x0], [-dy, y0 - cy], [dy, cy + grid.cellM - y0]]) {
    if (p === 0) {
      if (q < 0) return { lengthM: 0, fromM: 0, toM: 0 };
    } else if (p < 0) a = Math.max(a, q / p);
    else b = Math.min(b, q / p);
  }
  const len = Math.hypot(dx, dy);
  return b > a ? { lengthM: (b - a) * len, fromM: a * len, toM: b * len } : { lengthM: 0, fromM: 0, toM: 0 };
}

/**
 * Checks one burned line (the only one) against brute force: points every cellM / 1000 along it
 * (the middles of those steps, so none falls exactly on a corner), and each cell clipped exactly.
 */
function checkBurn(grid: Grid, line: LineGeometry, burned: BurnedLines): void {
  const stepM = grid.cellM / 1000;
  const sampled = new Set<number>();
  let totalM = 0;
  for (const p of line.parts) {
    for (let i = 2; i < p.length; i += 2) {
      const len = Math.hypot(p[i] - p[i - 2], p[i + 1] - p[i - 1]);
      totalM += len;
      const n = Math.ceil(len / stepM);
      for (let s = 0; s < n; s++) {
        const f = (s + 0.5) / n;
        const x = p[i - 2] + f * (p[i] - p[i - 2]), y = p[i - 1] + f * (p[i + 1] - p[i - 1]);
        // a grid corner is a point the line touches, not a stretch it crosses
        if (Number.isInteger((x - grid.originX) / grid.cellM) && Number.isInteger((y - grid.originY) / grid.cellM)) continue;
        const k = cellAt(grid, x, y);
        if (k >= 0) sampled.add(k);
      }
    }
  }
  const cells = Array.from(burned.cells);
  for (const k of sampled) expect(burned.line[k], `sampled cell ${k} not burned`).toBe(0);
  expect(cells.length).toBe(countOf(burned.line, 0));
  for (const k of cells) {
    let crossedM = 0;
    for (const p of line.parts) for (let i = 2; i < p.length; i += 2) crossedM += clippedLength(grid, k, p[i - 2], p[i - 1], p[i], p[i + 1]).lengthM;
    expect(crossedM, `burned cell ${k} not crossed`).toBeGreaterThan(0);
    expect(burned.lengthM[k]).toBeLessThanOrEqual(crossedM * (1 + 1e-9));
    // only a cell crossed for less than one sampling step can escape the samples
    if (!sampled.has(k)) expect(crossedM).toBeLessThan(2 * stepM);
  }
  const sumM = cells.reduce((s, k) => s + burned.lengthM[k], 0);
  expect(Math.abs(sumM + burned.outsideM - totalM) / totalM).toBeLessThan(1e-9);
}

/** For a one-segment line: chainage of the point nearest the centre, within the cell's passage. */
function expectedChainage(grid: Grid, k: number, x0: number, y0: number, x1: number, y1: number): number {
  const { fromM, toM } = clippedLength(grid, k, x0, y0, x1, y1);
  const len = Math.hypot(x1 - x0, y1 - y0);
  const cx = grid.originX + ((k % grid.columns) + 0.5) * grid.cellM, cy = grid.originY + (Math.floor(k / grid.columns) + 0.5) * grid.cellM;
  const s = ((cx - x0) * (x1 - x0) + (cy - y0) * (y1 - y0)) / len;
  return Math.min(toM, Math.max(fromM, s));
}

const oneSegment = (x0: number, y0: number, x1: number, y1: number): LineGeometry => ({ id: 'a', parts: [Float64Array.from([x0, y0, x1, y1])] });

describe('burnLines', () => {
  it('burns a horizontal line along its row, with the length in each cell', () => {
    const grid = gridOver([0, 0, 100, 50], 10);
    const line = oneSegment(3.3, 25, 97.1, 25);
    const burned = burnLines(grid, [line]);
    expect(Array.from(burned.cells)).toEqual([20, 21, 22, 23, 24, 25, 26, 27, 28, 29]);
    expect(Array.from(burned.cells, (k) => Math.round(burned.lengthM[k] * 1e9) / 1e9)).toEqual([6.7, 10, 10, 10, 10, 10, 10, 10, 10, 7.1]);
    // the centres lie on the line, except in the end cells, where the line stops short of them
    expect(Array.from(burned.cells, (k) => Math.round(burned.chainageM[k] * 1e9) / 1e9)).toEqual([1.7, 11.7, 21.7, 31.7, 41.7, 51.7, 61.7, 71.7, 81.7, 91.7]);
    expect([burned.sharedCells, burned.outsideM, burned.line[0], burned.chainageM[0], burned.lengthM[0]]).toEqual([0, 0, -1, NaN, 0]);
    checkBurn(grid, line, burned);
  });

  it('burns a line that runs exactly along a row edge into the row to its north, as cellAt does', () => {
    const grid = gridOver([0, 0, 100, 50], 10);
    const line = oneSegment(0, 20, 100, 20);
    const burned = burnLines(grid, [line]);
    expect(Array.from(burned.cells)).toEqual([20, 21, 22, 23, 24, 25, 26, 27, 28, 29]);
    checkBurn(grid, line, burned);
  });

  it('burns a vertical line, digitised southwards', () => {
    const grid = gridOver([0, 0, 50, 100], 10);
    const line = oneSegment(17, 95, 17, 4);
    const burned = burnLines(grid, [line]);
    expect(Array.from(burned.cells)).toEqual([1, 6, 11, 16, 21, 26, 31, 36, 41, 46]);
    // chainage grows southwards: cell 41 (centre y 85) is 10 m from the start
    expect(burned.chainageM[41]).toBeCloseTo(10, 9);
    expect(burned.chainageM[1]).toBeCloseTo(90, 9);
    checkBurn(grid, line, burned);
  });

  it('burns a 45-degree diagonal through cell corners cell by cell, both ways', () => {
    const grid = gridOver([0, 0, 100, 100], 10);
    const up = oneSegment(0, 0, 100, 100);
    const burnedUp = burnLines(grid, [up]);
    expect(Array.from(burnedUp.cells)).toEqual([0, 11, 22, 33, 44, 55, 66, 77, 88, 99]);
    for (let i = 0; i < 10; i++) {
      expect(burnedUp.lengthM[11 * i]).toBeCloseTo(10 * Math.SQRT2, 9);
      expect(burnedUp.chainageM[11 * i]).toBeCloseTo((i + 0.5) * 10 * Math.SQRT2, 9);
    }
    checkBurn(grid, up, burnedUp);
    // falling to the east: the corners touched on the way belong to cells the line never enters
    const down = oneSegment(0, 100, 100, 0);
    const burnedDown = burnLines(grid, [down]);
    expect(Array.from(burnedDown.cells)).toEqual([9, 18, 27, 36, 45, 54, 63, 72, 81, 90]);
    checkBurn(grid, down, burnedDown);
  });

  it('burns lines at arbitrary angles, far from the CRS origin, exactly as brute force finds them', () => {
    const x0 = 500_000, y0 = 3_300_000;
    const grid = gridOver([x0, y0, x0 + 200, y0 + 120], 10);
    const rnd = seeded(3);
    const cases = [[3.7, 2.2, 181.3, 97.9], [199.9, 0.1, 0.2, 119.8], [55, 60, 57.5, 61], [12.5, 118, 190, 3]];
    for (let i = 0; i < 16; i++) cases.push([200 * rnd(), 120 * rnd(), 200 * rnd(), 120 * rnd()]);
    for (const [a, b, c, d] of cases) {
      const line = oneSegment(x0 + a, y0 + b, x0 + c, y0 + d);
      const burned = burnLines(grid, [line]);
      checkBurn(grid, line, burned);
      const len = Math.hypot(c - a, d - b);
      for (const k of burned.cells) {
        const exact = clippedLength(grid, k, a + x0, b + y0, c + x0, d + y0);
        expect(Math.abs(burned.lengthM[k] - exact.lengthM)).toBeLessThan(1e-7);
        expect(Math.abs(burned.chainageM[k] - expectedChainage(grid, k, a + x0, b + y0, c + x0, d + y0))).toBeLessThan(1e-7);
      }
      // chainage grows along a straight line, in the order its samples meet the cells
      const fromM = (k: number): number => clippedLength(grid, k, a + x0, b + y0, c + x0, d + y0).fromM;
      const order = Array.from(burned.cells).sort((p, q) => burned.chainageM[p] - burned.chainageM[q] || fromM(p) - fromM(q));
      let prev = -1;
      const n = Math.ceil(len * 100);
      const seen: number[] = [];
      for (let s = 0; s < n; s++) {
        const f = (s + 0.5) / n;
        const k = cellAt(grid, x0 + a + f * (c - a), y0 + b + f * (d - b));
        if (k !== prev && burned.lengthM[k] > 0.02) seen.push(k);
        prev = k;
      }
      expect(seen).toEqual(order.filter((k) => burned.lengthM[k] > 0.02));
    }
  });

  it('adds up a line that passes a cell twice, and keeps the nearer passage', () => {
    const grid = gridOver([0, 0, 100, 30], 10);
    const line: LineGeometry = { id: 'loop', parts: [Float64Array.from([5, 15, 95, 15, 95, 17, 5, 17])] };
    const burned = burnLines(grid, [line]);
    expect(Array.from(burned.cells)).toEqual([10, 11, 12, 13, 14, 15, 16, 17, 18, 19]);
    expect(burned.lengthM[13]).toBeCloseTo(20, 9);
    // the way out passes through the centre (35, 15): chainage 30, not the way back at 152
    expect(burned.chainageM[13]).toBeCloseTo(30, 9);
    // the turn (2 m north) happens inside the last cell
    expect(burned.lengthM[19]).toBeCloseTo(5 + 2 + 5, 9);
    expect(burned.sharedCells).toBe(0);
    checkBurn(grid, line, burned);
    // passing 2 m south of the centre, then 2 m north: the tie goes to the lower chainage
    const even = burnLines(grid, [{ id: 'even', parts: [Float64Array.from([5, 13, 95, 13, 95, 17, 5, 17])] }]);
    expect(even.chainageM[13]).toBeCloseTo(30, 9);
    expect(even.lengthM[13]).toBeCloseTo(20, 9);
  });

  it('runs chainage on across the parts of a line', () => {
    const grid = gridOver([0, 0, 100, 40], 10);
    const line: LineGeometry = { id: 'two', parts: [Float64Array.from([5, 5, 95, 5]), Float64Array.from([5, 35, 95, 35])] };
    const burned = burnLines(grid, [line]);
    expect(burned.cells.length).toBe(20);
    // part 2 starts at chainage 90; centre (45, 35) is 40 m along it
    expect(burned.chainageM[34]).toBeCloseTo(130, 9);
    expect(burned.chainageM[4]).toBeCloseTo(40, 9);
    checkBurn(grid, line, burned);
  });

  it('gives a cell two lines cross to the one passing nearer its centre, ties to the lower index', () => {
    const grid = gridOver([0, 0, 100, 100], 10);
    const horizontal = (y: number): LineGeometry => ({ id: 'h', parts: [Float64Array.from([0, y, 100, y])] });
    const vertical = (x: number): LineGeometry => ({ id: 'v', parts: [Float64Array.from([x, 0, x, 100])] });
    // cell 55 has its centre at (55, 55)
    const nearerVertical = burnLines(grid, [horizontal(52), vertical(56)]);
    expect([nearerVertical.line[55], nearerVertical.sharedCells]).toEqual([1, 1]);
    expect(nearerVertical.chainageM[55]).toBeCloseTo(55, 9);
    expect(nearerVertical.lengthM[55]).toBeCloseTo(10, 9);
    expect([nearerVertical.line[54], nearerVertical.line[45]]).toEqual([0, 1]);
    expect(burnLines(grid, [horizontal(56), vertical(52)]).line[55]).toBe(0);
    expect(burnLines(grid, [horizontal(53), vertical(57)]).line[55]).toBe(0);
    expect(burnLines(grid, [vertical(57), horizontal(53)]).line[55]).toBe(0);
    expect(burnLines(grid, [vertical(57), horizontal(53)]).cells.length).toBe(19);
  });

  it('reports the length of line outside the grid', () => {
    const grid = gridOver([0, 0, 100, 100], 10);
    const line = oneSegment(-40, 50, 130, 50);
    const burned = burnLines(grid, [line]);
    expect(burned.outsideM).toBeCloseTo(70, 9);
    expect(burned.cells.length).toBe(10);
    checkBurn(grid, line, burned);
    expect(burnLines(grid, [oneSegment(-40, -50, 130, -50)]).outsideM).toBeCloseTo(170, 9);
  });
});
