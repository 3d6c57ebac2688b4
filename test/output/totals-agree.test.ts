// The one seepage total a planner reads: the terminal summary, run.json and the report give the
// same figures to the last printed digit, its parts add up as printed, and they are the lines'
// own figures (canals.geojson) rounded, for a run with the district solve and one without.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { formatGrouped } from '../../src/output/format.js';
import { freshDir, readJson, ROOT, runCliInProcess, type CliRun } from '../cli/run-cli.js';

const DEMO = join(ROOT, 'data-demo');
const NUMBER = '(-?\\d+(?:\\.\\d+)?)';
const SEEPAGE = `${NUMBER} m3/d \\(${NUMBER} m3/yr\\) = lost by losing lines ${NUMBER} - taken in by gaining lines ${NUMBER} m3/d`;

interface Printed {
  text: string[];
  values: number[];
}

/** The figures of the line that matches, as printed (text) and as numbers. */
function printed(stdout: string, pattern: RegExp): Printed | null {
  const match = pattern.exec(stdout);
  if (!match) return null;
  const text = match.slice(1, 5);
  return { text, values: text.map(Number) };
}

/** What run.json holds for a net seepage, in the order the summary prints them. */
function recorded(block: any): number[] {
  return [block.m3_d, block.m3_yr, block.lost_by_losing_lines_m3_d, block.taken_in_by_gaining_lines_m3_d];
}

function decimalsOf(text: string): number {
  return text.includes('.') ? text.split('.')[1].length : 0;
}

async function screen(extra: string[]): Promise<{ run: CliRun; out: string }> {
  const out = freshDir('totals');
  // a coarse cell: the figures must agree whatever they are, and the solve is quicker
  const run = await runCliInProcess(['screen', '--canals', join(DEMO, 'canals.geojson'), '--aquifer', join(DEMO, 'aquifer.geojson'), '--out', out, '--cell', '60', ...extra]);
  return { run, out };
}

function checkAgainstLines(figure: Printed, lineFigures: number[]): void {
  const [net, , lost, takenIn] = figure.values;
  const d = decimalsOf(figure.text[2]);
  // every part is printed with the same decimals, and the net is the printed loss less the printed intake
  for (const text of [figure.text[0], figure.text[3]]) expect(decimalsOf(text)).toBe(d);
  expect(Number((lost - takenIn).toFixed(d))).toBe(net);
  // the parts are the lines' own figures (six digits in canals.geojson), summed and rounded
  const losing = lineFigures.filter((v) => v > 0).reduce((a, b) => a + b, 0);
  const gaining = -lineFigures.filter((v) => v < 0).reduce((a, b) => a + b, 0);
  const slack = 0.5 * 10 ** -d + 1e-5 * (losing + gaining);
  expect(Math.abs(lost - losing)).toBeLessThanOrEqual(slack);
  expect(Math.abs(takenIn - gaining)).toBeLessThanOrEqual(slack);
  // per year is the net per day times 365.25, from the unrounded net
  expect(Math.abs(figure.values[1] - 365.25 * (losing - gaining))).toBeLessThanOrEqual(365.25 * slack * 2);
}

describe.each([
  { name: 'with the district solve', extra: [] as string[], method: 'district', words: 'district solve' },
  { name: 'strips only', extra: ['--strips-only'], method: 'strips', words: 'strips alone; no district solve' },
])('the net seepage on the demo, $name', ({ extra, method, words }) => {
  let run: CliRun;
  let record: any;
  let canals: any;
  let html: string;
  beforeAll(async () => {
    const screened = await screen(extra);
    run = screened.run;
    expect(run.status, run.stderr).toBe(0);
    record = readJson(join(screened.out, 'run.json'));
    canals = readJson(join(screened.out, 'canals.geojson'));
    html = readFileSync(join(screened.out, 'report.html'), 'utf8');
  });

  it('prints one named total, which run.json holds to the last printed digit', () => {
    const lines = run.stdout.split('\n').filter((line) => /Net seepage from the lines into the aquifer/.test(line));
    expect(lines).toHaveLength(1);
    const main = printed(run.stdout, new RegExp(`^Net seepage from the lines into the aquifer \\(${words.replace(/[()]/g, '\\$&')}\\): ${SEEPAGE}`, 'm'));
    expect(main, run.stdout).not.toBeNull();
    expect(record.totals.net_seepage_into_aquifer.method).toBe(method);
    expect(recorded(record.totals.net_seepage_into_aquifer)).toEqual(main!.values);
    // and in the same digits: a figure printed as 12.30 is recorded as 12.3, never 12.2999
    main!.text.forEach((text, i) => expect(text).toBe(recorded(record.totals.net_seepage_into_aquifer)[i].toFixed(decimalsOf(text))));
    // the old separate totals are gone, from the terminal and from run.json
    expect(run.stdout).not.toMatch(/losing lines lose|gaining lines take in \d|the strips' losses add to/);
    for (const old of ['loss_m3_d', 'loss_m3_yr', 'gain_m3_d', 'net_m3_d', 'strip_lines_loss_m3_d', 'strip_lines_gain_m3_d']) expect(record.totals).not.toHaveProperty(old);
  });

  it("gives the lines' own figures, rounded, and parts that add up as printed", () => {
    const main = printed(run.stdout, new RegExp(`\\(${words.replace(/[()]/g, '\\$&')}\\): ${SEEPAGE}`))!;
    checkAgainstLines(main, canals.features.map((f: any) => f.properties.net_loss_m3_d ?? 0));
  });

  it('gives the strips alone as a secondary line, labelled as the quicker method, only beside the district solve', () => {
    const secondary = printed(run.stdout, new RegExp(`^Strips alone \\(the quicker method, for comparison\\): net seepage ${SEEPAGE}`, 'm'));
    if (method === 'strips') {
      expect(secondary).toBeNull();
      expect(record.totals.net_seepage_into_aquifer_strips_alone).toBeNull();
      return;
    }
    expect(secondary, run.stdout).not.toBeNull();
    expect(record.totals.net_seepage_into_aquifer_strips_alone.method).toBe('strips');
    expect(recorded(record.totals.net_seepage_into_aquifer_strips_alone)).toEqual(secondary!.values);
    checkAgainstLines(secondary!, canals.features.map((f: any) => f.properties.strip_net_loss_m3_d ?? 0));
  });

  it('shows the same named total and figures in the report', () => {
    const block = record.totals.net_seepage_into_aquifer;
    const card = /<div class="total-card net-seepage" data-method="(\w+)">(.*?)<\/div>/.exec(html);
    expect(card).not.toBeNull();
    expect(card![1]).toBe(method);
    const shown = printed(run.stdout, new RegExp(SEEPAGE))!;
    const d = decimalsOf(shown.text[2]);
    expect(card![2]).toContain(`Net seepage from the lines into the aquifer (${method === 'district' ? 'district solve' : 'strips alone'})`);
    expect(card![2]).toContain(`<span class="figure">${formatGrouped(block.m3_d, d)} m³/d</span>`);
    expect(card![2]).toContain(`= lost by losing lines ${formatGrouped(block.lost_by_losing_lines_m3_d, d)} − taken in by gaining lines ${formatGrouped(block.taken_in_by_gaining_lines_m3_d, d)} m³/d`);
    expect(card![2]).toContain(`${formatGrouped(block.m3_yr, decimalsOf(shown.text[1]))} m³/yr`);
  });
});
