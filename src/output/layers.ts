// Builds the text of every output layer from a screening result: GeoJSON per RFC 7946 (lon/lat,
// counter-clockwise outer rings, 7 decimals), the ranked CSV table and the run record. Pure: the
// CLI hands the texts to writeAllOrNothing. Same result in, same bytes out.
import { stringify } from 'csv-stringify/sync';
import { FACING_REASON_NAMES } from '../geometry/index.js';
import { SOLVE_STATUS_NAMES } from '../hydraulics/transect-solver.js';
import { m3PerDayToM3PerYear } from '../shared/units.js';
import type { StripSummary } from '../screening/aggregate.js';
import { NOT_PAIRED } from '../screening/solve-facings.js';
import type { ScreenResult } from '../screening/screen.js';
import { signedArea2 } from '../geometry/rings.js';
import { ITEMS_PER_PIECE, roundNumber } from './format.js';
import type { WorkCrs } from '../geometry/work-crs.js';

function roundDegrees(value: number): number {
  return Math.round(value * 1e7) / 1e7;
}

export function toLonLat(crs: WorkCrs, x: number, y: number): [number, number] {
  const [lon, lat] = crs.inverse([x, y]);
  return [roundDegrees(lon), roundDegrees(lat)];
}

export function ringToLonLat(crs: WorkCrs, ringM: Float64Array): [number, number][] {
  const ring: [number, number][] = [];
  for (let i = 0; i < ringM.length; i += 2) ring.push(toLonLat(crs, ringM[i], ringM[i + 1]));
  const first = ring[0], last = ring[ring.length - 1];
  if (first[0] !== last[0] || first[1] !== last[1]) ring.push([first[0], first[1]]);
  // RFC 7946 section 3.1.6: exterior rings are counter-clockwise
  if (signedArea2(Float64Array.from(ring.flat())) < 0) ring.reverse();
  return ring;
}

/** A FeatureCollection (RFC 7946), or a GeoJSON text sequence (RFC 8142: each record led by RS, ended by LF). */
export type LayerFormat = 'collection' | 'sequence';

/** Which properties are real numbers: every number (`'all'`), or those named. */
export type RealFields = 'all' | ReadonlySet<string>;

export interface LayerFeature {
  type: string;
  properties: Record<string, unknown>;
  geometry: object;
}

/** The properties of a feature as its JSON writes them, `"key":value,...` (see featureJson). */
function propertiesJson(properties: Record<string, unknown>, real: RealFields): string {
  const fields: string[] = [];
  for (const key of Object.keys(properties)) {
    const value = properties[key];
    const isReal = typeof value === 'number' && (real === 'all' || real.has(key));
    const text = isReal && Number.isInteger(value) && Math.abs(value as number) < 1e21 ? `${value}.0` : (JSON.stringify(value) ?? 'null');
    fields.push(`${JSON.stringify(key)}:${text}`);
  }
  return fields.join(',');
}

/**
 * A feature as JSON, with every real-valued property written with a decimal point (400 as 400.0):
 * JSON itself has one number type, and a reader that infers field types from the text (GDAL does)
 * would otherwise call a field Integer in one run and Real in the next.
 */
export function featureJson(feature: LayerFeature, real: RealFields): string {
  return `{"type":"Feature","properties":{${propertiesJson(feature.properties, real)}},"geometry":${JSON.stringify(feature.geometry)}}`;
}

/**
 * A feature's properties as a reader of the layer gets them back (NaN and Infinity as null, -0 as
 * 0): what the database writers store, so every writer gives the same attributes.
 */
export function propertiesAsWritten(properties: Record<string, unknown>, real: RealFields = 'all'): Record<string, unknown> {
  return JSON.parse(`{${propertiesJson(properties, real)}}`) as Record<string, unknown>;
}

// a piece's length in characters: small enough that a piece and the features it joins die young (a
// megabyte's worth of features outlived the young generation, and the old one grew by a layer's size
// at a million stations before a full collection took it back)
const PIECE_CHARS = 1 << 16;

/** The layer's text in pieces of about 64 KiB, one feature built at a time, so no layer is ever one string. */
export function* featureCollection(features: Iterable<LayerFeature>, format: LayerFormat, real: RealFields = 'all'): Generator<string> {
  let piece = format === 'sequence' ? '' : '{"type":"FeatureCollection","features":[';
  let first = true;
  for (const feature of features) {
    const json = featureJson(feature, real);
    piece += format === 'sequence' ? `\u001e${json}\n` : `${first ? '\n' : ',\n'}${json}`;
    first = false;
    if (piece.length > PIECE_CHARS) {
      yield piece;
      piece = '';
    }
  }
  if (format === 'collection') piece += first ? ']}\n' : '\n]}\n';
  yield piece;
}

/** A whole layer as one string, for small layers and tests. */
export function layerText(pieces: Iterable<string>): string {
  let text = '';
  for (const piece of pieces) text += piece;
  return text;
}

export function stripProperties(strip: StripSummary): Record<string, unknown> {
  return {
    strip_id: strip.stripId,
    line_a: strip.lineAId,
    line_b: strip.lineBId,
    length_m: roundNumber(strip.lengthM),
    chainage_a_from_m: roundNumber(strip.strip.chainageA[0]),
    chainage_a_to_m: roundNumber(strip.strip.chainageA[1]),
    chainage_b_from_m: roundNumber(strip.strip.chainageB[0]),
    chainage_b_to_m: roundNumber(strip.strip.chainageB[1]),
    spacing_m: roundNumber(strip.strip.spacingMeanM),
    spacing_min_m: roundNumber(strip.strip.spacingMinM),
    spacing_max_m: roundNumber(strip.strip.spacingMaxM),
    q_a_m2_d: roundNumber(strip.qAM2PerDay),
    q_b_m2_d: roundNumber(strip.qBM2PerDay),
    loss_a_m3_d: roundNumber(strip.lossAM3PerDay),
    loss_b_m3_d: roundNumber(strip.lossBM3PerDay),
    peak_water_table_m: roundNumber(strip.peakWaterTableM),
    peak_offset_m: roundNumber(strip.peakOffsetM),
    min_depth_m: roundNumber(strip.minDepthM),
    risk: strip.risk ?? 'unsolved',
    risk_area_ha: roundNumber(strip.riskAreaHa),
    dupuit_ratio_min: roundNumber(strip.dupuitRatioMin),
    // the district solve's figures inside the strip polygon (null when it did not run)
    district_min_depth_m: strip.district ? roundNumber(strip.district.minDepthM) : null,
    district_risk: strip.district ? (strip.district.risk ?? 'unsolved') : null,
    district_risk_area_ha: strip.district ? roundNumber(strip.district.shallowAreaHa) : null,
    district_loss_a_m3_d: strip.district ? roundNumber(strip.district.lossAM3PerDay) : null,
    district_loss_b_m3_d: strip.district ? roundNumber(strip.district.lossBM3PerDay) : null,
    district_loss_m3_d: strip.district ? roundNumber(strip.district.lossM3PerDay) : null,
    district_loss_m3_d_km: strip.district && strip.lengthM > 0 ? roundNumber(strip.district.lossM3PerDay / (strip.lengthM / 1000)) : null,
    flags: strip.flags.join(';'),
  };
}

export function stripsLayer(result: ScreenResult, format: LayerFormat = 'collection'): Iterable<string> {
  return featureCollection(stripFeatures(result), format);
}

// one feature at a time, built as the writer reaches it: a layer's features are never all held
function* stripFeatures(result: ScreenResult): Generator<LayerFeature> {
  for (const strip of result.strips) {
    yield { type: 'Feature', properties: stripProperties(strip), geometry: { type: 'Polygon', coordinates: [ringToLonLat(result.crs, strip.strip.ringM)] } };
  }
}

/** "left: no-partner 1200 m; right: not-parallel 300 m, outside-aquifer 100 m" */
function reasonsText(bySide: [Record<string, number>, Record<string, number>]): string {
  return (['left', 'right'] as const)
    .map((side, i) => {
      const reasons = FACING_REASON_NAMES.filter((name) => bySide[i][name] > 0).map((name) => `${name} ${roundNumber(bySide[i][name])} m`);
      return reasons.length > 0 ? `${side}: ${reasons.join(', ')}` : '';
    })
    .filter((text) => text !== '')
    .join('; ');
}

// doab's own numbers on the lines layer (the input's attributes go out as they came in)
const LINE_REAL_FIELDS: ReadonlySet<string> = new Set([
  'length_m', 'net_loss_m3_d', 'net_loss_m3_d_km', 'coarse_cell_diff_m3_d', 'strip_net_loss_m3_d',
  'strip_net_loss_m3_d_km', 'strip_diff_m3_d', 'paired_m', 'unpaired_m', 'solved_sides_m',
  'bed_resistance_used_d', 'wetted_perimeter_used_m', 'covers_share',
]);

/** A line's properties on the lines layer: its own attributes as they came in, then doab's figures. */
export function lineProperties(line: ScreenResult['lines'][number], summary: ScreenResult['lineSummaries'][number], figure: ScreenResult['lineFigures'][number]): Record<string, unknown> {
  // the input's attributes go out as they came in; the prototype-free copy keeps __proto__ a plain key
  const properties: Record<string, unknown> = Object.create(null);
  for (const key of Object.keys(line.properties)) properties[key] = line.properties[key];
  properties.length_m = roundNumber(summary.lengthM);
  // the figure a planner reads: the district solve's when it ran, with its method named
  properties.net_loss_m3_d = roundNumber(figure.netLossM3PerDay);
  properties.net_loss_m3_d_km = roundNumber(figure.netLossM3PerDayKm);
  properties.loss_method = figure.method;
  properties.covers_share = roundNumber(figure.coversShare);
  properties.coarse_cell_diff_m3_d = roundNumber(figure.coarseDiffM3PerDay);
  properties.strip_net_loss_m3_d = roundNumber(figure.stripNetLossM3PerDay);
  properties.strip_net_loss_m3_d_km = roundNumber(figure.stripNetLossM3PerDayKm);
  properties.strip_diff_m3_d = figure.method === 'district' ? roundNumber(figure.stripNetLossM3PerDay - figure.netLossM3PerDay) : null;
  properties.paired_m = roundNumber(summary.pairedM);
  properties.unpaired_m = roundNumber(summary.unpairedM);
  properties.solved_sides_m = roundNumber(summary.solvedSidesM);
  properties.unpaired_reasons = reasonsText(summary.unpairedBySideM);
  // the bed the solve used (from the line's attributes or the config's defaults): 0 d is a clean bed
  properties.bed_resistance_used_d = roundNumber(line.bedResistanceD);
  // 0 where the bed is clean and no perimeter was given (none is needed), so the field is Real in every run
  properties.wetted_perimeter_used_m = Number.isNaN(line.wettedPerimeterM) ? 0 : roundNumber(line.wettedPerimeterM);
  return properties;
}

/** The names of the fields doab adds to the lines layer, in their order (those of a line without attributes of its own). */
export function doabLineFields(result: ScreenResult): string[] {
  if (result.lines.length === 0) return [];
  return Object.keys(lineProperties({ ...result.lines[0], properties: {} }, result.lineSummaries[0], result.lineFigures[0]));
}

/** The lines layer's records as a reader gets them back, one per line in order. */
export function lineRows(result: ScreenResult): Record<string, unknown>[] {
  return result.lines.map((_, i) => lineRow(result, i));
}

/** Line i's record as a reader of the lines layer gets it back. */
export function lineRow(result: ScreenResult, i: number): Record<string, unknown> {
  return propertiesAsWritten(lineProperties(result.lines[i], result.lineSummaries[i], result.lineFigures[i]), LINE_REAL_FIELDS);
}

export function linesLayer(result: ScreenResult, format: LayerFormat = 'collection'): Iterable<string> {
  return featureCollection(lineFeatures(result), format, LINE_REAL_FIELDS);
}

function* lineFeatures(result: ScreenResult): Generator<LayerFeature> {
  for (let i = 0; i < result.lines.length; i++) {
    const line = result.lines[i];
    const parts = line.partsLonLat.map((part) => Array.from({ length: part.length / 2 }, (_, j) => [roundDegrees(part[2 * j]), roundDegrees(part[2 * j + 1])]));
    // one geometry type for the whole layer, so a GIS sees a line layer, not "any"
    yield { type: 'Feature', properties: lineProperties(line, result.lineSummaries[i], result.lineFigures[i]), geometry: { type: 'MultiLineString', coordinates: parts } };
  }
}

export function transectsLayer(result: ScreenResult, format: LayerFormat = 'collection'): Iterable<string> {
  return featureCollection(transectFeatures(result), format);
}

/** The transect sides the transects layer holds, in its order: every side with a partner. */
export function transectSides(result: ScreenResult): number[] {
  const sides: number[] = [];
  for (let i = 0; i < result.facings.count; i++) if (result.facings.partner[i] >= 0) sides.push(i);
  return sides;
}

/** The transects layer's records as a reader gets them back, one per side of `transectSides`. */
export function transectRows(result: ScreenResult): Record<string, unknown>[] {
  return transectSides(result).map((i) => transectRow(result, i));
}

/** Side i's record as a reader of the transects layer gets it back. */
export function transectRow(result: ScreenResult, i: number): Record<string, unknown> {
  return propertiesAsWritten(transectProperties(result, i));
}

// one feature at a time: a district can have millions of transects
function* transectFeatures(result: ScreenResult): Generator<LayerFeature> {
  const { stations, facings, crs } = result;
  for (let i = 0; i < facings.count; i++) {
    if (facings.partner[i] < 0) continue;
    const station = i >> 1;
    yield {
      type: 'Feature',
      properties: transectProperties(result, i),
      geometry: {
        type: 'LineString',
        coordinates: [toLonLat(crs, stations.x[station], stations.y[station]), toLonLat(crs, facings.endX[i], facings.endY[i])],
      },
    };
  }
}

function transectProperties(result: ScreenResult, i: number): Record<string, unknown> {
  const { stations, facings, lines } = result;
  const results = result.transects;
  if (!results) throw new Error('Unexpected transects layer of a run that did not keep its transects (settings.writeTransects).');
  const station = i >> 1;
  const status = results.status[i];
  return {
    line: lines[stations.line[station]].id,
    side: i % 2 === 0 ? 'left' : 'right',
    chainage_m: roundNumber(stations.chainageM[station]),
    station_length_m: roundNumber(stations.lengthM[station]),
    partner: lines[facings.partner[i]].id,
    partner_chainage_m: roundNumber(facings.partnerChainageM[i]),
    reason: FACING_REASON_NAMES[results.reason[i]],
    solve: status === NOT_PAIRED ? 'not-solved' : SOLVE_STATUS_NAMES[status],
    transect_length_m: roundNumber(facings.transectLengthM[i]),
    stage_m: roundNumber(results.ownStageM[i]),
    partner_stage_m: roundNumber(results.partnerStageM[i]),
    base_m: roundNumber(results.baseM[i]),
    seepage_m2_d: roundNumber(results.ownSeepageM2PerDay[i]),
    partner_seepage_m2_d: roundNumber(results.partnerSeepageM2PerDay[i]),
    recharge_m2_d: roundNumber(results.rechargeM2PerDay[i]),
    peak_water_table_m: roundNumber(results.peakWaterTableM[i]),
    peak_offset_m: roundNumber(results.peakOffsetM[i]),
    min_depth_m: roundNumber(results.minDepthM[i]),
    dupuit_ratio: roundNumber(results.dupuitRatio[i]),
  };
}

// OWASP, CSV Injection: a cell starting with =, +, -, @, tab or carriage return may run as a
// formula in a spreadsheet; prefix such text with a single quote. Numbers stay numbers.
export function neutraliseCell(value: unknown): unknown {
  if (typeof value === 'string' && /^[=+\-@\t\r]/.test(value)) return `'${value}`;
  return value;
}

export const RANKING_COLUMNS = [
  'rank', 'strip_id', 'line_a', 'line_b', 'length_m', 'spacing_m', 'loss_m3_d', 'loss_m3_d_km',
  'loss_m3_yr', 'losing_line', 'losing_share', 'min_depth_m', 'risk', 'risk_area_ha',
  'district_loss_m3_d_km', 'district_min_depth_m', 'flags',
] as const;

/**
 * The line that loses most of a strip's loss, and its share of it (0 to 1): a strip's loss can come
 * wholly from line b while line a gains, and it is the losing line that lining would save.
 */
export function losingLine(strip: StripSummary): { id: string | null; share: number } {
  const a = strip.lossAM3PerDay > 0 ? strip.lossAM3PerDay : 0;
  const b = strip.lossBM3PerDay > 0 ? strip.lossBM3PerDay : 0;
  if (!(a + b > 0)) return { id: null, share: NaN };
  return a >= b ? { id: strip.lineAId, share: a / (a + b) } : { id: strip.lineBId, share: b / (a + b) };
}

export function rankingRow(strip: StripSummary, rank: number): Record<(typeof RANKING_COLUMNS)[number], unknown> {
  return {
    rank,
    strip_id: strip.stripId,
    line_a: strip.lineAId,
    line_b: strip.lineBId,
    length_m: roundNumber(strip.lengthM),
    spacing_m: roundNumber(strip.strip.spacingMeanM),
    loss_m3_d: roundNumber(strip.lossM3PerDay),
    loss_m3_d_km: roundNumber(strip.lossM3PerDayKm),
    loss_m3_yr: roundNumber(m3PerDayToM3PerYear(strip.lossM3PerDay)),
    losing_line: losingLine(strip).id,
    losing_share: roundNumber(losingLine(strip).share),
    min_depth_m: roundNumber(strip.minDepthM),
    risk: strip.risk ?? 'unsolved',
    risk_area_ha: roundNumber(strip.riskAreaHa),
    // the district solve's figures for the same strip (empty when it did not run), to read beside the strip's own
    district_loss_m3_d_km: strip.district && strip.lengthM > 0 ? roundNumber(strip.district.lossM3PerDay / (strip.lengthM / 1000)) : null,
    district_min_depth_m: strip.district ? roundNumber(strip.district.minDepthM) : null,
    // where the water table reaches the ground the seepage out at the surface is not modelled: the loss is not reliable
    flags: [...strip.flags, ...(strip.risk === 'ponded' ? ['ponded-loss-unreliable'] : [])].join(';'),
  };
}

export function rankingTable(result: ScreenResult): string {
  return layerText(rankingTablePieces(result));
}

/** ranking.csv in pieces of some rows, each row built only when its piece is asked for. */
export function* rankingTablePieces(result: ScreenResult): Generator<string> {
  yield* csvPieces(RANKING_COLUMNS, result.strips.length, (i) => rankingRow(result.strips[i], i + 1));
}

/** A CSV table a few hundred rows at a time: the header, then row(i) for i < count, cells neutralised. */
function* csvPieces(columns: readonly string[], count: number, row: (i: number) => Record<string, unknown>): Generator<string> {
  yield stringify([[...columns]], { record_delimiter: 'unix' });
  for (let from = 0; from < count; from += ITEMS_PER_PIECE) {
    const rows: unknown[][] = [];
    for (let i = from; i < Math.min(count, from + ITEMS_PER_PIECE); i++) {
      const cells = row(i);
      rows.push(columns.map((column) => neutraliseCell(cells[column] ?? '')));
    }
    yield stringify(rows, { record_delimiter: 'unix' });
  }
}

export const LINE_TABLE_COLUMNS = [
  'rank', 'line_id', 'name', 'kind', 'length_m', 'net_loss_m3_d', 'net_loss_m3_d_km', 'net_loss_m3_yr', 'loss_method',
  'coarse_cell_diff_m3_d', 'strip_net_loss_m3_d', 'covers_share', 'solved_sides_m', 'paired_m', 'unpaired_m',
] as const;

/**
 * The lines in the order a planner lines them: by net loss per km (the district solve's figure
 * when it ran), largest first; lines without a figure last; ties by id.
 */
export function rankedLines(result: ScreenResult): number[] {
  const perKm = (i: number) => result.lineFigures[i].netLossM3PerDayKm;
  return result.lines
    .map((_, i) => i)
    .sort((a, b) => {
      const x = perKm(a), y = perKm(b);
      if (Number.isNaN(x) || Number.isNaN(y)) return Number(Number.isNaN(x)) - Number(Number.isNaN(y)) || (result.lines[a].id < result.lines[b].id ? -1 : 1);
      return y - x || (result.lines[a].id < result.lines[b].id ? -1 : result.lines[a].id > result.lines[b].id ? 1 : 0);
    });
}

/** One row of lines.csv: line i of the result at a rank. */
export function lineTableRow(result: ScreenResult, i: number, rank: number): Record<(typeof LINE_TABLE_COLUMNS)[number], unknown> {
  const line = result.lines[i];
  const figure = result.lineFigures[i];
  const summary = result.lineSummaries[i];
  return {
    rank: rank + 1,
    line_id: line.id,
    name: line.name ?? '',
    kind: line.kind,
    length_m: roundNumber(summary.lengthM),
    net_loss_m3_d: roundNumber(figure.netLossM3PerDay),
    net_loss_m3_d_km: roundNumber(figure.netLossM3PerDayKm),
    net_loss_m3_yr: roundNumber(m3PerDayToM3PerYear(figure.netLossM3PerDay)),
    loss_method: figure.method,
    coarse_cell_diff_m3_d: roundNumber(figure.coarseDiffM3PerDay),
    strip_net_loss_m3_d: roundNumber(figure.stripNetLossM3PerDay),
    covers_share: roundNumber(figure.coversShare),
    solved_sides_m: roundNumber(summary.solvedSidesM),
    paired_m: roundNumber(summary.pairedM),
    unpaired_m: roundNumber(summary.unpairedM),
  };
}

/** lines.csv: one row per line, ranked by net loss per km; the report's line table shows the same rows. */
export function linesTable(result: ScreenResult): string {
  return layerText(linesTablePieces(result));
}

/** lines.csv in pieces of some rows, ranked by loss per km. */
export function* linesTablePieces(result: ScreenResult): Generator<string> {
  const ranked = rankedLines(result);
  yield* csvPieces(LINE_TABLE_COLUMNS, ranked.length, (rank) => lineTableRow(result, ranked[rank], rank));
}
