// Writes the bundled demo district: data-demo/canals.geojson and data-demo/aquifer.geojson.
// The district, its place and every name in it are invented. Run: npx tsx scripts/make-demo-district.ts
//
// Geometry is built in local metres (x east, y north) around an invented origin and turned into
// lon/lat with a local equirectangular approximation. doab projects to UTM itself and finds the
// design distances again to within about 0.3 % (a 700 m spacing reads about 702 m), which does
// not matter for a demo. The output is
// deterministic: same script, same bytes. On stderr it prints closed-form estimates for a few
// representative strips, so that a change of design shows at once what it does to the classes.
import { mkdirSync, writeFileSync } from 'node:fs';
import { writeArrayBuffer } from 'geotiff';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const OUT_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'data-demo');

// Invented origin in an open plain; the numbers only place the demo on the globe.
const ORIGIN_LON = 71.3;
const ORIGIN_LAT = 29.1;
const METRES_PER_DEGREE_LON = 111320 * Math.cos((ORIGIN_LAT * Math.PI) / 180);
const METRES_PER_DEGREE_LAT = 110574;

type Point = [number, number];

const round = (value: number, decimals: number) => Number(value.toFixed(decimals));

// ---------------------------------------------------------------- aquifer zones

const BASE_M = 150; // one horizontal aquifer base for the whole district

interface ZoneSpec {
  id: string;
  name: string;
  kMPerDay: number;
  groundM: number;
  rechargeMmPerYear: number;
  /** Rectangles [west, south, east, north] in local metres; more than one makes a MultiPolygon. */
  rects: [number, number, number, number][];
}

// One rectangle (the network plus 1.0-2.5 km all round, where the district's regional water table
// is held) split by straight cuts: three north-south cuts into soil bands, and one east-west cut
// across the second and fourth bands whose southern pieces form one zone. Conductivities lie in
// the ranges of H. Bouwer (1978), Groundwater Hydrology, m/d: fine sand 1-5, medium sand 5-20,
// coarse sand 20-100, sand and gravel 5-100. Ground falls from the ridge in the east to the flat
// in the west.
const WEST = -2500, EAST = 17000, SOUTH = 500, NORTH = 10800;
const CUT_X = [3500, 8000, 12500];
const CUT_Y = 2000;

const ZONES: ZoneSpec[] = [
  { id: 'Z-1', name: 'Grey Silty Fine Sand Flat', kMPerDay: 3, groundM: 179.2, rechargeMmPerYear: 60, rects: [[WEST, SOUTH, CUT_X[0], NORTH]] },
  { id: 'Z-2', name: 'Tamarisk Medium Sand', kMPerDay: 8, groundM: 180.5, rechargeMmPerYear: 150, rects: [[CUT_X[0], CUT_Y, CUT_X[1], NORTH]] },
  { id: 'Z-3', name: 'Amber Coarse Sand', kMPerDay: 25, groundM: 182, rechargeMmPerYear: 50, rects: [[CUT_X[1], SOUTH, CUT_X[2], NORTH]] },
  { id: 'Z-4', name: 'Juniper Sand and Gravel Ridge', kMPerDay: 60, groundM: 184, rechargeMmPerYear: 0, rects: [[CUT_X[2], CUT_Y, EAST, NORTH]] },
  {
    id: 'Z-5',
    name: 'Ochre Fine Sand',
    kMPerDay: 4,
    groundM: 179.5,
    rechargeMmPerYear: 80,
    rects: [[CUT_X[0], SOUTH, CUT_X[1], CUT_Y], [CUT_X[2], SOUTH, EAST, CUT_Y]],
  },
];

const ALL_RECTS = ZONES.flatMap((z) => z.rects);

/**
 * Counter-clockwise ring of a rectangle, with a vertex wherever another rectangle's corner lies on
 * one of its sides, so that neighbouring zones share every edge exactly.
 */
function rectangleRing([w, s, e, n]: [number, number, number, number]): Point[] {
  const corners = ALL_RECTS.flatMap(([cw, cs, ce, cn]): Point[] => [[cw, cs], [ce, cs], [ce, cn], [cw, cn]]);
  const inside = (v: number, lo: number, hi: number) => v > lo && v < hi;
  const along = (pick: (p: Point) => boolean, key: (p: Point) => number, sign: number) =>
    [...new Set(corners.filter(pick).map(key))].sort((a, b) => sign * (a - b));
  const south = along(([x, y]) => y === s && inside(x, w, e), ([x]) => x, 1).map((x): Point => [x, s]);
  const east = along(([x, y]) => x === e && inside(y, s, n), ([, y]) => y, 1).map((y): Point => [e, y]);
  const north = along(([x, y]) => y === n && inside(x, w, e), ([x]) => x, -1).map((x): Point => [x, n]);
  const west = along(([x, y]) => x === w && inside(y, s, n), ([, y]) => y, -1).map((y): Point => [w, y]);
  return [[w, s], ...south, [e, s], ...east, [e, n], ...north, [w, n], ...west, [w, s]];
}

// ---------------------------------------------------------------- lines

type Stage = { constantM: number } | { startM: number; fallMPerKm: number };

interface LineSpec {
  id: string;
  name: string;
  kind: 'canal' | 'drain';
  parts: Point[][];
  stage: Stage;
}

// Beds (invented): the canals' beds are silted, a resistance of some days; the drains are kept
// clean (no attribute: the config's default, a clean bed). Bottom width and water depth give the
// wetted perimeter on doab's default side slope.
interface BedSpec {
  resistanceD?: number;
  bottomWidthM: number;
  waterDepthM: number;
}
const MAIN_BED: BedSpec = { resistanceD: 6, bottomWidthM: 10, waterDepthM: 2.2 };
const DISTRIBUTARY_BED: BedSpec = { resistanceD: 10, bottomWidthM: 2.5, waterDepthM: 1.0 };
const DRAIN_BED: BedSpec = { bottomWidthM: 1.5, waterDepthM: 0.8 };
const bedOf = (line: LineSpec): BedSpec => (line.kind === 'drain' ? DRAIN_BED : line.id === 'C-01' ? MAIN_BED : DISTRIBUTARY_BED);

function arc(center: Point, radiusM: number, fromDeg: number, toDeg: number, stepDeg = 5): Point[] {
  const points: Point[] = [];
  const steps = Math.ceil(Math.abs(toDeg - fromDeg) / stepDeg);
  for (let i = 0; i <= steps; i++) {
    const a = ((fromDeg + ((toDeg - fromDeg) * i) / steps) * Math.PI) / 180;
    points.push([center[0] + radiusM * Math.cos(a), center[1] + radiusM * Math.sin(a)]);
  }
  return points;
}

/** South from the main canal, a left-hand bend of `turnDeg` about a shared centre, then straight on. */
function bendingSouth(x: number, yStart: number, center: Point, turnDeg: number, tailM: number): Point[] {
  const radius = center[0] - x;
  const bend = arc(center, radius, 180, 180 + turnDeg);
  const t = (turnDeg * Math.PI) / 180;
  const end = bend[bend.length - 1];
  return [[x, yStart], ...bend, [end[0] + tailM * Math.sin(t), end[1] - tailM * Math.cos(t)]];
}

const MAIN_Y = 9000;
const MAIN_EAST = 15500;
const MAIN_WEST = -500;
const MAIN_STAGE = { startM: 181, fallMPerKm: 0.125 };
// Field drains begin 400 m short of the main canal and fall south to the collector drain.
const DRAIN_Y = 8600;

// The collector drain runs west along the south of the district, below every canal's tail, to an
// outfall at the district's western edge; the field drains end on it at its own stage (T junctions).
const COLLECTOR_Y = 2200;
const COLLECTOR_EAST = 13800;
const COLLECTOR_STAGE = { startM: 179.5, fallMPerKm: 0.3 };
const collectorStageAt = (x: number) => COLLECTOR_STAGE.startM - (COLLECTOR_STAGE.fallMPerKm * (COLLECTOR_EAST - x)) / 1000;

// The curved distributaries in the coarse sand share one bend centre, so they stay a constant distance apart.
const BEND_CENTRE: Point = [11300, 6000];
const BEND_TURN_DEG = 60;

// Every distributary takes off from the main canal at one of these x.
const DISTRIBUTARY_X = [200, 1600, 3000, 4200, 5900, 7300, 8800, 10200, 13000, 14500];

/** The main canal, digitised from its head in the east, with a shared vertex at each junction. */
function mainCanal(): Point[] {
  const heads = [...DISTRIBUTARY_X].sort((a, b) => b - a).map((x): Point => [x, MAIN_Y]);
  return [[MAIN_EAST, MAIN_Y], ...heads, [MAIN_WEST, MAIN_Y]];
}

/** A distributary's stage: from the main canal's stage where it takes off (no drop at the head regulator), falling. */
function offtakeStage(x: number, fallMPerKm: number): Stage {
  return { startM: round(MAIN_STAGE.startM - (MAIN_STAGE.fallMPerKm * (MAIN_EAST - x)) / 1000, 3), fallMPerKm };
}

/** A field drain from DRAIN_Y south to the collector, ending at the collector's stage. */
function fieldDrain(id: string, name: string, x: number, fallMPerKm: number): LineSpec {
  const lengthM = DRAIN_Y - COLLECTOR_Y;
  return { id, name, kind: 'drain', parts: [[[x, DRAIN_Y], [x, COLLECTOR_Y]]], stage: { startM: round(collectorStageAt(x) + (fallMPerKm * lengthM) / 1000, 3), fallMPerKm } };
}

const LINES: LineSpec[] = [
  // main canal along the north: head in cut through the ridge in the east, falling west onto the
  // flat, where it runs in fill above the ground; a vertex at every distributary's head
  { id: 'C-01', name: 'Heron Main Canal', kind: 'canal', parts: [mainCanal()], stage: MAIN_STAGE },
  // interceptor drains on the outer side of the main canal, where it crosses the flat and the medium sand
  { id: 'D-01', name: 'Kestrel Seepage Drain', kind: 'drain', parts: [[[3400, 9600], [-1000, 9600]]], stage: { startM: 176.2, fallMPerKm: 0.1 } },
  { id: 'D-02', name: 'Lark Seepage Drain', kind: 'drain', parts: [[[7800, 9700], [3600, 9700]]], stage: { startM: 177.3, fallMPerKm: 0.1 } },
  // silty flat: distributaries in low fill with drains between, and a short toe drain close beside Distributary 1
  { id: 'C-02', name: 'Distributary 1', kind: 'canal', parts: [[[DISTRIBUTARY_X[0], MAIN_Y], [DISTRIBUTARY_X[0], 3500]]], stage: offtakeStage(DISTRIBUTARY_X[0], 0.3) },
  { id: 'D-03', name: 'Wren Toe Drain', kind: 'drain', parts: [[[330, 8200], [330, 6700]]], stage: { constantM: 176.3 } },
  fieldDrain('D-04', 'Plover Drain', 900, 0.1),
  { id: 'C-03', name: 'Distributary 2', kind: 'canal', parts: [[[DISTRIBUTARY_X[1], MAIN_Y], [DISTRIBUTARY_X[1], 2900]]], stage: offtakeStage(DISTRIBUTARY_X[1], 0.3) },
  fieldDrain('D-05', 'Finch Drain', 2300, 0.08),
  { id: 'C-04', name: 'Distributary 3', kind: 'canal', parts: [[[DISTRIBUTARY_X[2], MAIN_Y], [DISTRIBUTARY_X[2], 2900]]], stage: offtakeStage(DISTRIBUTARY_X[2], 0.3) },
  // medium sand: Distributaries 3 and 4, and 5 and 6, have no drain between them
  { id: 'C-05', name: 'Distributary 4', kind: 'canal', parts: [[[DISTRIBUTARY_X[3], MAIN_Y], [DISTRIBUTARY_X[3], 2800]]], stage: offtakeStage(DISTRIBUTARY_X[3], 0.28) },
  fieldDrain('D-06', 'Sparrow Drain', 5000, 0.1),
  { id: 'C-06', name: 'Distributary 5', kind: 'canal', parts: [[[DISTRIBUTARY_X[4], MAIN_Y], [DISTRIBUTARY_X[4], 2900]]], stage: offtakeStage(DISTRIBUTARY_X[4], 0.28) },
  { id: 'C-07', name: 'Distributary 6', kind: 'canal', parts: [[[DISTRIBUTARY_X[5], MAIN_Y], [DISTRIBUTARY_X[5], 4000]]], stage: offtakeStage(DISTRIBUTARY_X[5], 0.3) },
  // the collector along the south, below every tail
  { id: 'D-07', name: 'Crimson Collector Drain', kind: 'drain', parts: [[[COLLECTOR_EAST, COLLECTOR_Y], [WEST, COLLECTOR_Y]]], stage: COLLECTOR_STAGE },
  // coarse sand: two distributaries and a drain bending together about one centre; the drain's tail ends in the field
  { id: 'C-08', name: 'Distributary 7', kind: 'canal', parts: [bendingSouth(DISTRIBUTARY_X[6], MAIN_Y, BEND_CENTRE, BEND_TURN_DEG, 1500)], stage: offtakeStage(DISTRIBUTARY_X[6], 0.22) },
  { id: 'D-08', name: 'Tern Drain', kind: 'drain', parts: [bendingSouth(9500, DRAIN_Y, BEND_CENTRE, BEND_TURN_DEG, 1500)], stage: { startM: 179.0, fallMPerKm: 0.17 } },
  { id: 'C-09', name: 'Distributary 8', kind: 'canal', parts: [bendingSouth(DISTRIBUTARY_X[7], MAIN_Y, BEND_CENTRE, BEND_TURN_DEG, 1500)], stage: offtakeStage(DISTRIBUTARY_X[7], 0.25) },
  // sand and gravel ridge: the distributaries run in cut, more than 3 m below ground
  { id: 'C-10', name: 'Distributary 9', kind: 'canal', parts: [[[DISTRIBUTARY_X[8], MAIN_Y], [DISTRIBUTARY_X[8], 3000]]], stage: offtakeStage(DISTRIBUTARY_X[8], 0.2) },
  { id: 'C-11', name: 'Distributary 10', kind: 'canal', parts: [[[DISTRIBUTARY_X[9], MAIN_Y], [DISTRIBUTARY_X[9], 4000]]], stage: offtakeStage(DISTRIBUTARY_X[9], 0.15) },
  { id: 'D-09', name: 'Oak Drain', kind: 'drain', parts: [[[15400, 8600], [15400, 5600]]], stage: { constantM: 180.1 } },
];


// ---------------------------------------------------------------- derived values

function partLengthM(part: Point[]): number {
  let sum = 0;
  for (let i = 1; i < part.length; i++) sum += Math.hypot(part[i][0] - part[i - 1][0], part[i][1] - part[i - 1][1]);
  return sum;
}
const lineLengthM = (line: LineSpec) => line.parts.reduce((sum, p) => sum + partLengthM(p), 0);


function stageProperties(line: LineSpec): Record<string, number> {
  if ('constantM' in line.stage) return { stage_m: line.stage.constantM };
  const endM = line.stage.startM - (line.stage.fallMPerKm * lineLengthM(line)) / 1000;
  return { stage_start_m: line.stage.startM, stage_end_m: round(endM, 2) };
}

function toLonLat([x, y]: Point): Point {
  return [round(ORIGIN_LON + x / METRES_PER_DEGREE_LON, 7), round(ORIGIN_LAT + y / METRES_PER_DEGREE_LAT, 7)];
}

// ---------------------------------------------------------------- writing

function featureCollection(features: object[]): string {
  return `{\n"type": "FeatureCollection",\n"features": [\n${features.map((f) => JSON.stringify(f)).join(',\n')}\n]\n}\n`;
}

function lineFeature(line: LineSpec): object {
  const parts = line.parts.map((p) => p.map(toLonLat));
  const geometry = parts.length === 1 ? { type: 'LineString', coordinates: parts[0] } : { type: 'MultiLineString', coordinates: parts };
  const bed = bedOf(line);
  const bedProperties = { ...(bed.resistanceD === undefined ? {} : { bed_resistance_d: bed.resistanceD }), bottom_width_m: bed.bottomWidthM, water_depth_m: bed.waterDepthM };
  return { type: 'Feature', properties: { id: line.id, name: line.name, kind: line.kind, ...stageProperties(line), ...bedProperties }, geometry };
}

function signedAreaM2(ring: Point[]): number {
  let sum = 0;
  for (let i = 1; i < ring.length; i++) sum += ring[i - 1][0] * ring[i][1] - ring[i][0] * ring[i - 1][1];
  return sum / 2;
}

function zoneFeature(zone: ZoneSpec): object {
  const polygons = zone.rects.map((r) => {
    const ring = rectangleRing(r);
    if (!(signedAreaM2(ring) > 0)) throw new Error(`Zone ${zone.id} has a ring that is not counter-clockwise.`);
    return [ring.map(toLonLat)];
  });
  const geometry = polygons.length === 1 ? { type: 'Polygon', coordinates: polygons[0] } : { type: 'MultiPolygon', coordinates: polygons };
  const properties = {
    id: zone.id,
    name: zone.name,
    k_m_d: zone.kMPerDay,
    base_m: BASE_M,
    ground_m: zone.groundM,
    recharge_mm_yr: zone.rechargeMmPerYear,
    // beyond the district's edge the regional water table stands about 4 m below ground (invented):
    // the district solve holds that head where the zone meets the aquifer's outer edge
    edge_head_m: Math.round((zone.groundM - 4) * 10) / 10,
    // K is known to a factor of two either way (invented): the P10 and P90 of a log-normal about k_m_d
    k_low_m_d: zone.kMPerDay / 2,
    k_high_m_d: zone.kMPerDay * 2,
  };
  return { type: 'Feature', properties, geometry };
}

// ---------------------------------------------------------------- design check

// Steady Dupuit-Forchheimer flow across one zone with recharge N (W.W. Woessner and E.P. Poeter
// (2020), section 7.3): u(x) = h0^2 - (h0^2 - hL^2) x/L + (N/K) x (L - x), u = h^2.
function strip(h0: number, hL: number, transectLengthM: number, kMPerDay: number, nMPerDay: number) {
  const du = h0 * h0 - hL * hL;
  const qA = (kMPerDay * du) / (2 * transectLengthM) - (nMPerDay * transectLengthM) / 2; // leaves line a into the strip
  const qB = (-kMPerDay * du) / (2 * transectLengthM) - (nMPerDay * transectLengthM) / 2; // leaves line b into the strip
  const u = (x: number) => h0 * h0 - (du * x) / transectLengthM + (nMPerDay / kMPerDay) * x * (transectLengthM - x);
  let peakX = du >= 0 ? 0 : transectLengthM;
  if (nMPerDay > 0) {
    const divide = transectLengthM / 2 - (kMPerDay * du) / (2 * nMPerDay * transectLengthM);
    if (divide > 0 && divide < transectLengthM) peakX = divide;
  }
  return { qA, qB, peakX, peakH: Math.sqrt(u(peakX)) };
}

function riskClass(depthM: number): string {
  if (depthM <= 0) return 'ponded';
  if (depthM < 2) return 'waterlogged';
  return depthM < 3 ? 'potential' : 'safe';
}

function nearestOnLine(line: LineSpec, p: Point): { point: Point; chainageM: number } {
  let best = { d: Infinity, point: p, chainageM: 0 };
  let start = 0;
  for (const part of line.parts) {
    for (let i = 1; i < part.length; i++) {
      const [ax, ay] = part[i - 1], [bx, by] = part[i];
      const len = Math.hypot(bx - ax, by - ay);
      const t = Math.min(1, Math.max(0, ((p[0] - ax) * (bx - ax) + (p[1] - ay) * (by - ay)) / (len * len)));
      const q: Point = [ax + t * (bx - ax), ay + t * (by - ay)];
      const d = Math.hypot(q[0] - p[0], q[1] - p[1]);
      if (d < best.d) best = { d, point: q, chainageM: start + t * len };
      start += len;
    }
  }
  return best;
}

function stageAt(line: LineSpec, chainageM: number): number {
  if ('constantM' in line.stage) return line.stage.constantM;
  return line.stage.startM - (line.stage.fallMPerKm * chainageM) / 1000;
}

function zoneAt([x, y]: Point): ZoneSpec | undefined {
  return ZONES.find((z) => z.rects.some(([w, s, e, n]) => x >= w && x < e && y >= s && y < n));
}

// Representative strips: the point of line a nearest to `at`, and the nearest point of line b
// facing it, both in one zone so that the closed form applies.
const CHECKS: { a: string; b: string; at: Point; note: string }[] = [
  { a: 'C-01', b: 'D-01', at: [1000, MAIN_Y], note: 'main canal in fill over the flat' },
  { a: 'C-01', b: 'D-02', at: [6000, MAIN_Y], note: 'main canal near ground, medium sand' },
  { a: 'C-02', b: 'D-03', at: [DISTRIBUTARY_X[0], 7500], note: 'toe drain: narrow, L/h < 5' },
  { a: 'C-02', b: 'D-04', at: [DISTRIBUTARY_X[0], 6000], note: 'flat, canal and drain' },
  { a: 'C-03', b: 'D-05', at: [DISTRIBUTARY_X[1], 6000], note: 'flat, canal and drain' },
  { a: 'C-05', b: 'D-06', at: [DISTRIBUTARY_X[3], 7000], note: 'medium sand, canal and drain' },
  { a: 'C-06', b: 'C-07', at: [DISTRIBUTARY_X[4], 7000], note: 'medium sand, two canals, no drain' },
  { a: 'C-08', b: 'D-08', at: [DISTRIBUTARY_X[6], 7500], note: 'coarse sand, canal and drain' },
  { a: 'C-09', b: 'D-08', at: [DISTRIBUTARY_X[7], 7500], note: 'coarse sand, canal and drain' },
  { a: 'C-08', b: 'D-08', at: [10050, 3835], note: 'coarse sand, after the bend' },
  { a: 'C-10', b: 'C-11', at: [DISTRIBUTARY_X[8], 7000], note: 'ridge, two canals in cut' },
  { a: 'C-11', b: 'D-09', at: [DISTRIBUTARY_X[9], 8000], note: 'ridge, canal and drain' },
];

function designCheck(): string[] {
  const byId = new Map(LINES.map((l) => [l.id, l]));
  const rows = ['pair         L(m)   h0(m) hL(m)  K(m/d) N(mm/yr)  qA qB(m2/d)  loss a(m3/d/km)  min depth(m)  class        L/h   note'];
  for (const check of CHECKS) {
    const a = byId.get(check.a)!, b = byId.get(check.b)!;
    const onA = nearestOnLine(a, check.at);
    const onB = nearestOnLine(b, onA.point);
    const zone = zoneAt(onA.point);
    if (!zone || zoneAt(onB.point) !== zone) throw new Error(`Design check ${check.a}|${check.b} crosses zones; pick a station inside one zone.`);
    const transectLengthM = Math.hypot(onB.point[0] - onA.point[0], onB.point[1] - onA.point[1]);
    const h0 = stageAt(a, onA.chainageM) - BASE_M, hL = stageAt(b, onB.chainageM) - BASE_M;
    const nMPerDay = zone.rechargeMmPerYear / 1000 / 365.25;
    const s = strip(h0, hL, transectLengthM, zone.kMPerDay, nMPerDay);
    const depth = zone.groundM - BASE_M - s.peakH;
    rows.push(
      [
        `${check.a}|${check.b}`.padEnd(11),
        transectLengthM.toFixed(0).padStart(5),
        h0.toFixed(2).padStart(6),
        hL.toFixed(2).padStart(5),
        String(zone.kMPerDay).padStart(6),
        String(zone.rechargeMmPerYear).padStart(7),
        `${s.qA.toFixed(3).padStart(7)} ${s.qB.toFixed(3).padStart(7)}`,
        (s.qA * 1000).toFixed(0).padStart(10),
        depth.toFixed(2).padStart(13),
        `  ${riskClass(depth).padEnd(11)}`,
        (transectLengthM / ((h0 + hL) / 2)).toFixed(1).padStart(5),
        `  ${check.note}`,
      ].join(' '),
    );
  }
  return rows;
}

// ---------------------------------------------------------------- main

const ids = new Set<string>();
for (const id of [...LINES.map((l) => l.id), ...ZONES.map((z) => z.id)]) {
  if (ids.has(id)) throw new Error(`Duplicate id: ${id}.`);
  ids.add(id);
}
const zoneAreaM2 = ZONES.reduce((sum, z) => sum + z.rects.reduce((s, [w, so, e, n]) => s + (e - w) * (n - so), 0), 0);
if (zoneAreaM2 !== (EAST - WEST) * (NORTH - SOUTH)) throw new Error(`Zones cover ${zoneAreaM2} m^2, not the whole rectangle.`);

// ---------------------------------------------------------------- DEM

// An invented ground surface for dem.tif: it rises from the flat in the west to the ridge in the
// east through the zones' ground levels (linear between the middles of the bands), with a swale 1 m
// deep and about 600 m wide across the medium sand and the flat, and a gentle rolling of +-0.3 m.
const GROUND_PROFILE: [number, number][] = [[WEST, 179.2], [0, 179.2], [5750, 180.5], [10250, 182], [14750, 184], [EAST, 184]];
function demGround([x, y]: Point): number {
  let g = GROUND_PROFILE[0][1];
  for (let i = 1; i < GROUND_PROFILE.length; i++) {
    const [x0, g0] = GROUND_PROFILE[i - 1], [x1, g1] = GROUND_PROFILE[i];
    if (x >= x0 && x <= x1) g = g0 + ((g1 - g0) * (x - x0)) / (x1 - x0);
    if (x > x1) g = g1;
  }
  // the swale: a line from (1500, 7000) to (8500, 3000); distance to it
  const [ax, ay, bx, by] = [1500, 7000, 8500, 3000];
  const t = Math.min(1, Math.max(0, ((x - ax) * (bx - ax) + (y - ay) * (by - ay)) / ((bx - ax) ** 2 + (by - ay) ** 2)));
  const d = Math.hypot(x - (ax + t * (bx - ax)), y - (ay + t * (by - ay)));
  const swale = -1.0 * Math.exp(-((d / 300) ** 2));
  const rolling = 0.3 * Math.sin(x / 900) * Math.cos(y / 1300);
  return Math.round((g + swale + rolling) * 100) / 100;
}

const DEM_PIXEL_DEG = 0.001;
function demTiff(): Uint8Array {
  const [west, north] = toLonLat([WEST, NORTH]);
  const [east, south] = toLonLat([EAST, SOUTH]);
  const width = Math.ceil((east - west) / DEM_PIXEL_DEG), height = Math.ceil((north - south) / DEM_PIXEL_DEG);
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const lon = west + (c + 0.5) * DEM_PIXEL_DEG, lat = north - (r + 0.5) * DEM_PIXEL_DEG;
      values[r * width + c] = demGround([(lon - ORIGIN_LON) * METRES_PER_DEGREE_LON, (lat - ORIGIN_LAT) * METRES_PER_DEGREE_LAT]);
    }
  }
  // GeoTIFF 1.0 specification (N. Ritter, M. Ruth, 1995) [published]: model type 2 geographic, raster type 1 pixel-is-area
  const buffer = writeArrayBuffer(values, {
    width,
    height,
    BitsPerSample: [32],
    SampleFormat: [3],
    ModelPixelScale: [DEM_PIXEL_DEG, DEM_PIXEL_DEG, 0],
    ModelTiepoint: [0, 0, 0, west, north, 0],
    GTModelTypeGeoKey: 2,
    GTRasterTypeGeoKey: 1,
    GeographicTypeGeoKey: 4326,
    GDAL_NODATA: '-9999',
  } as unknown as Parameters<typeof writeArrayBuffer>[1]);
  return new Uint8Array(buffer);
}

mkdirSync(OUT_DIR, { recursive: true });
writeFileSync(join(OUT_DIR, 'dem.tif'), demTiff());
writeFileSync(join(OUT_DIR, 'canals.geojson'), featureCollection(LINES.map(lineFeature)));
writeFileSync(join(OUT_DIR, 'aquifer.geojson'), featureCollection(ZONES.map(zoneFeature)));
process.stderr.write(`wrote ${LINES.length} lines and ${ZONES.length} zones to ${OUT_DIR}\n`);
process.stderr.write(`closed-form check (base ${BASE_M} m; seepage q positive when the line loses water):\n${designCheck().join('\n')}\n`);
