// The wells' figures as a table (wells.csv) and a point layer (wells.geojson): each well's observed
// and computed water table, the residual and where the computed figure came from.
import { stringify } from 'csv-stringify/sync';
import type { ConductivityFit } from '../screening/k-fit.js';
import type { WellComparison, WellFigure } from '../screening/wells.js';
import { roundNumber } from './format.js';
import { featureCollection, neutraliseCell, type LayerFormat } from './layers.js';

/** What a run learned from the wells: the comparison, the suggested multipliers, and whether they were applied. */
export interface WellsOutcome {
  comparison: WellComparison;
  fit: ConductivityFit;
  /** True when the run's zones carry the fitted multipliers (--apply-k-fit). */
  applied: boolean;
}

export const WELL_COLUMNS = ['well_id', 'zone_id', 'date', 'observed_m', 'computed_m', 'residual_m', 'method', 'note'] as const;

function wellRow(figure: WellFigure): Record<(typeof WELL_COLUMNS)[number], unknown> {
  return {
    well_id: figure.well.id,
    zone_id: figure.zoneId,
    date: figure.well.date,
    observed_m: roundNumber(figure.well.observedM),
    computed_m: roundNumber(figure.computedM),
    residual_m: roundNumber(figure.residualM),
    method: figure.method,
    note: figure.note,
  };
}

export function wellsTable(outcome: WellsOutcome): string {
  const rows = outcome.comparison.figures.map((figure) => {
    const row = wellRow(figure);
    return WELL_COLUMNS.map((column) => neutraliseCell(row[column] ?? ''));
  });
  return stringify([[...WELL_COLUMNS], ...rows], { record_delimiter: 'unix' });
}

const WELL_REAL_FIELDS: ReadonlySet<string> = new Set(['observed_m', 'computed_m', 'residual_m']);

export function wellsLayer(outcome: WellsOutcome, format: LayerFormat = 'collection'): Iterable<string> {
  return featureCollection(
    outcome.comparison.figures.map((figure) => ({
      type: 'Feature',
      properties: wellRow(figure),
      geometry: { type: 'Point', coordinates: [figure.well.lon, figure.well.lat] },
    })),
    format,
    WELL_REAL_FIELDS,
  );
}

/** The wells' part of run.json. */
export function wellsRecord(outcome: WellsOutcome, sha256: string | null) {
  const { comparison, fit } = outcome;
  const summary = (s: { count: number; meanErrorM: number; rmseM: number }) => ({ count: s.count, mean_error_m: roundNumber(s.meanErrorM), rmse_m: roundNumber(s.rmseM) });
  return {
    file: comparison.file,
    sha256,
    wells: comparison.figures.length,
    without_computed_figure: comparison.uncovered,
    all: summary(comparison.all),
    by_zone: comparison.byZone.map((zone) => ({ zone_id: zone.zoneId, ...summary(zone.summary) })),
    k_fit: {
      applied: outcome.applied,
      screened_with: fit.cellM === null ? 'strips' : `district solve at ${fit.cellM} m`,
      rmse_before_m: roundNumber(fit.rmseBeforeM),
      rmse_after_m: roundNumber(fit.rmseAfterM),
      screenings: fit.screenings,
      zones: fit.zones.map((zone) => ({ zone_id: zone.zoneId, multiplier: roundNumber(zone.multiplier), wells: zone.wells, at_bound: zone.atBound, fitted: zone.fitted })),
    },
  };
}

/** One or two lines for the terminal summary. */
export function wellsText(outcome: WellsOutcome): string {
  const { comparison, fit } = outcome;
  const f = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d) : '-');
  const fitted = fit.zones.filter((zone) => zone.fitted);
  const leftOut = fit.zones.filter((zone) => zone.wells > 0 && !zone.fitted).length;
  return (
    `Wells: ${comparison.all.count} of ${comparison.figures.length} compared${comparison.uncovered > 0 ? ` (${comparison.uncovered} with no computed water table: see wells.csv)` : ''}; ` +
    `mean error ${f(comparison.all.meanErrorM, 2)} m (computed less observed), RMSE ${f(comparison.all.rmseM, 2)} m\n` +
    `K multipliers that best fit the wells (${outcome.applied ? 'APPLIED to this run (--apply-k-fit)' : 'suggested, not applied; --apply-k-fit applies them'}; RMSE ${f(fit.rmseBeforeM, 2)} -> ${f(fit.rmseAfterM, 2)} m at the fit's resolution): ` +
    (fitted.length === 0 ? 'none (no well stands in a zone)' : fitted.map((zone) => `${zone.zoneId} x${f(zone.multiplier, 2)} (${zone.wells} wells${zone.atBound ? ', at its bound' : ''})`).join(', ')) +
    (leftOut > 0 ? `; ${leftOut} more zones with wells left at 1 (the fit takes the ${fitted.length} with most wells: each costs a screening a step)` : '')
  );
}
