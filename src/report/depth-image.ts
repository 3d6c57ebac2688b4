// The district solve's depth raster as a small PNG for the report's map: each pixel takes the risk
// class of the shallowest cell under it (so a waterlogged patch never vanishes in the shrinking),
// coloured as the strips are; transparent outside the aquifer. Same raster in, same bytes out.
import { encode } from 'fast-png';
import { CELL_FREE } from '../hydraulics/district-solver.js';
import type { DistrictResult } from '../screening/district.js';
import { riskClass, RISK_CLASSES, type RiskThresholds } from '../shared/settings.js';
import { STRIP_STYLES } from './palette.js';

export interface DepthImage {
  /** data:image/png;base64,... */
  href: string;
  widthPx: number;
  heightPx: number;
}

// PNG (ISO/IEC 15948:2004) chunk CRC: CRC-32 of ISO 3309, polynomial 0xEDB88320 [published]
/** An 8-bit RGBA PNG of width x height pixels, rows from the top (fast-png writes the chunks). */
export function encodePng(rgba: Uint8Array, width: number, height: number): Uint8Array {
  return encode({ width, height, data: rgba, channels: 4, depth: 8 });
}

function rgb(hex: string): [number, number, number] {
  return [parseInt(hex.slice(1, 3), 16), parseInt(hex.slice(3, 5), 16), parseInt(hex.slice(5, 7), 16)];
}

/** The depth raster shrunk to at most maxPx pixels a side, by risk class. */
export function depthImage(district: DistrictResult, risk: RiskThresholds, maxPx: number): DepthImage {
  const { columns, rows } = district.grid;
  const step = Math.max(1, Math.ceil(Math.max(columns, rows) / maxPx));
  const width = Math.ceil(columns / step), height = Math.ceil(rows / step);
  const colours = RISK_CLASSES.map((kind) => rgb(STRIP_STYLES[kind].colour));
  const rgba = new Uint8Array(width * height * 4);
  for (let py = 0; py < height; py++) {
    for (let px = 0; px < width; px++) {
      let shallowest = Infinity;
      // image rows run from the north; grid row 0 is the southernmost
      for (let r = rows - 1 - py * step; r > rows - 1 - (py + 1) * step && r >= 0; r--) {
        for (let c = px * step; c < (px + 1) * step && c < columns; c++) {
          const g = r * columns + c;
          // line cells hold the line's stage, not land
          if (district.cellKind[g] !== CELL_FREE) continue;
          const d = district.depthM[g];
          if (d < shallowest) shallowest = d;
        }
      }
      if (shallowest === Infinity) continue;
      const [red, green, blue] = colours[RISK_CLASSES.indexOf(riskClass(shallowest, risk))];
      const o = (py * width + px) * 4;
      rgba[o] = red;
      rgba[o + 1] = green;
      rgba[o + 2] = blue;
      rgba[o + 3] = 255;
    }
  }
  return { href: `data:image/png;base64,${Buffer.from(encodePng(rgba, width, height)).toString('base64')}`, widthPx: width, heightPx: height };
}
