// What the run took for the lines' beds, said once for the whole district (in the summary,
// run.json and the report): how many lines have a clean bed, how many a resistance and from where,
// and where their wetted perimeters came from. Nothing about the beds is left silent.
import type { LineRecord } from './district-inputs.js';

export interface BedsUsed {
  lines: number;
  /** Lines with no resistance (the line holds the aquifer at its stage). */
  clean: number;
  /** Lines with a resistance from their own attribute, and from the config's default. */
  resistanceFromAttribute: number;
  resistanceFromDefault: number;
  /** Of the lines with a resistance: where the wetted perimeter came from. */
  perimeterFromAttribute: number;
  perimeterFromWidthAndDepth: number;
  perimeterFromDefault: number;
  /** Smallest and largest resistance of the resistive lines (days); NaN when none. */
  resistanceMinD: number;
  resistanceMaxD: number;
}

export function bedsUsed(lines: readonly LineRecord[]): BedsUsed {
  const used: BedsUsed = {
    lines: lines.length,
    clean: 0,
    resistanceFromAttribute: 0,
    resistanceFromDefault: 0,
    perimeterFromAttribute: 0,
    perimeterFromWidthAndDepth: 0,
    perimeterFromDefault: 0,
    resistanceMinD: NaN,
    resistanceMaxD: NaN,
  };
  let min = Infinity, max = -Infinity;
  for (const line of lines) {
    if (!(line.bedResistanceD > 0)) { used.clean++; continue; }
    if (line.bedResistanceFrom === 'attribute') used.resistanceFromAttribute++;
    else used.resistanceFromDefault++;
    if (line.wettedPerimeterFrom === 'attribute') used.perimeterFromAttribute++;
    else if (line.wettedPerimeterFrom === 'width-and-depth') used.perimeterFromWidthAndDepth++;
    else used.perimeterFromDefault++;
    min = Math.min(min, line.bedResistanceD);
    max = Math.max(max, line.bedResistanceD);
  }
  if (min <= max) { used.resistanceMinD = min; used.resistanceMaxD = max; }
  return used;
}

/** One sentence: "Line beds: 9 clean (...); 11 with a bed resistance of 5 to 40 d (...)". */
export function bedsText(used: BedsUsed): string {
  const resistive = used.lines - used.clean;
  if (resistive === 0) {
    return `Line beds: all ${used.lines} lines clean (no bed resistance: each holds the aquifer at its stage, which gives the most seepage)`;
  }
  const sources = [
    used.resistanceFromAttribute > 0 ? `${used.resistanceFromAttribute} from their attribute` : '',
    used.resistanceFromDefault > 0 ? `${used.resistanceFromDefault} from the config's default` : '',
  ].filter(Boolean).join(', ');
  const perimeters = [
    used.perimeterFromAttribute > 0 ? `${used.perimeterFromAttribute} given` : '',
    used.perimeterFromWidthAndDepth > 0 ? `${used.perimeterFromWidthAndDepth} from bottom width and water depth` : '',
    used.perimeterFromDefault > 0 ? `${used.perimeterFromDefault} the config's default` : '',
  ].filter(Boolean).join(', ');
  const range = used.resistanceMinD === used.resistanceMaxD ? `${used.resistanceMinD} d` : `${used.resistanceMinD} to ${used.resistanceMaxD} d`;
  return `Line beds: ${resistive} of ${used.lines} lines with a bed resistance of ${range} (${sources}; wetted perimeters: ${perimeters}), ${used.clean} clean`;
}
