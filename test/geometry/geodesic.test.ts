import GeographicLib from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import { buildStrips, castTransects, placeStations, type LineGeometry } from '../../src/geometry/index.js';
import { chooseWorkCrs, scaleAt, utmZone } from '../../src/geometry/work-crs.js';

// Two lines defined in lon/lat, densified every 0.002 degrees so they follow the parallel or
// meridian closely once projected.
function lonLatLine(id: string, from: [number, number], to: [number, number]): [number, number][] {
  const n = Math.ceil(Math.max(Math.abs(to[0] - from[0]), Math.abs(to[1] - from[1])) / 0.002);
  return Array.from({ length: n + 1 }, (_, i) => [from[0] + ((to[0] - from[0]) * i) / n, from[1] + ((to[1] - from[1]) * i) / n]);
}

/** Spacing within 0.2% of the geodesic one, and within 0.01% once the CRS's own scale is allowed for. */
function expectSpacing(a: [number, number][], b: [number, number][], geodesicM: number): void {
  const all = [...a, ...b];
  const bbox: [number, number, number, number] = [Math.min(...all.map((p) => p[0])), Math.min(...all.map((p) => p[1])), Math.max(...all.map((p) => p[0])), Math.max(...all.map((p) => p[1]))];
  const { crs } = chooseWorkCrs(bbox);
  const lines: LineGeometry[] = [a, b].map((pts, i) => ({ id: `l${i}`, parts: [Float64Array.from(pts.flatMap((p) => crs.forward(p)))] }));
  const stations = placeStations(lines, 50);
  const facings = castTransects(lines, stations, { maxGapM: 3000, maxAngleDeg: 10 });
  const strips = buildStrips(lines, stations, facings);
  expect(strips).toHaveLength(1);
  const ratio = strips[0].spacingMeanM / geodesicM;
  expect(Math.abs(ratio - 1)).toBeLessThan(0.002);
  expect(Math.abs(ratio / scaleAt(crs, [(bbox[0] + bbox[2]) / 2, (bbox[1] + bbox[3]) / 2]) - 1)).toBeLessThan(1e-4);
}

// lines a few km long, placed on a zone's central meridian (UTM scale 0.9996 there) so that the
// projection's own scale error (0.04%) stays well inside the 0.2% allowed
const centralMeridian = (lon: number): number => utmZone(lon) * 6 - 183;

describe('spacing against geodesic distances on WGS 84', () => {
  const geod = GeographicLib.Geodesic.WGS84;

  for (const lat of [0, 30, 50, 65]) {
    it(`two parallels of latitude 0.005 degrees apart at ${lat} N`, () => {
      const lon = centralMeridian(31);
      const a = lonLatLine('a', [lon - 0.03, lat], [lon + 0.03, lat]);
      const b = lonLatLine('b', [lon - 0.03, lat + 0.005], [lon + 0.03, lat + 0.005]);
      // C.F.F. Karney (2013), Algorithms for geodesics, J. Geodesy 87 [published]: inverse problem
      const expected = geod.Inverse(lat, lon, lat + 0.005, lon).s12 ?? NaN;
      expectSpacing(a, b, expected);
    });

    it(`two meridians 0.5 km apart at ${lat} N`, () => {
      const lon = centralMeridian(31);
      const dLon = 500 / (111_320 * Math.cos((lat * Math.PI) / 180));
      const a = lonLatLine('a', [lon, lat], [lon, lat + 0.03]);
      const b = lonLatLine('b', [lon + dLon, lat], [lon + dLon, lat + 0.03]);
      // C.F.F. Karney (2013), Algorithms for geodesics, J. Geodesy 87 [published]: inverse problem
      const expected = geod.Inverse(lat + 0.015, lon, lat + 0.015, lon + dLon).s12 ?? NaN;
      expectSpacing(a, b, expected);
    });
  }
});
