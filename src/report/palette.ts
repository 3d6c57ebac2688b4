// Colours and fill patterns of the report. Colours are from the Okabe-Ito palette (M. Okabe and
// K. Ito, "Color Universal Design", 2008), chosen to stay apart for the common kinds of colour
// vision deficiency [from memory]; every risk class also has a pattern and a text label of its own,
// so no reading depends on colour alone.
import type { RiskClass } from '../shared/settings.js';

export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

export type StripClass = RiskClass | 'unsolved';

export interface StripStyle {
  /** The class name as ranking.csv, the table and the legend all write it. */
  label: string;
  colour: string;
  /** Marks drawn over the colour in a 6 x 6 tile, as SVG path data. */
  hatch: string;
  hatchColour: string;
}

export const STRIP_STYLES: Record<StripClass, StripStyle> = {
  // cross-hatched: water at or above the ground
  ponded: { label: 'ponded', colour: OKABE_ITO.vermillion, hatch: 'M0 0L6 6M6 0L0 6', hatchColour: '#000000' },
  // single diagonal hatch
  waterlogged: { label: 'waterlogged', colour: OKABE_ITO.orange, hatch: 'M0 6L6 0M-1 1L1 -1M5 7L7 5', hatchColour: '#000000' },
  // dotted
  potential: { label: 'potential', colour: OKABE_ITO.yellow, hatch: 'M2.5 3h1', hatchColour: '#000000' },
  safe: { label: 'safe', colour: OKABE_ITO.bluishGreen, hatch: '', hatchColour: '#000000' },
  // horizontal lines on pale grey: no solution, so no colour of risk
  unsolved: { label: 'unsolved', colour: '#DDDDDD', hatch: 'M0 3h6', hatchColour: '#666666' },
};

export const STRIP_CLASSES: readonly StripClass[] = ['ponded', 'waterlogged', 'potential', 'safe', 'unsolved'];

export const LINE_COLOURS = { canal: OKABE_ITO.blue, drain: OKABE_ITO.black, unpaired: OKABE_ITO.reddishPurple } as const;

/** Pattern id of a strip class; the page's CSS fills `.risk-<class>` with it. */
export function patternId(kind: StripClass): string {
  return `doab-fill-${kind}`;
}

/** SVG <pattern> elements for every strip class, in user space so tiles keep their size. */
export function stripPatternDefs(): string {
  return STRIP_CLASSES.map((kind) => {
    const style = STRIP_STYLES[kind];
    const marks = style.hatch
      ? `<path d="${style.hatch}" stroke="${style.hatchColour}" stroke-width="${kind === 'potential' ? 1.6 : 0.7}" stroke-linecap="round" stroke-opacity="0.55"/>`
      : '';
    return `<pattern id="${patternId(kind)}" width="6" height="6" patternUnits="userSpaceOnUse"><rect width="6" height="6" fill="${style.colour}"/>${marks}</pattern>`;
  }).join('');
}
