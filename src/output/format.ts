// Number formats: six significant digits in the files (stable bytes), and for what a person reads
// fixed decimals, no "-0", and a dash for a value that does not exist (an unsolved strip has no depth).

export function formatFixed(value: number, digits: number): string {
  if (!Number.isFinite(value)) return '-';
  const text = value.toFixed(digits);
  // -0.00 reads as a sign error to a person; a rounded zero has none
  return Number(text) === 0 ? text.replace('-', '') : text;
}

/** Thousands grouped with thin spaces, so a loss of 4545366 m^3/yr reads as 4 545 366. */
export function formatGrouped(value: number, digits = 0): string {
  const text = formatFixed(value, digits);
  if (text === '-') return text;
  const [whole, fraction] = text.split('.');
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
  return fraction === undefined ? grouped : `${grouped}.${fraction}`;
}

/** The largest 1, 2 or 5 times a power of ten not above value: lengths of scale bars, axis steps. */
export function roundDown125(value: number): number {
  if (!(value > 0) || !Number.isFinite(value)) throw new Error(`Unexpected value: ${value}.`);
  const power = 10 ** Math.floor(Math.log10(value));
  const mantissa = value / power;
  return (mantissa >= 5 ? 5 : mantissa >= 2 ? 2 : 1) * power;
}

/** Evenly spaced round ticks covering [min, max], about `count` of them. */
export function ticks(min: number, max: number, count: number): number[] {
  if (!(max > min)) return [min];
  const step = roundDown125((max - min) / count);
  const out: number[] = [];
  // the step is a round number, so ticks at whole multiples of it stay round after the product
  for (let k = Math.ceil(min / step - 1e-9); k * step <= max + step * 1e-9; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/** Six significant digits: more than any input carries, few enough to keep files stable. */
export function roundNumber(value: number): number | null {
  if (!Number.isFinite(value)) return null;
  // rounding noise of sums that cancel (a net of 1e-10 m^3/d, an offset of -5e-11 m) is zero
  if (Math.abs(value) < 1e-9) return 0;
  const rounded = Number(value.toPrecision(6));
  return Object.is(rounded, -0) ? 0 : rounded;
}

// items per piece of a long text made a piece at a time: a piece's strings die young
export const ITEMS_PER_PIECE = 500;

/** item(0) ... item(count - 1) joined by newlines, a few hundred per piece, each made only when its piece is asked for. */
export function* joinedInPieces(count: number, item: (k: number) => string): Generator<string> {
  for (let from = 0; from < count; from += ITEMS_PER_PIECE) {
    let piece = '';
    for (let k = from; k < Math.min(count, from + ITEMS_PER_PIECE); k++) piece += `${k > 0 ? '\n' : ''}${item(k)}`;
    yield piece;
  }
}
