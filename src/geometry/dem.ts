// A digital elevation model as a grid of ground elevations, and sampling it at points of the work
// CRS: bilinear between the centres of the four pixels around the point (NaN where one of them
// holds no data or the point lies outside), after moving the point into the DEM's own CRS.

export interface DemGrid {
  width: number;
  height: number;
  /** The grid's north-west corner (DEM CRS units) and pixel size (> 0); rows run south. */
  westX: number;
  northY: number;
  pixelX: number;
  pixelY: number;
  /** Elevations, row by row from the north; NaN where the DEM holds no data. */
  values: Float32Array;
}

/** Work CRS (x, y) to the DEM's CRS; identity when they are the same. */
export type ToDem = (x: number, y: number) => [number, number];

/** The DEM's ground at a point, bilinear between pixel centres; NaN outside it or next to a nodata pixel. */
export function sampleDem(dem: DemGrid, x: number, y: number): number {
  const fc = (x - dem.westX) / dem.pixelX - 0.5, fr = (dem.northY - y) / dem.pixelY - 0.5;
  // within half a pixel of the edge, the edge pixels' centres bound the point: clamp to them
  const c = Math.min(Math.max(fc, 0), dem.width - 1), r = Math.min(Math.max(fr, 0), dem.height - 1);
  if (fc < -0.5 || fr < -0.5 || fc > dem.width - 0.5 || fr > dem.height - 0.5) return NaN;
  const c0 = Math.min(Math.floor(c), dem.width - 2 < 0 ? 0 : dem.width - 2), r0 = Math.min(Math.floor(r), dem.height - 2 < 0 ? 0 : dem.height - 2);
  const c1 = Math.min(c0 + 1, dem.width - 1), r1 = Math.min(r0 + 1, dem.height - 1);
  const tx = c1 === c0 ? 0 : c - c0, ty = r1 === r0 ? 0 : r - r0;
  const v = dem.values;
  const a = v[r0 * dem.width + c0], b = v[r0 * dem.width + c1], d = v[r1 * dem.width + c0], e = v[r1 * dem.width + c1];
  return (a * (1 - tx) + b * tx) * (1 - ty) + (d * (1 - tx) + e * tx) * ty;
}

/** The ground at work-CRS points: the DEM moved into place. */
export interface GroundSampler {
  /** Ground elevation (m) at (x, y) of the work CRS; NaN where the DEM has none. */
  at(x: number, y: number): number;
  /** About the DEM's pixel size in metres, for the spacing of samples along a transect. */
  pixelM: number;
}

export function groundSampler(dem: DemGrid, toDem: ToDem | null, pixelM: number): GroundSampler {
  return {
    at: (x, y) => {
      const [dx, dy] = toDem ? toDem(x, y) : [x, y];
      return sampleDem(dem, dx, dy);
    },
    pixelM,
  };
}
