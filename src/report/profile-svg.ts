// A cross-section of one transect as a standalone SVG: ground, the water table from line to line,
// both line stages, the aquifer base, the waterlogging depths below ground and the peak. Used by
// the report (inline) and by `doab profile` (a file of its own), so it carries its own styling
// and no element ids.
import type { Profile } from '../screening/profile.js';
import { escapeHtml } from './escape.js';
import { formatFixed, formatGrouped, ticks } from '../output/format.js';
import { OKABE_ITO } from './palette.js';
import { simplifyMarks } from './svg-path.js';

export interface ProfileSvgOptions {
  widthPx?: number;
  heightPx?: number;
}

// the least margins; the left one grows to hold the widest elevation
const MARGIN = { left: 62, right: 168, top: 44, bottom: 64 };

/**
 * The profile seen from the strip's line a, so that x is the distance from line a as in
 * strips.geojson (peak_offset_m). A key transect cast from line b is mirrored; others are as given.
 */
export function orientFromLineA(profile: Profile, lineA: string): Profile {
  if (profile.lineA === lineA || profile.lineB !== lineA) return profile;
  const width = profile.transectLengthM, n = profile.xM.length;
  const reversed = (values: Float64Array) => Float64Array.from(values, (_, i) => values[n - 1 - i]);
  return {
    ...profile,
    lineA: profile.lineB,
    lineB: profile.lineA,
    stageAM: profile.stageBM,
    stageBM: profile.stageAM,
    zones: profile.zones.map((zone) => ({ ...zone, fromM: Math.max(0, width - zone.toM), toM: width - zone.fromM })).reverse(),
    xM: Float64Array.from(profile.xM, (_, i) => Math.max(0, width - profile.xM[n - 1 - i])),
    waterTableM: reversed(profile.waterTableM),
    groundM: reversed(profile.groundM),
    peakOffsetM: width - profile.peakOffsetM,
    seepageAM2PerDay: profile.seepageBM2PerDay,
    seepageBM2PerDay: profile.seepageAM2PerDay,
    bankHeadAM: profile.bankHeadBM,
    bankHeadBM: profile.bankHeadAM,
  };
}

/** The peak's label text: its elevation with 2 decimals and the unit, as in "180.73 m". */
export function peakLabelText(peakM: number): string {
  return `${formatFixed(peakM, 2)} m`;
}

function r(value: number): string {
  return String(Math.round(value * 10) / 10);
}

/** Vertical scale: the band where the water table, ground and depths lie, and the base below a break if far. */
interface VerticalScale {
  py: (zM: number) => number;
  yBase: number;
  /** Lowest and highest elevation of the drawn band (m), for the axis ticks. */
  lowM: number;
  highM: number;
  /** Top and bottom of the gap that marks a broken axis (px), or null when the base is in the band. */
  gap: [number, number] | null;
}

const GAP_PX = 14;
const BELOW_GAP_PX = 22;

function verticalScale(profile: Profile, top: number, bottom: number): VerticalScale {
  const n = profile.xM.length;
  let high = Math.max(profile.stageAM, profile.stageBM, profile.peakWaterTableM);
  let low = Math.min(profile.stageAM, profile.stageBM);
  for (let i = 0; i < n; i++) {
    high = Math.max(high, profile.groundM[i], profile.waterTableM[i]);
    low = Math.min(low, profile.waterTableM[i], profile.groundM[i] - profile.potentialDepthM);
  }
  const pad = Math.max(0.15 * (high - low), 0.5);
  high += pad;
  low -= pad;
  // a base close below the band is drawn to scale; a deep one sits under a break in the axis
  const broken = low - profile.baseM > 0.35 * (high - low);
  if (!broken) low = profile.baseM - 0.04 * (high - profile.baseM);
  const bandBottom = broken ? bottom - BELOW_GAP_PX - GAP_PX : bottom;
  const scale = (bandBottom - top) / (high - low);
  const yBase = broken ? bottom - BELOW_GAP_PX / 2 : top + (high - profile.baseM) * scale;
  return {
    py: (zM) => (zM >= low || !broken ? top + (high - zM) * scale : yBase),
    yBase,
    lowM: low,
    highM: high,
    gap: broken ? [bandBottom, bandBottom + GAP_PX] : null,
  };
}

// a white outline behind text drawn over lines, so a label stays readable where a line crosses it
const HALO = ' stroke="#ffffff" stroke-width="3" paint-order="stroke"';

/** The drawing's own font size (px); a label without a size of its own has this one. */
const FONT_PX = 11;

/** A box on the drawing, in px: left, top, right, bottom. */
export type LabelBox = [number, number, number, number];

/**
 * Width of a character in em, a little above the widest common sans-serif faces (DejaVu Sans, the
 * widest of them, measured in Chromium): so that the box of a label holds the text as drawn.
 */
function charEm(ch: string): number {
  if (" .,:;'|!iljI()[]".includes(ch)) return 0.42;
  if ('mwMW@%'.includes(ch)) return 1.05;
  if (ch >= 'A' && ch <= 'Z') return 0.82;
  return 0.66;
}

/**
 * The box a text takes, from its anchor point (x, baseline y), anchor, size and weight: the width
 * from its characters, the height from the face's ascent and descent. Example:
 * labelBox('180.73 m', 100, 50, 'middle', 11, true)
 */
export function labelBox(text: string, x: number, y: number, anchor: 'start' | 'middle' | 'end', fontPx = FONT_PX, bold = false): LabelBox {
  let em = 0;
  for (const ch of text) em += charEm(ch);
  const width = em * fontPx * (bold ? 1.1 : 1);
  const left = anchor === 'start' ? x : anchor === 'end' ? x - width : x - width / 2;
  return [left - 1, y - 0.93 * fontPx, left + width + 1, y + 0.28 * fontPx];
}

function boxesMeet(a: LabelBox, b: LabelBox): boolean {
  return a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
}

interface Label {
  text: string;
  x: number;
  /** Baseline where the label would sit; moved by placeLabel. */
  y: number;
  anchor: 'start' | 'middle' | 'end';
  fontPx?: number;
  bold?: boolean;
  /** Attributes written before x and y (class, fill, halo). */
  attrs: string;
}

/**
 * Labels placed one after another, each at its own place when that is free, or else moved up or
 * down (or whichever is nearer, within [top, bottom]) to the nearest place clear of every box
 * placed before it. Deterministic: the same labels in the same order give the same places.
 */
class LabelPlacer {
  readonly boxes: LabelBox[] = [];
  constructor(private readonly top: number, private readonly bottom: number) {}

  /** A box that labels keep clear of (text that stays where it is). */
  block(box: LabelBox): void {
    this.boxes.push(box);
  }

  /** A text that stays where it is, its box blocked; returns its SVG. */
  fixed(label: Label): string {
    // boxes from the coordinates as written (a tenth of a pixel), so that the file's labels keep apart too
    label.x = tenth(label.x);
    label.y = tenth(label.y);
    this.block(labelBox(label.text, label.x, label.y, label.anchor, label.fontPx, label.bold));
    return textSvg(label);
  }

  /** The nearest free place for a label moving one way (+1 down, -1 up), as a shift of its baseline (px). */
  private freeShift(box: LabelBox, direction: 1 | -1): number {
    let shift = 0;
    // each step jumps just past the box in the way, so this ends within as many steps as there are boxes
    for (let step = 0; step <= this.boxes.length; step++) {
      const moved: LabelBox = [box[0], box[1] + shift, box[2], box[3] + shift];
      const hit = this.boxes.find((b) => boxesMeet(moved, b));
      if (!hit) return shift;
      shift = direction > 0 ? hit[3] - box[1] + 0.5 : hit[1] - box[3] - 0.5;
    }
    return shift;
  }

  /** Places a label moving 'up' or 'down' (the other way where that leaves the drawing) or 'either' way, the nearer; returns its SVG. */
  place(label: Label, move: 'up' | 'down' | 'either'): string {
    label.x = tenth(label.x);
    label.y = tenth(label.y);
    const box = labelBox(label.text, label.x, label.y, label.anchor, label.fontPx, label.bold);
    const inside = (shift: number) => box[1] + shift >= this.top && box[3] + shift <= this.bottom;
    const down = this.freeShift(box, 1), up = this.freeShift(box, -1);
    let shift: number;
    // the way asked when it stays on the drawing, else the other way
    if (move === 'up') shift = inside(up) || !inside(down) ? up : down;
    else if (move === 'down') shift = inside(down) || !inside(up) ? down : up;
    else if (inside(down) !== inside(up)) shift = inside(down) ? down : up;
    else shift = Math.abs(up) < Math.abs(down) ? up : down;
    // a shift clears the box in the way by half a pixel, more than the rounding to a tenth takes back
    label.y = tenth(label.y + shift);
    this.block(labelBox(label.text, label.x, label.y, label.anchor, label.fontPx, label.bold));
    return textSvg(label);
  }
}

function tenth(value: number): number {
  return Math.round(value * 10) / 10;
}

function textSvg(label: Label): string {
  const size = label.fontPx === undefined ? '' : ` font-size="${label.fontPx}"`;
  const weight = label.bold ? ' font-weight="bold"' : '';
  const anchor = label.anchor === 'start' ? '' : ` text-anchor="${label.anchor}"`;
  return `<text ${label.attrs}${label.attrs ? ' ' : ''}x="${r(label.x)}" y="${r(label.y)}"${anchor}${size}${weight}>${escapeHtml(label.text)}</text>`;
}

export function renderProfileSvg(profile: Profile, options: ProfileSvgOptions = {}): string {
  const width = options.widthPx ?? 680, height = options.heightPx ?? 380;
  const plotH = height - MARGIN.top - MARGIN.bottom;
  const vertical = verticalScale(profile, MARGIN.top, MARGIN.top + plotH);
  const { py, yBase } = vertical;
  // about one tick every 24 px of the band or more, so that their labels (13 px high) keep apart
  const bandPx = (vertical.gap ? vertical.gap[0] : yBase) - MARGIN.top;
  const yTicks = ticks(vertical.lowM, vertical.highM, Math.max(2, Math.min(5, Math.floor(bandPx / 24))));
  const step = yTicks.length > 1 ? yTicks[1] - yTicks[0] : 1;
  const yTickText = (t: number) => formatFixed(t, step < 1 ? 1 : 0);
  // room on the left for the widest elevation, its tick and gap (16 px), and the turned axis title (18 px)
  const widestTickPx = Math.max(0, ...yTicks.map((t) => { const box = labelBox(yTickText(t), 0, 0, 'start'); return box[2] - box[0]; }));
  const left = Math.max(MARGIN.left, Math.ceil(widestTickPx + 16 + 18));
  const plotW = width - left - MARGIN.right;
  const n = profile.xM.length;
  const transectLengthM = Math.max(profile.transectLengthM, 1e-9);
  const px = (xM: number) => left + (xM / transectLengthM) * plotW;
  // points of a curve along the transect, without those within a quarter pixel of the simplified curve
  const polyline = (zOf: (i: number) => number) => {
    const xs = Array.from(profile.xM, px), ys = Array.from(profile.xM, (_, i) => py(zOf(i)));
    const keep = simplifyMarks(xs, ys, 0.25);
    const out: string[] = [];
    for (let i = 0; i < n; i++) if (keep[i]) out.push(`${r(xs[i])},${r(ys[i])}`);
    return out.join(' ');
  };
  const x0 = px(0), xL = px(profile.transectLengthM);
  const parts: string[] = [];
  const texts: string[] = [];
  const labels = new LabelPlacer(0, height);

  // text that stays where it is, placed first so that the labels keep clear of it: the title, the
  // axes and the note
  const exaggeration = Math.abs(py(vertical.highM - 1) - py(vertical.highM)) / (plotW / transectLengthM);
  const title =
    labels.fixed({ text: `Strip ${profile.stripId}: line a ${profile.lineA} to line b ${profile.lineB}`, x: left, y: 16, anchor: 'start', fontPx: 12, bold: true, attrs: '' }) +
    // how much the drawing stretches heights against lengths: a planner reading slopes off it needs to know
    labels.fixed({
      text:
        `vertical exaggeration ${Number(exaggeration.toPrecision(2))} times${vertical.gap ? ' above the break' : ''}; width ${formatGrouped(profile.transectLengthM)} m; ` +
        `seepage ${formatFixed(profile.seepageAM2PerDay, 3)} and ${formatFixed(profile.seepageBM2PerDay, 3)} m²/d; smallest depth ${formatFixed(profile.minDepthM, 2)} m`,
      x: left, y: 30, anchor: 'start', attrs: 'fill="#444444"',
    });
  const note = labels.fixed({ text: 'Screening estimate (steady Dupuit-Forchheimer): confirm in the field.', x: left, y: height - 6, anchor: 'start', fontPx: 10, attrs: 'fill="#555555"' });
  const axis: string[] = [];
  const xAxisY = MARGIN.top + plotH + 8;
  axis.push(`<path d="M${r(x0)} ${r(xAxisY)}H${r(xL)}" stroke="#333333"/>`);
  for (const t of ticks(0, profile.transectLengthM, 6)) {
    axis.push(`<path d="M${r(px(t))} ${r(xAxisY)}v5" stroke="#333333"/>` + labels.fixed({ text: formatGrouped(t), x: px(t), y: xAxisY + 17, anchor: 'middle', attrs: '' }));
  }
  const yAxisX = x0 - 8;
  const bandBottom = vertical.gap ? vertical.gap[0] : yBase;
  axis.push(`<path d="M${r(yAxisX)} ${r(py(vertical.highM))}V${r(bandBottom)}" stroke="#333333"/>`);
  if (vertical.gap) axis.push(`<path d="M${r(yAxisX)} ${r(vertical.gap[1])}V${r(yBase)}" stroke="#333333"/>`);
  for (const t of yTicks) {
    axis.push(`<path d="M${r(yAxisX)} ${r(py(t))}h-5" stroke="#333333"/>` + labels.fixed({ text: yTickText(t), x: yAxisX - 8, y: py(t) + 4, anchor: 'end', attrs: '' }));
  }
  axis.push(labels.fixed({ text: `distance from line a (${profile.lineA}), m`, x: (x0 + xL) / 2, y: xAxisY + 34, anchor: 'middle', attrs: '' }));
  // turned a quarter left about (14, middle): its box runs up the left edge
  const yTitle = `elevation, m${vertical.gap ? ' (axis broken)' : ''}`;
  const yTitleBox = labelBox(yTitle, 0, 0, 'middle');
  const yTitleMiddle = MARGIN.top + plotH / 2;
  labels.block([13 + yTitleBox[1], yTitleMiddle + yTitleBox[0], 13 + yTitleBox[3], yTitleMiddle + yTitleBox[2]]);
  axis.push(`<text transform="translate(13 ${r(yTitleMiddle)}) rotate(-90)" text-anchor="middle">${escapeHtml(yTitle)}</text>`);

  // soil from base to ground, and the saturated part from base to the water table
  parts.push(`<polygon points="${r(x0)},${r(yBase)} ${polyline((i) => profile.groundM[i])} ${r(xL)},${r(yBase)}" fill="#F2EAD7"/>`);
  parts.push(`<polygon points="${r(x0)},${r(yBase)} ${polyline((i) => profile.waterTableM[i])} ${r(xL)},${r(yBase)}" fill="${OKABE_ITO.skyBlue}" fill-opacity="0.35"/>`);
  if (vertical.gap) {
    // the break: a blank band with a zigzag at each edge, across the plot and the axis
    const [g0, g1] = vertical.gap;
    let zig0 = `M${r(x0 - 6)} ${r(g0)}`, zig1 = `M${r(x0 - 6)} ${r(g1)}`;
    for (let x = x0 - 6, k = 0; x < xL; x += 6, k++) {
      zig0 += `L${r(x + 6)} ${r(g0 + (k % 2 === 0 ? 3 : 0))}`;
      zig1 += `L${r(x + 6)} ${r(g1 + (k % 2 === 0 ? 3 : 0))}`;
    }
    parts.push(`<rect x="${r(x0 - 6)}" y="${r(g0)}" width="${r(xL - x0 + 6)}" height="${GAP_PX}" fill="#ffffff"/>`);
    parts.push(`<path class="profile-axis-break" d="${zig0}${zig1}" fill="none" stroke="#777777" stroke-width="0.8"/>`);
  }

  // zones in series along the transect (their labels are placed last, the least needed)
  const zoneLabels: Label[] = [];
  for (const zone of profile.zones) {
    if (zone.fromM > 0) parts.push(`<path d="M${r(px(zone.fromM))} ${r(MARGIN.top)}V${r(yBase)}" stroke="#888888" stroke-width="0.8" stroke-dasharray="1 3"/>`);
    if (px(zone.toM) - px(zone.fromM) > 90) {
      zoneLabels.push({
        text: `${zone.id}, K ${formatGrouped(zone.kMPerDay, zone.kMPerDay < 10 ? 1 : 0)} m/d`,
        x: (px(zone.fromM) + px(zone.toM)) / 2, y: (vertical.gap ? vertical.gap[0] : yBase) - 5, anchor: 'middle', fontPx: 10, attrs: 'fill="#555555"',
      });
    }
  }

  // the base: a heavy line with short ticks under it, the usual mark of an impervious boundary
  let hatch = '';
  for (let x = x0 + 4; x < xL; x += 10) hatch += `M${r(x)} ${r(yBase)}l-5 7`;
  parts.push(`<path d="${hatch}" stroke="#000000" stroke-width="0.7"/>`);
  parts.push(`<path class="profile-base" d="M${r(x0)} ${r(yBase)}H${r(xL)}" stroke="#000000" stroke-width="2"/>`);

  // depths below ground that bound the risk classes
  // (told apart by dash and label, not by colour)
  const threshold = (depthM: number, dash: string) =>
    parts.push(`<polyline class="profile-depth" points="${polyline((i) => profile.groundM[i] - depthM)}" fill="none" stroke="#333333" stroke-width="1.2" stroke-dasharray="${dash}"/>`);
  threshold(profile.waterloggedDepthM, '7 4');
  threshold(profile.potentialDepthM, '2 3');
  parts.push(`<polyline class="profile-ground" points="${polyline((i) => profile.groundM[i])}" fill="none" stroke="#5A3D1E" stroke-width="1.6"/>`);
  parts.push(`<polyline class="profile-water-table" points="${polyline((i) => profile.waterTableM[i])}" fill="none" stroke="${OKABE_ITO.blue}" stroke-width="2.2"/>`);

  // stages: an open triangle pointing down onto the water level at each line, labelled below it
  const stage = (xM: number, stageM: number, lineId: string, anchor: 'start' | 'end', letter: 'a' | 'b') => {
    const x = px(xM), y = py(stageM);
    parts.push(`<path class="profile-stage" d="M${r(x)} ${r(y)}l-6 -10h12z" fill="#ffffff" stroke="${OKABE_ITO.blue}" stroke-width="1.5"/>`);
    parts.push(`<path d="M${r(x - 9)} ${r(y)}h18" stroke="${OKABE_ITO.blue}" stroke-width="1.5"/>`);
    const text = `line ${letter}: ${lineId}, stage ${formatFixed(stageM, 2)} m`;
    texts.push(labels.place({ text, x: anchor === 'start' ? x + 6 : x - 6, y: y + 16, anchor, attrs: `fill="#00456B"${HALO}` }, 'down'));
  };
  stage(0, profile.stageAM, profile.lineA, 'start', 'a');
  stage(profile.transectLengthM, profile.stageBM, profile.lineB, 'end', 'b');

  // the peak, labelled with its elevation and above that what it is; at a line it is labelled on the strip's side
  const peakX = px(profile.peakOffsetM), peakY = py(profile.peakWaterTableM);
  const peakAnchor = peakX - x0 < 50 ? 'start' : xL - peakX < 50 ? 'end' : 'middle';
  const labelX = peakAnchor === 'start' ? peakX + 10 : peakAnchor === 'end' ? peakX - 10 : peakX;
  parts.push(`<circle cx="${r(peakX)}" cy="${r(peakY)}" r="3.5" fill="${OKABE_ITO.blue}" stroke="#ffffff" stroke-width="1"/>`);
  // at a line the highest water table is that line's stage, not a mound between the lines
  const atLine = profile.peakOffsetM <= 1e-6 * transectLengthM || profile.peakOffsetM >= transectLengthM * (1 - 1e-6);
  const peakValue: Label = {
    text: peakLabelText(profile.peakWaterTableM), x: labelX, y: peakY - 8, anchor: peakAnchor, bold: true,
    attrs: `class="peak-label" data-strip-id="${escapeHtml(profile.stripId)}"${HALO}`,
  };
  texts.push(labels.place(peakValue, 'up'));
  texts.push(labels.place({ text: atLine ? 'highest, at the line' : 'peak', x: labelX, y: peakValue.y - 12, anchor: peakAnchor, fontPx: 10, attrs: `fill="#333333"${HALO}` }, 'up'));

  // the lines' labels in the right margin, each at its line's end on line b's side, the nearest free place
  const right = (y: number, text: string, colour: string) => texts.push(labels.place({ text, x: xL + 8, y: y + 4, anchor: 'start', attrs: `fill="${colour}"` }, 'either'));
  right(py(profile.waterTableM[n - 1]), 'water table', OKABE_ITO.blue);
  right(py(profile.groundM[n - 1]), 'ground', '#5A3D1E');
  right(py(profile.groundM[n - 1] - profile.waterloggedDepthM), `${formatFixed(profile.waterloggedDepthM, 1)} m deep: waterlogged`, '#333333');
  right(py(profile.groundM[n - 1] - profile.potentialDepthM), `${formatFixed(profile.potentialDepthM, 1)} m deep: potential`, '#333333');
  right(yBase, `aquifer base ${formatFixed(profile.baseM, 2)} m`, '#000000');
  for (const label of zoneLabels) texts.push(labels.place(label, 'up'));

  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="profile-svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" ` +
    `font-family="system-ui, -apple-system, 'Segoe UI', sans-serif" font-size="11" role="img" ` +
    `aria-label="Cross-section of strip ${escapeHtml(profile.stripId)}">` +
    `<rect width="${width}" height="${height}" fill="#ffffff"/>${title}${parts.join('')}${axis.join('')}${texts.join('')}${note}</svg>`
  );
}
