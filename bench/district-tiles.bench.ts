// The district solve in N tiles against one whole solve, on the synthetic district of network.ts
// (rows of wavy canals and drains, one zone): the whole solve's time and peak memory, then for each
// N the time of every tile, the largest tile's peak memory, the stitch's time and memory, and the
// largest difference from the whole solve in a line's loss and in the water table. Every solve runs
// in its own process, so that its peak RSS is its own; each process first screens the strips of
// the district (not timed), so the RSS before the solve is printed too. Pieces pass from tile to
// stitch through files, bit for bit.
// Run: npx tsx bench/district-tiles.bench.ts [lines (default 200)] [tile counts (default 2,4,8)] [margin m (default DISTRICT_TILE_MARGIN_M)]
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { checkLines, checkZones } from '../src/screening/district-inputs.js';
import { districtSolve, type DistrictInputs, type DistrictResult } from '../src/screening/district.js';
import { DISTRICT_TILE_MARGIN_M, districtTilePiece, type DistrictTilePiece } from '../src/screening/district-tiles.js';
import { districtInputsOfResult, screenDistrict } from '../src/screening/screen.js';
import { DEFAULT_RULES } from '../src/shared/input-rules.js';
import { DEFAULT_SETTINGS, type ScreenSettings } from '../src/shared/settings.js';
import { syntheticDistrict } from './network.js';

const mb = (bytes: number) => `${Math.round(bytes / 2 ** 20)} MB`;
const rssBytes = () => process.memoryUsage().rss;
const peakBytes = () => process.resourceUsage().maxRSS * 1024;

function prepare(lines: number): { inputs: DistrictInputs; settings: ScreenSettings } {
  const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(lines);
  const checkedLines = checkLines('canals', lineFeatures, DEFAULT_RULES).records;
  const checkedZones = checkZones('aquifer', zoneFeatures, DEFAULT_RULES).records;
  const settings: ScreenSettings = { ...DEFAULT_SETTINGS, crs, maxGapM: 800, stripsOnly: true, workers: 1 };
  const result = screenDistrict(checkedLines, checkedZones, settings);
  const inputs: DistrictInputs = districtInputsOfResult(result);
  return { inputs, settings: { ...settings, stripsOnly: false } };
}

// a piece as a file: its header as JSON, each array as its bytes in base64 (bit for bit)
function writePiece(path: string, piece: DistrictTilePiece): void {
  const arrays = Object.fromEntries(Object.entries(piece.arrays).map(([name, a]) => [name, { type: a.constructor.name, bytes: Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('base64') }]));
  writeFileSync(path, JSON.stringify({ header: piece.header, arrays }));
}

function readPiece(path: string): DistrictTilePiece {
  const { header, arrays } = JSON.parse(readFileSync(path, 'utf8'));
  const types = { Float64Array, Float32Array, Int32Array, Uint32Array, Uint8Array } as const;
  return {
    header,
    arrays: Object.fromEntries(
      Object.entries(arrays as Record<string, { type: keyof typeof types; bytes: string }>).map(([name, { type, bytes }]) => {
        const buffer = Buffer.from(bytes, 'base64');
        const copy = new Uint8Array(buffer.byteLength);
        copy.set(buffer);
        return [name, new types[type](copy.buffer)];
      }),
    ),
  };
}

function writeFigures(path: string, result: DistrictResult): void {
  writeFileSync(path, JSON.stringify({ loss: [...result.lineLossM3PerDay], coarse: [...result.lineLossCoarseM3PerDay], head: Buffer.from(result.waterTableM.buffer).toString('base64') }));
}

function child(args: string[]): void {
  const [role, dir, linesArg, countArg, indexArg, marginArg] = args;
  const { inputs, settings } = prepare(Number(linesArg));
  const before = rssBytes();
  const start = performance.now();
  if (role === 'whole') {
    const result = districtSolve(inputs, settings);
    const seconds = (performance.now() - start) / 1000;
    writeFigures(join(dir, 'whole.json'), result);
    console.log(
      `whole solve     ${result.grid.columns} x ${result.grid.rows} = ${(result.grid.cells / 1e6).toFixed(2)} M cells of ${result.cellM} m, ${inputs.lines.length} lines, ` +
        `${seconds.toFixed(1)} s (and at ${result.coarseCellM} m), peak RSS ${mb(peakBytes())} (${mb(before)} before the solve)`,
    );
  } else if (role === 'tile') {
    const tile = { index: Number(indexArg), count: Number(countArg) };
    const piece = districtTilePiece(inputs, settings, tile, { marginM: Number(marginArg) });
    const seconds = (performance.now() - start) / 1000;
    writePiece(join(dir, `tile-${tile.index}-of-${tile.count}.json`), piece);
    console.log(`${seconds.toFixed(2)} ${peakBytes()} ${before} ${piece.header.windowCells}`);
  } else {
    const count = Number(countArg);
    const pieces = Array.from({ length: count }, (_, i) => readPiece(join(dir, `tile-${i + 1}-of-${count}.json`)));
    const loaded = rssBytes();
    const stitchStart = performance.now();
    const result = districtSolve(inputs, settings, { pieces });
    const seconds = (performance.now() - stitchStart) / 1000;
    const whole = JSON.parse(readFileSync(join(dir, 'whole.json'), 'utf8'));
    const wholeHead = new Float64Array(new Uint8Array(Buffer.from(whole.head, 'base64')).buffer);
    let lossDiff = 0, lossRel = 0, worstLine = '', coarseDiff = 0, headDiff = 0;
    result.lineLossM3PerDay.forEach((loss, l) => {
      const d = Math.abs(loss - whole.loss[l]);
      if (d / Math.abs(whole.loss[l]) > lossRel) { lossRel = d / Math.abs(whole.loss[l]); worstLine = `${inputs.lines[l].id}, ${d.toFixed(1)} of ${whole.loss[l].toFixed(0)} m3/d`; }
      if (d > lossDiff) lossDiff = d;
      coarseDiff = Math.max(coarseDiff, Math.abs(result.lineLossCoarseM3PerDay[l] - whole.coarse[l]));
    });
    for (let g = 0; g < wholeHead.length; g++) if (!Number.isNaN(wholeHead[g])) headDiff = Math.max(headDiff, Math.abs(result.waterTableM[g] - wholeHead[g]));
    console.log(
      `  stitch        ${seconds.toFixed(1)} s, peak RSS ${mb(peakBytes())} (${mb(loaded)} with the pieces read)\n` +
        `  differences   line loss up to ${lossDiff.toFixed(1)} m3/d, relative up to ${(100 * lossRel).toFixed(2)}% (${worstLine}); coarse check ${coarseDiff}; ` +
        `water table up to ${(1000 * headDiff).toFixed(1)} mm; balance of the stitched heads ${result.balance.residualRelative.toExponential(1)}, largest cell ${result.balance.largestCellResidualM3PerDay.toFixed(2)} m3/d`,
    );
  }
}

function run(args: string[]): string {
  const out = spawnSync(process.execPath, [...process.execArgv, process.argv[1], ...args], { encoding: 'utf8', maxBuffer: 2 ** 26 });
  if (out.status !== 0) throw new Error(`${args.join(' ')} failed:\n${out.stderr}`);
  return out.stdout;
}

const [first, ...rest] = process.argv.slice(2);
if (first === 'whole' || first === 'tile' || first === 'stitch') child([first, ...rest]);
else {
  const lines = Number(first ?? 200);
  const counts = (rest[0] ?? '2,4,8').split(',').map(Number);
  const marginM = Number(rest[1] ?? DISTRICT_TILE_MARGIN_M);
  if (!(Number.isInteger(lines) && lines >= 2)) throw new Error(`Unexpected lines value: ${first}.`);
  const dir = mkdtempSync(join(tmpdir(), 'doab-district-tiles-'));
  console.log(`node ${process.version}; each solve in its own process; margin ${marginM} m`);
  process.stdout.write(run(['whole', dir, String(lines)]));
  for (const count of counts) {
    const tiles = Array.from({ length: count }, (_, i) => run(['tile', dir, String(lines), String(count), String(i + 1), String(marginM)]).trim().split(' ').map(Number));
    const seconds = tiles.map((t) => t[0]);
    const largest = tiles.reduce((a, b) => (b[1] > a[1] ? b : a));
    console.log(
      `${count} tiles\n  tiles         ${seconds.map((s) => s.toFixed(1)).join(', ')} s (sum ${seconds.reduce((a, b) => a + b, 0).toFixed(1)} s, slowest ${Math.max(...seconds).toFixed(1)} s); ` +
        `largest peak RSS ${mb(largest[1])} (${mb(largest[2])} before its solve, window ${(largest[3] / 1e6).toFixed(2)} M cells)`,
    );
    process.stdout.write(run(['stitch', dir, String(lines), String(count)]));
  }
}
