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

/** Moves labels (sorted by y) apart so that none is closer than minGap px to the one above it. */
function spreadLabels(labels: { y: number; text: string; colour: string }[], minGap: number): void {
  labels.sort((a, b) => a.y - b.y);
  for (let i = 1; i < labels.length; i++) if (labels[i].y - labels[i - 1].y < minGap) labels[i].y = labels[i - 1].y + minGap;
}

// a white outline behind text drawn over lines, so a label stays readable where a line crosses it
const HALO = ' stroke="#ffffff" stroke-width="3" paint-order="stroke"';

export function renderProfileSvg(profile: Profile, options: ProfileSvgOptions = {}): string {
  const width = options.widthPx ?? 680, height = options.heightPx ?? 380;
  const plotW = width - MARGIN.left - MARGIN.right, plotH = height - MARGIN.top - MARGIN.bottom;
  const n = profile.xM.length;
  const transectLengthM = Math.max(profile.transectLengthM, 1e-9);
  const px = (xM: number) => MARGIN.left + (xM / transectLengthM) * plotW;
  const vertical = verticalScale(profile, MARGIN.top, MARGIN.top + plotH);
  const { py, yBase } = vertical;
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
  const rightLabels: { y: number; text: string; colour: string }[] = [];

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

  // zones in series along the transect
  for (const zone of profile.zones) {
    if (zone.fromM > 0) parts.push(`<path d="M${r(px(zone.fromM))} ${r(MARGIN.top)}V${r(yBase)}" stroke="#888888" stroke-width="0.8" stroke-dasharray="1 3"/>`);
    if (px(zone.toM) - px(zone.fromM) > 90) {
      parts.push(
        `<text x="${r((px(zone.fromM) + px(zone.toM)) / 2)}" y="${r((vertical.gap ? vertical.gap[0] : yBase) - 5)}" text-anchor="middle" fill="#555555" font-size="10">` +
          `${escapeHtml(zone.id)}, K ${escapeHtml(formatGrouped(zone.kMPerDay, zone.kMPerDay < 10 ? 1 : 0))} m/d</text>`,
      );
    }
  }

  // the base: a heavy line with short ticks under it, the usual mark of an impervious boundary
  let hatch = '';
  for (let x = x0 + 4; x < xL; x += 10) hatch += `M${r(x)} ${r(yBase)}l-5 7`;
  parts.push(`<path d="${hatch}" stroke="#000000" stroke-width="0.7"/>`);
  parts.push(`<path class="profile-base" d="M${r(x0)} ${r(yBase)}H${r(xL)}" stroke="#000000" stroke-width="2"/>`);
  rightLabels.push({ y: yBase + 4, text: `aquifer base ${formatFixed(profile.baseM, 2)} m`, colour: '#000000' });

  // depths below ground that bound the risk classes
  // (told apart by dash and label, not by colour)
  const threshold = (depthM: number, dash: string, className: string) => {
    parts.push(`<polyline class="profile-depth" points="${polyline((i) => profile.groundM[i] - depthM)}" fill="none" stroke="#333333" stroke-width="1.2" stroke-dasharray="${dash}"/>`);
    rightLabels.push({ y: py(profile.groundM[n - 1] - depthM) + 4, text: `${formatFixed(depthM, 1)} m deep: ${className}`, colour: '#333333' });
  };
  threshold(profile.waterloggedDepthM, '7 4', 'waterlogged');
  threshold(profile.potentialDepthM, '2 3', 'potential');

  parts.push(`<polyline class="profile-ground" points="${polyline((i) => profile.groundM[i])}" fill="none" stroke="#5A3D1E" stroke-width="1.6"/>`);
  rightLabels.push({ y: py(profile.groundM[n - 1]) + 4, text: 'ground', colour: '#5A3D1E' });
  parts.push(`<polyline class="profile-water-table" points="${polyline((i) => profile.waterTableM[i])}" fill="none" stroke="${OKABE_ITO.blue}" stroke-width="2.2"/>`);
  rightLabels.push({ y: py(profile.waterTableM[n - 1]) + 4, text: 'water table', colour: OKABE_ITO.blue });
  spreadLabels(rightLabels, 12);
  for (const label of rightLabels) parts.push(`<text x="${r(xL + 8)}" y="${r(label.y)}" fill="${label.colour}">${label.text}</text>`);

  // stages: an open triangle pointing down onto the water level at each line, labelled below it
  const stage = (xM: number, stageM: number, lineId: string, anchor: 'start' | 'end', letter: 'a' | 'b') => {
    const x = px(xM), y = py(stageM);
    parts.push(`<path class="profile-stage" d="M${r(x)} ${r(y)}l-6 -10h12z" fill="#ffffff" stroke="${OKABE_ITO.blue}" stroke-width="1.5"/>`);
    parts.push(`<path d="M${r(x - 9)} ${r(y)}h18" stroke="${OKABE_ITO.blue}" stroke-width="1.5"/>`);
    const tx = anchor === 'start' ? x + 6 : x - 6;
    parts.push(`<text x="${r(tx)}" y="${r(y + 16)}" text-anchor="${anchor}" fill="#00456B"${HALO}>line ${letter}: ${escapeHtml(lineId)}, stage ${formatFixed(stageM, 2)} m</text>`);
  };
  stage(0, profile.stageAM, profile.lineA, 'start', 'a');
  stage(profile.transectLengthM, profile.stageBM, profile.lineB, 'end', 'b');

  // the peak, labelled with its elevation; at a line it is labelled on the strip's side
  const peakX = px(profile.peakOffsetM), peakY = py(profile.peakWaterTableM);
  const peakAnchor = peakX - x0 < 50 ? 'start' : xL - peakX < 50 ? 'end' : 'middle';
  const labelX = peakAnchor === 'start' ? peakX + 10 : peakAnchor === 'end' ? peakX - 10 : peakX;
  parts.push(`<circle cx="${r(peakX)}" cy="${r(peakY)}" r="3.5" fill="${OKABE_ITO.blue}" stroke="#ffffff" stroke-width="1"/>`);
  // at a line the highest water table is that line's stage, not a mound between the lines
  const atLine = profile.peakOffsetM <= 1e-6 * transectLengthM || profile.peakOffsetM >= transectLengthM * (1 - 1e-6);
  const peakWord = atLine ? 'highest, at the line' : 'peak';
  parts.push(`<text x="${r(labelX)}" y="${r(peakY - 24)}" text-anchor="${peakAnchor}" font-size="10" fill="#333333"${HALO}>${peakWord}</text>`);
  parts.push(
    `<text class="peak-label" data-strip-id="${escapeHtml(profile.stripId)}" x="${r(labelX)}" y="${r(peakY - 12)}" text-anchor="${peakAnchor}" font-weight="bold"${HALO}>` +
      `${peakLabelText(profile.peakWaterTableM)}</text>`,
  );

  // axes
  const axis: string[] = [];
  const xAxisY = MARGIN.top + plotH + 8;
  axis.push(`<path d="M${r(x0)} ${r(xAxisY)}H${r(xL)}" stroke="#333333"/>`);
  for (const t of ticks(0, profile.transectLengthM, 6)) {
    axis.push(`<path d="M${r(px(t))} ${r(xAxisY)}v5" stroke="#333333"/><text x="${r(px(t))}" y="${r(xAxisY + 17)}" text-anchor="middle">${formatGrouped(t)}</text>`);
  }
  const yAxisX = x0 - 8;
  const bandBottom = vertical.gap ? vertical.gap[0] : yBase;
  axis.push(`<path d="M${r(yAxisX)} ${r(py(vertical.highM))}V${r(bandBottom)}" stroke="#333333"/>`);
  if (vertical.gap) axis.push(`<path d="M${r(yAxisX)} ${r(vertical.gap[1])}V${r(yBase)}" stroke="#333333"/>`);
  const yTicks = ticks(vertical.lowM, vertical.highM, 5);
  const step = yTicks.length > 1 ? yTicks[1] - yTicks[0] : 1;
  for (const t of yTicks) {
    axis.push(`<path d="M${r(yAxisX)} ${r(py(t))}h-5" stroke="#333333"/><text x="${r(yAxisX - 8)}" y="${r(py(t) + 4)}" text-anchor="end">${formatFixed(t, step < 1 ? 1 : 0)}</text>`);
  }
  axis.push(`<text x="${r((x0 + xL) / 2)}" y="${r(xAxisY + 34)}" text-anchor="middle">distance from line a (${escapeHtml(profile.lineA)}), m</text>`);
  axis.push(`<text transform="translate(14 ${r(MARGIN.top + plotH / 2)}) rotate(-90)" text-anchor="middle">elevation, m${vertical.gap ? ' (axis broken)' : ''}</text>`);

  // how much the drawing stretches heights against lengths: a planner reading slopes off it needs to know
  const horizontalPxPerM = plotW / transectLengthM;
  const verticalPxPerM = Math.abs(py(vertical.highM - 1) - py(vertical.highM));
  const exaggeration = verticalPxPerM / horizontalPxPerM;
  const title =
    `<text x="${MARGIN.left}" y="16" font-weight="bold" font-size="12">Strip ${escapeHtml(profile.stripId)}: line a ${escapeHtml(profile.lineA)} to line b ${escapeHtml(profile.lineB)}</text>` +
    `<text x="${MARGIN.left}" y="30" fill="#444444">vertical exaggeration ${Number(exaggeration.toPrecision(2))} times${vertical.gap ? ' above the break' : ''}; width ${formatGrouped(profile.transectLengthM)} m; seepage ${formatFixed(profile.seepageAM2PerDay, 3)} and ` +
    `${formatFixed(profile.seepageBM2PerDay, 3)} m²/d; smallest depth ${formatFixed(profile.minDepthM, 2)} m</text>`;
  const note = `<text x="${MARGIN.left}" y="${height - 6}" fill="#555555" font-size="10">Screening estimate (steady Dupuit-Forchheimer): confirm in the field.</text>`;

  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="profile-svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" ` +
    `font-family="system-ui, -apple-system, 'Segoe UI', sans-serif" font-size="11" role="img" ` +
    `aria-label="Cross-section of strip ${escapeHtml(profile.stripId)}">` +
    `<rect width="${width}" height="${height}" fill="#ffffff"/>${title}${parts.join('')}${axis.join('')}${note}</svg>`
  );
}
