// The end-of-run summary printed to stdout: district totals, the top strips and the caution.
import { bedsText, bedsUsed } from '../screening/beds.js';
import { wellsText, type WellsOutcome } from './wells-tables.js';
import { spreadText } from './spread-tables.js';
import type { SpreadResult } from '../screening/spread.js';
import type { ScreenResult } from '../screening/screen.js';
import { formatFixed } from './format.js';
import { rankedLines } from './layers.js';
import { CAUTION, NET_SEEPAGE_NAME, netSeepageText, netSeepageTotals, type NetSeepage } from './run-record.js';

export function summaryText(result: ScreenResult, top = 10, skipped = 0, wells?: WellsOutcome, spread?: SpreadResult): string {
  const { totals, counts } = result;
  const lines: string[] = [];
  lines.push(`doab screen: ${counts.lines} lines, ${counts.stations} stations, ${counts.strips} strips (work CRS ${result.crs.name})`);
  lines.push(bedsText(bedsUsed(result.lines)));
  const district = result.district;
  const seepage = netSeepageTotals(result);
  const net = (figure: NetSeepage) =>
    netSeepageText(figure) + (figure.netM3PerDay < 0 ? ' (negative: the lines take in more than they lose)' : '');
  if (district) {
    const b = district.balance;
    lines.push(`District solve (2D, ${district.cellM} m cells, ${district.grid.columns} x ${district.grid.rows}; ${district.status})`);
    lines.push(`${NET_SEEPAGE_NAME} (district solve): ${net(seepage.main)}`);
    lines.push(
      `Water balance of the district solve, cell by cell (a check of the solve): recharge ${formatFixed(b.rechargeM3PerDay, 0)} + from losing line cells ${formatFixed(b.lineLossM3PerDay, 0)} - to gaining line cells ${formatFixed(b.lineGainM3PerDay, 0)} ` +
        (b.edgeInM3PerDay > 0 || b.edgeOutM3PerDay > 0
          ? `+ in across the outer edge ${formatFixed(b.edgeInM3PerDay, 0)} - out across it ${formatFixed(b.edgeOutM3PerDay, 0)} = ${b.residualM3PerDay.toPrecision(2)} m3/d (edge heads where zones give one; no flow elsewhere)`
          : `= ${b.residualM3PerDay.toPrecision(2)} m3/d (no flow across the aquifer's outer edge: no zone gives an edge head)`),
    );
    lines.push(
      `Area with water table < ${result.settings.risk.waterloggedDepthM} m below ground (district solve, banks left out): ${formatFixed(totals.riskAreaHa, 1)} ha; ` +
        `by risk class: ${Object.entries(district.areaByRiskHa).map(([risk, ha]) => `${risk} ${formatFixed(ha, 1)} ha`).join(', ')}`,
    );
    if (seepage.stripsAlone) {
      lines.push(
        `Strips alone (the quicker method, for comparison): net seepage ${net(seepage.stripsAlone)}, over ` +
          `${formatFixed(totals.solvedSidesM / 1000, 1)} of ${formatFixed(totals.sidesM / 1000, 1)} km of line sides solved; ${formatFixed(totals.stripRiskAreaHa, 1)} ha shallow in strips`,
      );
    }
  } else {
    lines.push(`${NET_SEEPAGE_NAME} (strips alone; no district solve): ${net(seepage.main)}`);
    lines.push(
      `Paired ${formatFixed(totals.pairedM / 1000, 1)} km, unpaired ${formatFixed(totals.unpairedM / 1000, 1)} km; ` +
        `area with water table < ${result.settings.risk.waterloggedDepthM} m below ground: ${formatFixed(totals.riskAreaHa, 1)} ha`,
    );
    lines.push(
      `Line sides solved: ${formatFixed(totals.solvedSidesM / 1000, 1)} km of ${formatFixed(totals.sidesM / 1000, 1)} km; ` +
        'unpaired and unsolved sides are not counted, so both parts are lower bounds',
    );
  }
  const ranked = rankedLines(result).filter((i) => result.lineFigures[i].netLossM3PerDay > 0).slice(0, 5);
  if (ranked.length > 0) {
    lines.push(
      `Lines that lose most per km (${result.district ? 'district solve' : 'strips alone, each over its solved sides only: share of its sides in brackets'}; all in lines.csv): ` +
        ranked
          .map((i) => `${result.lines[i].id} ${formatFixed(result.lineFigures[i].netLossM3PerDayKm, 0)} m3/d/km${result.district ? '' : ` (${formatFixed(result.lineFigures[i].coversShare * 100, 0)}%)`}`)
          .join(', '),
    );
  }
  if (wells) lines.push(...wellsText(wells).split('\n'));
  if (spread) lines.push(...spreadText(spread).split('\n'));
  const byRisk = totals.stripsByRisk;
  lines.push(`Strips by risk: ponded ${byRisk.ponded}, waterlogged ${byRisk.waterlogged}, potential ${byRisk.potential}, safe ${byRisk.safe}, unsolved ${byRisk.unsolved}`);
  const header = ['rank', 'strip', 'loss m3/d/km', 'loss m3/d', 'min depth m', 'risk', 'flags'];
  const rows = result.strips.slice(0, top).map((strip, i) => [
    String(i + 1),
    strip.stripId,
    formatFixed(strip.lossM3PerDayKm, 1),
    formatFixed(strip.lossM3PerDay, 1),
    formatFixed(strip.minDepthM, 2),
    strip.risk ?? 'unsolved',
    strip.flags.join(';'),
  ]);
  const widths = header.map((title, c) => Math.max(title.length, ...rows.map((row) => row[c].length)));
  const format = (row: string[]) => row.map((cell, c) => (c >= 2 && c <= 4 ? cell.padStart(widths[c]) : cell.padEnd(widths[c]))).join('  ').trimEnd();
  if (rows.length === 0) {
    lines.push('', `No strips: no two lines face each other within ${result.settings.maxGapM} m and ${result.settings.maxAngleDeg} degrees of parallel; canals.geojson gives each line's unpaired reasons.`);
  } else {
    lines.push('', `Top ${rows.length} strips (ranked by ${result.settings.rankBy === 'loss' ? 'loss per km' : 'smallest depth'}):`);
    lines.push(format(header), ...rows.map(format));
  }
  for (const warning of result.warnings) lines.push(`warning: ${warning}`);
  if (skipped > 0) lines.push(`${skipped} invalid feature${skipped === 1 ? ' was' : 's were'} skipped (--skip-invalid); run.json lists them`);
  lines.push('', `CAUTION: ${CAUTION}`);
  return `${lines.join('\n')}\n`;
}
