import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { formatGrouped } from '../../src/output/format.js';
import { netSeepageTotals } from '../../src/output/run-record.js';
import { FACING_PAIRED } from '../../src/geometry/index.js';
import { linesTable, RANKING_COLUMNS, rankingTable, stripProperties } from '../../src/output/layers.js';
import { escapeHtml } from '../../src/report/escape.js';
import { renderReport, type ReportMeta } from '../../src/report/report.js';
import type { ScreenResult } from '../../src/screening/screen.js';
import { DEMO_AQUIFER, DEMO_CANALS, HOSTILE_ID, HOSTILE_NAME, hostileDemoCopy, screenFiles } from './demo-result.js';

function count(text: string, pattern: RegExp): number {
  return [...text.matchAll(pattern)].length;
}

/** Text of each cell of each table row, entities decoded the way a browser decodes them. */
function tableRows(html: string): string[][] {
  const decode = (cell: string) =>
    cell.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  return [...html.matchAll(/<tr class="rank-row">(.*?)<\/tr>/g)].map((m) => m[1].split('<td>').slice(1).map(decode));
}

describe('renderReport on the demo district', () => {
  let result: ScreenResult;
  let meta: ReportMeta;
  let html: string;
  beforeAll(async () => {
    ({ result, meta } = await screenFiles(DEMO_CANALS, DEMO_AQUIFER));
    html = renderReport(result, meta);
  });

  it('draws every strip once on the map and lists it once in the table', () => {
    // the invented demo has strips enough to fill a map (a floor, not the count the code made)
    expect(result.strips.length).toBeGreaterThan(10);
    expect(count(html, /class="strip-shape /g)).toBe(result.strips.length);
    expect(count(html, /<tr class="rank-row">/g)).toBe(result.strips.length);
    const mapIds = [...html.matchAll(/class="strip-shape [^"]*" data-strip-id="([^"]*)"/g)].map((m) => m[1]).sort();
    expect(mapIds).toEqual(result.strips.map((s) => escapeHtml(s.stripId)).sort());
  });

  it('gives the table the rows and columns of ranking.csv, in rank order, headed in words with units and rounded for reading', () => {
    const csv = rankingTable(result).trimEnd().split('\n');
    const columns = csv[0].split(',');
    const heads = [...html.matchAll(/<th scope="col" data-column="([^"]+)" data-kind="(\w+)" data-words="([^"]*)" data-unit="([^"]*)"[^>]*><button type="button">([^<]*)<\/button>/g)];
    expect(heads.map((m) => m[1])).toEqual(columns);
    for (const [, column, , words, unit, text] of heads) {
      // words a reader uses, never the CSV's field name, and the unit where the column has one
      expect(text, column).not.toMatch(/_/);
      expect(text).toBe(unit ? `${words} (${unit})` : words);
      if (/_(m|m3_d|m3_d_km|m3_yr|ha)$/.test(column)) expect(unit, column).not.toBe('');
    }
    expect(heads.find((m) => m[1] === 'loss_m3_d_km')![5]).toBe('Loss per km (m³/d per km)');
    const rows = tableRows(html);
    expect(rows).toHaveLength(csv.length - 1);
    let rounded = 0;
    rows.forEach((cells, i) => {
      // the demo has no text that CSV would quote, so a plain split is the CSV row
      const fields = csv[i + 1].split(',');
      cells.forEach((cell, c) => {
        const [, column, kind, , unit] = heads[c];
        if (fields[c] === '') return expect(cell, `${column} of row ${i + 1}`).toBe('');
        if (kind !== 'num') return expect(cell, `${column} of row ${i + 1}`).toBe(fields[c]);
        const shown = cell.replace(/[\s\u2009%]/g, '');
        const decimals = shown.includes('.') ? shown.split('.')[1].length : 0;
        expect(decimals, `${column}: ${cell}`).toBeLessThanOrEqual(2);
        const factor = unit === 'km' && column.endsWith('_m') ? 1 / 1000 : unit === '%' ? 100 : 1;
        const full = Number(fields[c]) * factor;
        expect(Math.abs(Number(shown) - full), `${column} of row ${i + 1}: ${cell} for ${fields[c]}`).toBeLessThanOrEqual(0.5 * 10 ** -decimals * (1 + 1e-9));
        if (shown !== fields[c]) rounded++;
      });
    });
    // numbers are rounded for reading; the CSV keeps its six digits
    expect(rounded).toBeGreaterThan(0);
  });

  it('names the risk classes alike in the legend, the table, the counts and ranking.csv', () => {
    const csvClasses = new Set(rankingTable(result).trimEnd().split('\n').slice(1).map((line) => line.split(',')[RANKING_COLUMNS.indexOf('risk')]));
    const riskColumn = RANKING_COLUMNS.indexOf('risk');
    const tableClasses = new Set(tableRows(html).map((cells) => cells[riskColumn]));
    expect(tableClasses).toEqual(csvClasses);
    const key = /<div class="map-key">(.*?)<\/ul>/s.exec(html)![1];
    const legend = [...key.matchAll(/<span><b>([^<]+)<\/b> \(/g)].map((m) => m[1]);
    const counts = [...html.matchAll(/<\/svg><\/td><th scope="row">([^<]+)<\/th>/g)].map((m) => m[1]);
    // every class has the one name ranking.csv gives it (and the classes the demo has are among them)
    expect(legend).toEqual(['ponded', 'waterlogged', 'potential', 'safe', 'unsolved']);
    expect(counts).toEqual(legend);
    for (const name of csvClasses) expect(legend).toContain(name);
  });

  it('lists every line in the order of lines.csv, with headings in words and units', () => {
    const csv = linesTable(result).trimEnd().split('\n').slice(1);
    const section = /<section id="lines">(.*?)<\/section>/s.exec(html)?.[1] ?? '';
    const headings = [...section.matchAll(/<th scope="col">([^<]*)<\/th>/g)].map((m) => m[1]);
    expect(headings).toContain('Net loss per km (m³/d per km)');
    expect(headings.every((h) => !/_/.test(h))).toBe(true);
    const ids = [...section.matchAll(/<tr><td>\d+<td>([^<]*)/g)].map((m) => m[1]);
    expect(ids).toEqual(csv.map((line) => line.split(',')[1]));
    expect(ids).toHaveLength(result.lines.length);
  });

  it('draws every zone polygon with its id and K, and labels lines by id without repeating one', () => {
    expect(count(html, /<path class="map-zone"/g)).toBe(result.zoneIndex.polygons.count);
    for (const zone of result.zones) expect(html).toContain(`<title>zone ${escapeHtml(zone.id)}: K `);
    const labels = [...html.matchAll(/<text class="map-line-label"[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
    expect(labels.length).toBeGreaterThan(result.lines.length / 2);
    expect(new Set(labels).size).toBe(labels.length);
    for (const label of labels) expect(result.lines.map((line) => escapeHtml(line.id))).toContain(label);
  });

  it('embeds a depth image that an independent reader (GDAL\'s PNG driver) opens at the size the map draws it from', () => {
    const match = /<image class="map-depth"[^>]* href="data:image\/png;base64,([^"]+)"/.exec(html);
    expect(match).not.toBeNull();
    if (spawnSync('gdalinfo', ['--version']).status !== 0) {
      expect(process.env.CI, 'gdalinfo (Debian gdal-bin) is missing').toBeFalsy();
      return;
    }
    const file = join(mkdtempSync(join(tmpdir(), 'doab-png-')), 'depth.png');
    writeFileSync(file, Buffer.from(match![1], 'base64'));
    const info = spawnSync('gdalinfo', [file], { encoding: 'utf8' });
    expect(info.status, info.stderr).toBe(0);
    expect(info.stdout).toMatch(/Driver: PNG/);
    expect(info.stdout).toMatch(/Band 4 Block=\d+x1 Type=Byte, ColorInterp=Alpha/);
  });

  it('loads nothing from anywhere: no URL but the SVG namespace, no external reference', () => {
    const urls = [...html.matchAll(/https?:\/\/[^\s"'<>)]*/g)].map((m) => m[0]);
    expect(urls.length).toBeGreaterThan(0);
    expect(new Set(urls)).toEqual(new Set(['http://www.w3.org/2000/svg']));
    // the one href is the depth raster's inline PNG, which the CSP's img-src data: allows
    expect(html).not.toMatch(/<link\b|<img\b|<iframe\b|@import|src=|href=(?!"data:image\/png;base64,[A-Za-z0-9+/=]+")/i);
    expect(count(html, /href=/g)).toBe(1);
    expect(html).toMatch(/<meta http-equiv="Content-Security-Policy" content="default-src 'none';/);
    expect(count(html, /<script\b/g)).toBe(1);
  });

  it('labels the top strip\'s cross-section with its peak_water_table_m', () => {
    const labels = [...html.matchAll(/<text class="peak-label" data-strip-id="([^"]*)"[^>]*>([^<]*)<\/text>/g)];
    expect(labels).toHaveLength(10);
    labels.forEach((label, i) => {
      const strip = result.strips[i];
      expect(label[1]).toBe(escapeHtml(strip.stripId));
      const peak = stripProperties(strip).peak_water_table_m as number;
      expect(label[2]).toBe(`${peak.toFixed(2)} m`);
    });
  });

  it('draws as many cross-sections as asked', () => {
    const cards = (text: string) => count(text, /<figure class="profile-card"/g);
    expect(cards(renderReport(result, { ...meta, topProfiles: 3 }))).toBe(3);
    expect(cards(renderReport(result, { ...meta, topProfiles: 0 }))).toBe(0);
    expect(cards(renderReport(result, { ...meta, topProfiles: 500 }))).toBe(result.strips.length);
    expect(() => renderReport(result, { ...meta, topProfiles: -1 })).toThrow(/topProfiles/);
    expect(() => renderReport(result, { ...meta, topProfiles: 2.5 })).toThrow(/topProfiles/);
  });

  it('shows the first rows only, with a button for all, past rowsShown', () => {
    expect(html).not.toContain('is-capped"');
    expect(html).not.toContain('id="show-all-rows"');
    const capped = renderReport(result, { ...meta, rowsShown: 10 });
    expect(capped).toContain('<table id="ranking-table" class="ranking is-capped">');
    expect(capped).toContain('#ranking-table.is-capped tbody tr:nth-child(n+11){display:none}');
    const rows = result.strips.length;
    expect(capped).toContain(`Showing the first 10 of ${rows} rows in the current order. <button type="button" id="show-all-rows">Show all ${rows} rows</button>`);
    // every row is still in the page
    expect(count(capped, /<tr class="rank-row">/g)).toBe(rows);
    expect(() => renderReport(result, { ...meta, rowsShown: 0 })).toThrow(/rowsShown/);
  });

  it('states the totals, the classes, the settings, the inputs and the cautions', () => {
    const byRisk = result.totals.stripsByRisk;
    expect(Object.values(byRisk).reduce((a, b) => a + b, 0)).toBe(result.strips.length);
    // the strips alone, grouped with a thin space, shown for comparison as the quicker method
    const stripsAlone = netSeepageTotals(result).stripsAlone!;
    expect(html).toContain(`${formatGrouped(stripsAlone.netM3PerDay, stripsAlone.decimals)} m³/d</span><span class="what">net seepage by the strips alone (the quicker method, for comparison): lost by losing lines ${formatGrouped(stripsAlone.lostByLosingLinesM3PerDay, stripsAlone.decimals)} − `);
    // the totals a planner reads come from the district solve, whose lines take in, net, what falls
    // on the aquifer as recharge and enters across its held outer edge, less what leaves there (mass balance [derived])
    const district = result.district!;
    expect(result.totals.method).toBe('district');
    const b = district.balance;
    expect(b.edgeOutM3PerDay).toBeGreaterThan(0);
    expect(result.totals.netM3PerDay / -(b.rechargeM3PerDay + b.edgeInM3PerDay - b.edgeOutM3PerDay)).toBeCloseTo(1, 6);
    const main = netSeepageTotals(result).main;
    expect(html).toContain(`${formatGrouped(main.netM3PerYear, main.yearDecimals)} m³/yr`);
    expect(html).toContain('Net seepage from the lines into the aquifer (district solve)');
    expect(html).toContain('<image class="map-depth"');
    expect(html).toContain(`${(result.totals.pairedM / 1000).toFixed(1)} km</span><span class="what">line length with at least one side paired`);
    expect(html).toContain(`${(result.totals.unpairedM / 1000).toFixed(1)} km</span><span class="what">line length with neither side paired`);
    for (const kind of ['ponded', 'waterlogged', 'potential', 'safe'] as const) {
      expect(html).toContain(`<th scope="row">${kind}</th><td class="num">${byRisk[kind]}</td>`);
    }
    expect(html).toContain('<th scope="row">stepM</th><td>100</td>');
    expect(html).toContain('<th scope="row">risk.waterloggedDepthM</th><td>2</td>');
    expect(html).toContain(meta.inputs[0].sha256);
    // when the run started, as run.json records it, in the header and the run's facts
    const dated = renderReport({ ...result, settings: { ...result.settings, title: 'Invented Test District' } }, { ...meta, startedAt: '2026-12-02T06:00:00.000Z' });
    expect(dated).toContain('<h1>Invented Test District: doab screening report</h1><p class="run-line">run 2026-12-02 06:00:00 UTC; ');
    expect(dated).toContain('<th scope="row">run started</th><td>2026-12-02T06:00:00.000Z (as run.json records it)</td>');
    // how the inputs were read: where they were written, the field mapping, units and defaults, and that outputs are metric
    expect(html).toContain('<td>lon/lat, WGS 84 (EPSG:4326), as RFC 7946 asks</td>');
    expect(html).toContain('<th scope="row">zones fields</th><td>id: id, k: k_m_d, base: base_m, ground: ground_m, recharge: recharge_mm_yr, edgeHead: edge_head_m, kLow: k_low_m_d, kHigh: k_high_m_d, kLogSd: k_log_sd</td>');
    expect(html).toMatch(/K in m\/d, recharge in mm\/yr, elevations in m<\/td>|K in m\/d, recharge in mm\/yr, elevations in m; every output is in metres and days/);
    expect(html).toContain('&#39;out dir&#39;');
    expect(html).toMatch(/Not a design\.<\/b> Screening estimate only/);
    expect(html).toMatch(/Dupuit-Forchheimer: flow is horizontal/);
    expect(html).toMatch(/Confirm every finding in the field/);
    expect(html).toMatch(/defer to local codes/);
  });

  it('marks each run of stations with neither side paired', () => {
    const { stations, facings } = result;
    let runs = 0;
    for (let s = 0; s < stations.count; s++) {
      const unpaired = (k: number) => facings.reason[2 * k] !== FACING_PAIRED && facings.reason[2 * k + 1] !== FACING_PAIRED;
      const continues = s > 0 && unpaired(s - 1) && stations.line[s - 1] === stations.line[s] && stations.part[s - 1] === stations.part[s];
      if (unpaired(s) && !continues) runs++;
    }
    expect(runs).toBeGreaterThan(0);
    const overlay = html.match(/<path class="map-unpaired" stroke-width="[\d.]+" d="([^"]*)"/);
    expect(overlay).not.toBeNull();
    expect(count(overlay![1], /M/g)).toBe(runs);
  });

  it('draws drains dashed and canals solid, wider where they lose more per km', () => {
    expect(count(html, /<path class="map-drain"/g)).toBe(result.lines.filter((l) => l.kind === 'drain').length);
    expect(count(html, /<path class="map-canal"/g)).toBe(result.lines.filter((l) => l.kind === 'canal').length);
    const widths = [...html.matchAll(/<path class="map-canal" stroke-width="([\d.]+)"[^>]*><title>([^<]*)<\/title>/g)].map((m) => ({
      width: Number(m[1]),
      perKm: Number(/([-\d.]+) m³\/d per km paired/.exec(m[2])?.[1] ?? 0),
    }));
    const sorted = [...widths].sort((a, b) => a.perKm - b.perKm);
    for (let i = 1; i < sorted.length; i++) expect(sorted[i].width).toBeGreaterThanOrEqual(sorted[i - 1].width);
    expect(sorted[sorted.length - 1].width).toBe(4.5);
  });

  it('has a scale bar of a round length and a grid north arrow', () => {
    const scale = html.match(/<g class="map-scale" aria-label="scale bar ([^"]+)">/);
    expect(scale?.[1]).toMatch(/^(1|2|5)(0*) (m|km)$/);
    expect(html).toMatch(/<g class="map-north"[^>]*>.*>grid north<\/text>/);
  });

  it('keeps the drawing coarse enough to stay small: one decimal of a pixel', () => {
    const paths = [...html.matchAll(/ d="([^"]*)"/g)].map((m) => m[1]).join(' ');
    expect(paths).not.toMatch(/\d\.\d\d/);
    expect(Buffer.byteLength(html)).toBeLessThan(200_000);
  });

  it('gives the same bytes for the same result', () => {
    expect(renderReport(result, meta)).toBe(html);
  });
});

describe('renderReport on hostile text', () => {
  let html: string;
  let result: ScreenResult;
  beforeAll(async () => {
    const copy = hostileDemoCopy();
    // escaping needs no district solve
    const screened = await screenFiles(copy.canals, copy.aquifer, { stripsOnly: true });
    result = screened.result;
    html = renderReport(result, { ...screened.meta, commandLine: ['doab', 'screen', '--canals', `"><script>alert(2)</script>`] });
  });

  it('shows a line named <script> as text', () => {
    expect(result.lines.some((line) => line.name === HOSTILE_NAME)).toBe(true);
    expect(html).not.toMatch(/<script>alert/);
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('&lt;script&gt;alert(2)&lt;/script&gt;');
    expect(count(html, /<script\b/g)).toBe(1);
  });

  it('escapes an id with & " \' < > everywhere, attributes included', () => {
    const escaped = 'C-01&amp;&quot;&#39;&lt;&gt;';
    const strips = result.strips.filter((s) => s.lineAId === HOSTILE_ID || s.lineBId === HOSTILE_ID);
    expect(strips.length).toBeGreaterThan(0);
    expect(html).not.toContain(HOSTILE_ID);
    expect(html).toContain(`data-strip-id="${escapeHtml(strips[0].stripId)}"`);
    expect(html).toContain(`<td>${escaped}<td>`);
    // every attribute still parses: quotes inside values never end one early
    for (const m of html.matchAll(/<path class="strip-shape [^>]*>/g)) expect(m[0]).toMatch(/^<path class="[^"]*" data-strip-id="[^"]*" d="[^"]*"\/>$/);
  });
});

describe('escapeHtml', () => {
  it('escapes the five characters that matter in text and in quoted attributes', () => {
    expect(escapeHtml(`a&b<c>d"e'f`)).toBe('a&amp;b&lt;c&gt;d&quot;e&#39;f');
    expect(escapeHtml('&amp;')).toBe('&amp;amp;');
    expect(escapeHtml(12.5)).toBe('12.5');
    expect(escapeHtml(null)).toBe('null');
  });
});
