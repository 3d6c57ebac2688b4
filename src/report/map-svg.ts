// The district map of the report, drawn in the work CRS (metres, grid north up): strips filled by
// risk class, lines with a width that grows with their loss per km, drains dashed, reaches with
// neither side paired overlaid, a scale bar and a north arrow. Returns the SVG and its key (HTML).
import { FACING_PAIRED } from '../geometry/index.js';
import type { StripSummary } from '../screening/aggregate.js';
import type { Grid } from '../geometry/grid.js';
import type { ScreenResult } from '../screening/screen.js';
import { escapeHtml } from './escape.js';
import { formatFixed, formatGrouped, joinedInPieces, roundDown125 } from '../output/format.js';
import { LINE_COLOURS, STRIP_CLASSES, STRIP_STYLES, patternId, stripPatternDefs, type StripClass } from './palette.js';
import { fitView, pathData, tenthX, tenthY, type MapView } from './svg-path.js';
import { depthImage } from './depth-image.js';

export interface MapOptions {
  /** Drawing width in SVG units (about CSS pixels at 100% zoom); default 1000. */
  widthPx?: number;
  maxHeightPx?: number;
  /** Detail finer than this is dropped from strips and lines (drawing units); default 1. */
  minStepPx?: number;
}

export interface DistrictMap {
  svg: string;
  /** The map's key as HTML: risk classes, line kinds and widths, unpaired reaches. */
  key: string;
}

const PAD_PX = 24;
// the band under the data that holds the scale bar and the north arrow, clear of every shape
const BAND_PX = 40;

/** How wide lines are drawn: from min to max (px), max for a loss per km of `top` or more. */
interface LineWidths {
  minPx: number;
  maxPx: number;
  top: number;
  /** Width of the band over unpaired reaches (px). */
  unpairedPx: number;
}

/**
 * Widths that suit the drawn scale: the widest line is at most a quarter of the median strip
 * spacing on the map, so that in a dense district the lines do not cover the strips.
 */
function lineWidths(result: ScreenResult, view: MapView): LineWidths {
  const spacings = result.strips.map((strip) => strip.strip.spacingMeanM).filter(Number.isFinite).sort((a, b) => a - b);
  const spacingPx = spacings.length > 0 ? spacings[Math.floor(spacings.length / 2)] * view.pxPerM : Infinity;
  const maxPx = Math.min(4.5, Math.max(1, spacingPx / 4));
  return { minPx: Math.min(0.8, maxPx / 3), maxPx, top: widthScaleTop(result), unpairedPx: Math.min(7, Math.max(2, spacingPx / 2)) };
}

/** Loss per km (m^3/d/km) as canals.geojson gives it (the district solve's when it ran); null when unknown. */
export function lineLossPerKm(result: ScreenResult, line: number): number | null {
  const perKm = result.lineFigures[line].netLossM3PerDayKm;
  return Number.isFinite(perKm) ? perKm : null;
}

/** The loss per km drawn at the widest: the 95th percentile of the losing lines, so one short outlier does not make every other line hairline-thin. */
export function widthScaleTop(result: ScreenResult): number {
  const losing: number[] = [];
  for (let i = 0; i < result.lines.length; i++) {
    const v = lineLossPerKm(result, i);
    if (v !== null && v > 0) losing.push(v);
  }
  if (losing.length === 0) return 0;
  losing.sort((a, b) => a - b);
  return losing[Math.floor(0.95 * (losing.length - 1))];
}

function lineWidthPx(lossPerKm: number | null, widths: LineWidths): number {
  const { minPx, maxPx, top } = widths;
  if (lossPerKm === null || !(lossPerKm > 0) || !(top > 0)) return minPx;
  // area-like scaling: a line losing four times as much is drawn twice as wide
  return minPx + (maxPx - minPx) * Math.sqrt(Math.min(lossPerKm / top, 1));
}

function stripClass(strip: StripSummary): StripClass {
  return strip.risk ?? 'unsolved';
}

function boundsOf(linesM: Float64Array[][], strips: StripSummary[], grid: Grid | null): [number, number, number, number] {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  const add = (coords: Float64Array) => {
    for (let i = 0; i < coords.length; i += 2) {
      if (coords[i] < minX) minX = coords[i];
      if (coords[i] > maxX) maxX = coords[i];
      if (coords[i + 1] < minY) minY = coords[i + 1];
      if (coords[i + 1] > maxY) maxY = coords[i + 1];
    }
  };
  for (const parts of linesM) for (const part of parts) add(part);
  for (const strip of strips) add(strip.strip.ringM);
  if (grid) add(Float64Array.from([grid.originX, grid.originY, grid.originX + grid.columns * grid.cellM, grid.originY + grid.rows * grid.cellM]));
  if (!Number.isFinite(minX)) return [0, 0, 1000, 1000];
  return [minX, minY, maxX, maxY];
}

/** Runs of stations with neither side paired, each drawn over the chainage its stations stand for. */
function unpairedPathData(result: ScreenResult, view: MapView, minStepPx: number): string {
  const { stations, facings } = result;
  let d = '';
  let run: number[] = [];
  const flush = () => {
    if (run.length === 0) return;
    const first = run[0], last = run[run.length - 1];
    const half0 = stations.lengthM[first] / 2, half1 = stations.lengthM[last] / 2;
    const coords = [stations.x[first] - stations.dirX[first] * half0, stations.y[first] - stations.dirY[first] * half0];
    for (const s of run) coords.push(stations.x[s], stations.y[s]);
    coords.push(stations.x[last] + stations.dirX[last] * half1, stations.y[last] + stations.dirY[last] * half1);
    d += pathData(view, coords, minStepPx, false);
    run = [];
  };
  for (let s = 0; s < stations.count; s++) {
    const unpaired = result.results.reason[2 * s] !== FACING_PAIRED && result.results.reason[2 * s + 1] !== FACING_PAIRED;
    const continues = run.length > 0 && stations.line[s] === stations.line[run[0]] && stations.part[s] === stations.part[run[0]];
    if (!unpaired || !continues) flush();
    if (unpaired) run.push(s);
  }
  flush();
  return d;
}

function scaleBar(view: MapView): string {
  const mapWidthM = (view.widthPx - 2 * view.padPx) / view.pxPerM;
  const lengthM = roundDown125(mapWidthM / 5);
  const lengthPx = lengthM * view.pxPerM;
  const x0 = view.padPx, y0 = view.heightPx - 12;
  const label = (m: number) => (lengthM >= 1000 ? `${formatGrouped(m / 1000, m % 1000 === 0 ? 0 : 1)} km` : `${formatGrouped(m)} m`);
  const r = (v: number) => Math.round(v * 10) / 10;
  return (
    `<g class="map-scale" aria-label="scale bar ${label(lengthM)}">` +
    `<rect x="${r(x0)}" y="${r(y0 - 5)}" width="${r(lengthPx / 2)}" height="5" fill="#000000"/>` +
    `<rect x="${r(x0 + lengthPx / 2)}" y="${r(y0 - 5)}" width="${r(lengthPx / 2)}" height="5" fill="#ffffff" stroke="#000000" stroke-width="0.8"/>` +
    `<text x="${r(x0)}" y="${r(y0 - 9)}" text-anchor="middle">0</text>` +
    `<text x="${r(x0 + lengthPx / 2)}" y="${r(y0 - 9)}" text-anchor="middle">${label(lengthM / 2)}</text>` +
    `<text x="${r(x0 + lengthPx)}" y="${r(y0 - 9)}" text-anchor="middle">${label(lengthM)}</text>` +
    `</g>`
  );
}

function northArrow(view: MapView): string {
  const x = view.widthPx - view.padPx - 70, y = view.heightPx - 36;
  return (
    `<g class="map-north" aria-label="grid north is up">` +
    `<path d="M${x} ${y}l7 26l-7 -6l-7 6z" fill="#000000"/>` +
    `<text x="${x + 12}" y="${y + 11}" font-weight="bold">N</text>` +
    `<text x="${x + 12}" y="${y + 24}" font-size="10">grid north</text>` +
    `</g>`
  );
}

/** Loss-per-km values to show as widths in the key: round numbers up to the largest. */
function widthSamples(scaleTop: number): number[] {
  if (!(scaleTop > 0)) return [];
  const samples = [roundDown125(scaleTop), roundDown125(scaleTop / 5), roundDown125(scaleTop / 25)];
  return [...new Set(samples)].sort((a, b) => a - b);
}

function keySwatchLine(stroke: string, width: number, extra = ''): string {
  return (
    `<svg class="key-swatch" width="44" height="14" viewBox="0 0 44 14" aria-hidden="true">` +
    `<path d="M2 7h40" stroke="${stroke}" stroke-width="${Math.round(width * 10) / 10}"${extra} fill="none"/></svg>`
  );
}

function mapKey(result: ScreenResult, lineWidth: LineWidths): string {
  const scaleTop = lineWidth.top;
  const counts = result.totals.stripsByRisk;
  const risk = result.settings.risk;
  const depthNote: Record<StripClass, string> = {
    ponded: 'water table at or above ground',
    waterlogged: `water table less than ${escapeHtml(risk.waterloggedDepthM)} m below ground`,
    potential: `potentially waterlogged, water table ${escapeHtml(risk.waterloggedDepthM)} to ${escapeHtml(risk.potentialDepthM)} m below ground`,
    safe: `water table ${escapeHtml(risk.potentialDepthM)} m or more below ground`,
    unsolved: 'no transect could be solved',
  };
  const classes = STRIP_CLASSES.map(
    (kind) =>
      `<li><svg class="key-swatch" width="28" height="18" viewBox="0 0 28 18" aria-hidden="true">` +
      `<rect x="1" y="1" width="26" height="16" fill="url(#${patternId(kind)})" stroke="#444444" stroke-width="0.6"/></svg>` +
      `<span><b>${STRIP_STYLES[kind].label}</b> (${formatGrouped(counts[kind])} strips): ${depthNote[kind]}</span></li>`,
  ).join('');
  const widths = widthSamples(scaleTop)
    .map((v) => `<li>${keySwatchLine(LINE_COLOURS.canal, lineWidthPx(v, lineWidth))}<span>${formatGrouped(v)} m³/d per km</span></li>`)
    .join('');
  return (
    `<div class="map-key"><h3>Strips, by smallest depth of the water table</h3><ul>${classes}</ul>` +
    (result.district
      ? `<p class="key-note">Under the strips (drawn paler), the district solve's depth of the water table over the whole aquifer, ` +
        `${escapeHtml(result.district.cellM)} m cells, in the same colours by risk class; depth.tif holds its values.</p>`
      : '') +
    `<h3>Lines</h3><ul>` +
    `<li>${keySwatchLine(LINE_COLOURS.canal, 2)}<span><b>canal</b>: solid</span></li>` +
    `<li>${keySwatchLine(LINE_COLOURS.drain, 1.2, ' stroke-dasharray="5 3"')}<span><b>drain</b>: dashed</span></li>` +
    `<li>${keySwatchLine(LINE_COLOURS.unpaired, lineWidth.unpairedPx, ' stroke-opacity="0.55"')}` +
    `<span><b>unpaired reach</b>: neither side faces a partner line (wide band)</span></li></ul>` +
    (widths
      ? `<h3>Line width: loss per km${result.district ? ' (district solve, per km of line)' : ' of paired length (strips)'}</h3><ul>${widths}</ul><p class="key-note">Lines losing ${formatGrouped(scaleTop, scaleTop < 10 ? 1 : 0)} m³/d per km ` +
        `or more (the 95th percentile of losing lines) are drawn widest; gaining lines and lines with no paired length thinnest.</p>`
      : '<p class="key-note">No line loses water.</p>') +
    `</div>`
  );
}

/** The district solve's depth raster under everything else, as an inline PNG; '' when it did not run. */
function depthRaster(result: ScreenResult, view: MapView): string {
  const district = result.district;
  if (!district) return '';
  const { grid } = district;
  const r = (v: number) => Math.round(v * 10) / 10;
  const x = (grid.originX - view.minX) * view.pxPerM + view.padPx;
  const y = (view.maxY - (grid.originY + grid.rows * grid.cellM)) * view.pxPerM + view.padPx;
  const widthPx = grid.columns * grid.cellM * view.pxPerM, heightPx = grid.rows * grid.cellM * view.pxPerM;
  const image = depthImage(district, result.settings.risk, Math.ceil(Math.max(widthPx, heightPx)));
  return (
    `<image class="map-depth" x="${r(x)}" y="${r(y)}" width="${r(widthPx)}" height="${r(heightPx)}" preserveAspectRatio="none" ` +
    `href="${image.href}"><title>depth of the water table below ground by risk class, district solve at ${district.cellM} m cells</title></image>\n`
  );
}

/** Aquifer zones: an outline each, with the zone's id and K as its title and, where it is large enough, as a label. */
function zoneLayer(result: ScreenResult, view: MapView, minStepPx: number): string {
  const { polygons } = result.zoneIndex;
  const shapes: string[] = [];
  const labels: string[] = [];
  const labelled = new Set<number>();
  for (let p = 0; p < polygons.count; p++) {
    const zone = result.zones[polygons.zone[p]];
    const title = `zone ${zone.id}: K ${formatFixed(zone.kMPerDay, zone.kMPerDay < 1 ? 3 : 1)} m/d, recharge ${formatFixed(zone.rechargeMPerDay * 1000 * 365.25, 0)} mm/yr, base ${formatFixed(zone.baseM, 1)} m, ground ${formatFixed(zone.groundM, 1)} m`;
    const d = polygons.rings[p].map((ring) => pathData(view, ring, minStepPx, true)).join('');
    shapes.push(`<path class="map-zone" d="${d}"><title>${escapeHtml(title)}</title></path>`);
    // one label a zone, in its largest polygon's box, and only where the box is wide enough to hold it
    const outer = polygons.rings[p][0];
    let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
    for (let i = 0; i < outer.length; i += 2) {
      minX = Math.min(minX, outer[i]); maxX = Math.max(maxX, outer[i]);
      minY = Math.min(minY, outer[i + 1]); maxY = Math.max(maxY, outer[i + 1]);
    }
    if (labelled.has(polygons.zone[p]) || (maxX - minX) * view.pxPerM < 120 || (maxY - minY) * view.pxPerM < 40) continue;
    labelled.add(polygons.zone[p]);
    labels.push(
      `<text class="map-zone-label" x="${tenthX(view, minX) / 10 + 4}" y="${tenthY(view, maxY) / 10 + 12}">${escapeHtml(`${zone.id}: K ${formatFixed(zone.kMPerDay, zone.kMPerDay < 1 ? 3 : 1)} m/d`)}</text>`,
    );
  }
  return `<g class="map-zones">\n${shapes.join('\n')}\n${labels.join('\n')}\n</g>\n`;
}

/**
 * A label on each line (its id, along the line at mid-chainage), thinned where crowded: the lines
 * that lose most per km are labelled first, and a label that would overlap one already placed is left out.
 */
function lineLabels(result: ScreenResult, view: MapView): string {
  const order = result.lines.map((_, i) => i).sort((a, b) => (lineLossPerKm(result, b) ?? -Infinity) - (lineLossPerKm(result, a) ?? -Infinity) || a - b);
  const placed: [number, number, number, number][] = [];
  const labels: string[] = [];
  for (const i of order) {
    const parts = result.geometries[i].parts;
    const part = parts.reduce((longest, candidate) => (candidate.length > longest.length ? candidate : longest), parts[0]);
    if (!part || part.length < 4) continue;
    // the midpoint by chainage of the longest part, and the direction of the segment there
    let total = 0;
    for (let v = 2; v < part.length; v += 2) total += Math.hypot(part[v] - part[v - 2], part[v + 1] - part[v - 1]);
    let run = 0, v = 2;
    for (; v < part.length - 2; v += 2) {
      const step = Math.hypot(part[v] - part[v - 2], part[v + 1] - part[v - 1]);
      if (run + step >= total / 2) break;
      run += step;
    }
    const x = (tenthX(view, part[v - 2]) + tenthX(view, part[v])) / 20, y = (tenthY(view, part[v - 1]) + tenthY(view, part[v + 1])) / 20;
    let angle = (Math.atan2(tenthY(view, part[v + 1]) - tenthY(view, part[v - 1]), tenthX(view, part[v]) - tenthX(view, part[v - 2])) * 180) / Math.PI;
    // text reads left to right
    if (angle > 90) angle -= 180;
    if (angle < -90) angle += 180;
    const text = result.lines[i].id;
    const half = (text.length * 6.5) / 2 + 3;
    const box: [number, number, number, number] = [x - half, y - half, x + half, y + half];
    if (placed.some((b) => b[0] < box[2] && box[0] < b[2] && b[1] < box[3] && box[1] < b[3])) continue;
    placed.push(box);
    labels.push(`<text class="map-line-label" x="${Math.round(x * 10) / 10}" y="${Math.round(y * 10) / 10}" transform="rotate(${Math.round(angle)} ${Math.round(x * 10) / 10} ${Math.round(y * 10) / 10})" dy="-4">${escapeHtml(text)}</text>`);
  }
  return `<g class="map-line-labels">\n${labels.join('\n')}\n</g>\n`;
}

export function renderDistrictMap(result: ScreenResult, options: MapOptions = {}): DistrictMap {
  const drawing = districtMapPieces(result, options);
  let svg = '';
  for (const piece of drawing.svg) svg += piece;
  return { svg, key: drawing.key };
}

/**
 * The district map's SVG a few hundred shapes at a time, each piece drawn only when asked for (the
 * report's writer takes them in turn), and its key: the same text as renderDistrictMap.
 */
export function districtMapPieces(result: ScreenResult, options: MapOptions = {}): { svg: Generator<string>; key: string } {
  const widthPx = options.widthPx ?? 1000;
  const minStepPx = options.minStepPx ?? 1;
  const linesM = result.geometries.map((geometry) => geometry.parts);
  const view = fitView(boundsOf(linesM, result.strips, result.district?.grid ?? null), widthPx, PAD_PX, options.maxHeightPx ?? 1000, BAND_PX);
  const widths = lineWidths(result, view);
  return { svg: mapSvgPieces(result, view, linesM, widths, minStepPx), key: mapKey(result, widths) };
}

function* mapSvgPieces(result: ScreenResult, view: MapView, linesM: Float64Array[][], widths: LineWidths, minStepPx: number): Generator<string> {
  // no <title> per strip: the page's script shows the strip's row of the table on hover, which
  // keeps a 10,000-strip map from carrying every figure twice
  const drawStrip = (k: number) => {
    const strip = result.strips[k];
    return `<path class="strip-shape risk-${stripClass(strip)}" data-strip-id="${escapeHtml(strip.stripId)}" d="${pathData(view, strip.strip.ringM, minStepPx, true)}"/>`;
  };
  const drawLine = (i: number) => {
    const line = result.lines[i];
    const lossPerKm = lineLossPerKm(result, i);
    const d = linesM[i].map((part) => pathData(view, part, minStepPx, false)).join('');
    const figure = result.lineFigures[i];
    const per = figure.method === 'district' ? 'per km (district solve)' : 'per km paired (strips)';
    const title = `${line.id}${line.name ? ` ${line.name}` : ''} (${line.kind}): net loss ${formatFixed(figure.netLossM3PerDay, 1)} m³/d, ` +
      `${lossPerKm === null ? 'not known' : `${formatFixed(lossPerKm, 1)} m³/d ${per}`}` +
      (figure.method === 'district' ? `; strips alone ${formatFixed(figure.stripNetLossM3PerDay, 1)} m³/d` : '');
    return `<path class="map-${line.kind}" stroke-width="${Math.round(lineWidthPx(lossPerKm, widths) * 10) / 10}" d="${d}"><title>${escapeHtml(title)}</title></path>`;
  };
  const indices = result.lines.map((_, i) => i);
  // drains under canals, and among canals the widest on top
  const drains = indices.filter((i) => result.lines[i].kind === 'drain');
  const canals = indices
    .filter((i) => result.lines[i].kind === 'canal')
    .sort((a, b) => (lineLossPerKm(result, a) ?? 0) - (lineLossPerKm(result, b) ?? 0) || a - b);

  yield (
    `<svg xmlns="http://www.w3.org/2000/svg" class="district-map" viewBox="0 0 ${view.widthPx} ${view.heightPx}" ` +
    `width="${view.widthPx}" height="${view.heightPx}" role="img" aria-label="Map of strips by risk class and lines by loss per km, grid north up">` +
    `<defs>${stripPatternDefs()}</defs>` +
    `<rect class="map-frame" x="0.5" y="0.5" width="${view.widthPx - 1}" height="${view.heightPx - 1}"/>\n`
  );
  yield depthRaster(result, view);
  yield zoneLayer(result, view, minStepPx);
  yield `<g class="map-strips${result.district ? ' over-raster' : ''}">\n`;
  yield* joinedInPieces(result.strips.length, drawStrip);
  yield '\n</g>\n';
  const unpaired = unpairedPathData(result, view, minStepPx);
  if (unpaired) yield `<path class="map-unpaired" stroke-width="${Math.round(widths.unpairedPx * 10) / 10}" d="${unpaired}"><title>unpaired reaches: neither side faces a partner line</title></path>\n`;
  yield '<g class="map-lines">\n';
  yield* joinedInPieces(drains.length, (k) => drawLine(drains[k]));
  yield '\n';
  yield* joinedInPieces(canals.length, (k) => drawLine(canals[k]));
  yield '\n</g>\n';
  yield lineLabels(result, view);
  yield `${scaleBar(view)}${northArrow(view)}</svg>`;
}
