// Wall time and memory of the district solve on a synthetic district 10 km square gridded at 1, 4
// and 16 million cells (10, 5 and 2.5 m cells, so the water table is the same at every size): an
// irregular outline with holes, zones of K over two decades, recharge with some net-loss zones,
// and a few straight lines of fixed cells. Each size runs in a fresh process so that its peak RSS
// is its own. Run with `npx tsx bench/district-solver.bench.ts` (or give a side in cells, and
// `uneven` for a sloping base, which the solve meets with Picard iterations, or `beds` for lines
// whose beds resist: 10 m wetted perimeter, 20 days, solved by Newton on the beds).
import { spawnSync } from 'node:child_process';
import { CELL_BED, CELL_FIXED, CELL_FREE, emptyDistrictGrid, solveDistrict, type DistrictGrid } from '../src/hydraulics/district-solver.js';
import { seededRandom } from './network.js';

function syntheticDistrict(side: number, unevenBase: boolean, beds = false, seed = 1): DistrictGrid {
  const rnd = seededRandom(seed);
  const cellM = 10_000 / side;
  const n = side * side;
  const grid: DistrictGrid = emptyDistrictGrid(side, side, cellM);
  if (beds) grid.bed = { conductanceM2PerDay: new Float64Array(n), floorM: new Float64Array(n).fill(-Infinity) };
  // outline: a wobbly disc; holes: small discs well inside it, so the district stays in one piece
  const phase = [6.3 * rnd(), 6.3 * rnd()];
  const holes = Array.from({ length: 6 }, () => {
    const r = 0.3 * Math.sqrt(rnd()), a = 6.3 * rnd();
    return { x: 0.5 + r * Math.cos(a), y: 0.5 + r * Math.sin(a), r: 0.01 + 0.02 * rnd() };
  });
  // zones: nearest of 12 seeds, K log-uniform over 0.5-50 m/d, one in four losing water
  const seeds = Array.from({ length: 12 }, () => ({
    x: rnd(), y: rnd(),
    k: 0.5 * Math.pow(100, rnd()),
    n: rnd() < 0.25 ? -1e-4 : 2e-4 + 6e-4 * rnd(),
  }));
  // lines: straight, across the whole district, stage falling along them
  const lines = Array.from({ length: 8 }, () => {
    const a = Math.PI * rnd();
    return { nx: -Math.sin(a), ny: Math.cos(a), offset: 0.35 * (2 * rnd() - 1), stage: 22 + 6 * rnd(), slope: 4 * (rnd() - 0.5) };
  });
  const halfCell = 0.5 / side;
  for (let row = 0; row < side; row++) {
    const y = (row + 0.5) / side;
    for (let col = 0; col < side; col++) {
      const x = (col + 0.5) / side;
      const g = row * side + col;
      const dx = x - 0.5, dy = y - 0.5;
      const theta = Math.atan2(dy, dx);
      const rim = 0.42 + 0.04 * Math.sin(3 * theta + phase[0]) + 0.02 * Math.sin(7 * theta + phase[1]);
      if (dx * dx + dy * dy >= rim * rim) continue;
      let inHole = false;
      for (const h of holes) if ((x - h.x) ** 2 + (y - h.y) ** 2 < h.r * h.r) inHole = true;
      if (inHole) continue;
      let best = 0, bestD = Infinity;
      for (let s = 0; s < seeds.length; s++) {
        const d = (x - seeds[s].x) ** 2 + (y - seeds[s].y) ** 2;
        if (d < bestD) { bestD = d; best = s; }
      }
      grid.cellKind[g] = CELL_FREE;
      grid.kMPerDay[g] = seeds[best].k;
      grid.rechargeMPerDay[g] = seeds[best].n;
      grid.baseM[g] = unevenBase ? 4 * dx - 3 * dy : 0;
      for (const line of lines) {
        const d = dx * line.nx + dy * line.ny - line.offset;
        if (Math.abs(d) <= halfCell * 1.01) {
          grid.cellKind[g] = beds ? CELL_BED : CELL_FIXED;
          grid.fixedHeadM[g] = line.stage + line.slope * (dx * line.ny - dy * line.nx);
          // a 10 m wetted perimeter over the cell's length of line, 20 days [common practice for a silted earth canal: order of magnitude]
          if (grid.bed) grid.bed.conductanceM2PerDay[g] = (10 * cellM) / 20;
        }
      }
    }
  }
  return grid;
}

function runOne(side: number, unevenBase: boolean, beds: boolean): void {
  const grid = syntheticDistrict(side, unevenBase, beds);
  const cells = side * side;
  const start = performance.now();
  const s = solveDistrict(grid);
  const seconds = (performance.now() - start) / 1000;
  const peakBytes = process.resourceUsage().maxRSS * 1024;
  const mb = (b: number) => `${Math.round(b / 2 ** 20)} MB`;
  console.log(
    [
      `${(cells / 1e6).toFixed(0)}M cells${unevenBase ? ' (uneven base)' : ''}${beds ? ' (beds)' : ''}`,
      `free ${s.freeCellCount.toLocaleString('en-US')}`,
      `fixed ${s.fixedCells.length.toLocaleString('en-US')}`,
      `${seconds.toFixed(1)} s`,
      `${Math.round(cells / seconds).toLocaleString('en-US')} cells/s`,
      `CG ${s.linearIterations} in ${s.linearSolves} solve(s)`,
      `Picard ${s.picardIterations}`,
      `Newton ${s.bedIterations}`,
      s.status,
      `balance ${s.balanceRelative.toExponential(1)}`,
      `dry ${s.dryCellCount}`,
      `peak RSS ${mb(peakBytes)} = ${(peakBytes / cells).toFixed(0)} B/cell`,
      `solver ${(s.solverBytes / cells).toFixed(0)} B/cell`,
    ].join(' | '),
  );
}

const [sideArg, baseArg] = process.argv.slice(2);
if (sideArg !== undefined) runOne(Number(sideArg), baseArg === 'uneven', baseArg === 'beds');
else {
  console.log(`node ${process.version}; each size in its own process; the solve's wall time only`);
  for (const [side, base] of [[1000, ''], [2000, ''], [4000, ''], [1000, 'uneven'], [1000, 'beds']] as const) {
    const child = spawnSync(process.execPath, [...process.execArgv, process.argv[1], String(side), base], { stdio: 'inherit' });
    if (child.status !== 0) process.exit(child.status ?? 1);
  }
}
