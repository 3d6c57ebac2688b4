// Ground from a DEM in the strips, against closed forms: between a canal and a drain with no
// recharge the water table is h(x)^2 = h0^2 - (h0^2 - hL^2) x/L (Dupuit-Forchheimer; Bear (1972),
// Dynamics of Fluids in Porous Media, section 8.2 [from memory]); over a tilted plane and a valley
// written as GeoTIFFs in the test, the strip's smallest depth is that of ground less h.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeArrayBuffer } from 'geotiff';
import { describe, expect, it } from 'vitest';
import { readDem } from '../../src/input/read-dem.js';
import { keyFacing, profileOfFacing } from '../../src/screening/profile.js';
import { screenDistrict } from '../../src/screening/screen.js';
import { box, checkedLocal, line } from './local-district.js';
import { checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';

const E0 = 300_000, N0 = 3_265_000; // the layout's origin in UTM zone 36N (local-district.ts)
const BASE = 90, H0 = 15, HL = 12, L = 400, LENGTH = 2000, BANK = 10;
const dir = mkdtempSync(join(tmpdir(), 'doab-dem-ground-'));

/** A DEM over the layout (UTM zone 36N, 10 m pixels) of ground(x, y) in the layout's metres. */
function demFile(name: string, ground: (x: number, y: number) => number, [x0, y0, x1, y1] = [-200, -700, 2200, 300]): string {
  const pixel = 10, width = (x1 - x0) / pixel, height = (y1 - y0) / pixel;
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) values[r * width + c] = ground(x0 + (c + 0.5) * pixel, y1 - (r + 0.5) * pixel);
  // GeoTIFF 1.0 specification (N. Ritter, M. Ruth, 1995) [published] keys
  const buffer = writeArrayBuffer(values, {
    width, height, BitsPerSample: [32], SampleFormat: [3], ModelPixelScale: [pixel, pixel, 0], ModelTiepoint: [0, 0, 0, E0 + x0, N0 + y1, 0],
    GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32636, GDAL_NODATA: '-9999',
  } as unknown as Parameters<typeof writeArrayBuffer>[1]);
  const path = join(dir, name);
  writeFileSync(path, new Uint8Array(buffer));
  return path;
}

async function screenOver(ground: (x: number, y: number) => number, extent?: [number, number, number, number], zoneGround: number | null = 130) {
  const dem = await readDem(demFile(`${Math.random().toString(36).slice(2)}.tif`, ground, extent), { maxInputMB: 100 });
  const zoneFeatures = [box('Z', { k_m_d: 10, base_m: BASE, recharge_mm_yr: 0, ...(zoneGround === null ? {} : { ground_m: zoneGround }) }, [0, -L, LENGTH, 0])];
  const { lines, settings } = checkedLocal(
    [line('C', { kind: 'canal', stage_m: BASE + H0 }, [[0, 0], [LENGTH, 0]]), line('D', { kind: 'drain', stage_m: BASE + HL }, [[0, -L], [LENGTH, -L]])],
    [box('Z', { k_m_d: 10, base_m: BASE, ground_m: 130, recharge_mm_yr: 0 }, [0, -L, LENGTH, 0])],
    { stripsOnly: true },
  );
  // with a DEM a zone may leave out its ground level
  const checked = checkZones('zones.geojson', zoneFeatures, DEFAULT_RULES, { groundFromDem: true });
  expect(checked.problems.filter((p) => p.severity === 'error')).toEqual([]);
  const zones = checked.records;
  return screenDistrict(lines, zones, settings, undefined, { dem: { grid: dem.grid, fromLonLat: dem.fromLonLat, pixelM: dem.pixelM, label: 'dem.tif' } });
}

const head = (x: number) => BASE + Math.sqrt(H0 ** 2 - ((H0 ** 2 - HL ** 2) * x) / L);
/** The smallest of ground less water table between the banks, on a fine grid of x from the canal. */
function closedMinDepth(groundAtX: (x: number) => number): number {
  let min = Infinity;
  for (let x = BANK; x <= L - BANK; x += 0.01) min = Math.min(min, groundAtX(x) - head(x));
  return min;
}

describe('ground from a DEM in the strips', () => {
  it('over a tilted plane, gives the smallest depth of the closed form', async () => {
    // the ground rises 1 m in 100 m away from the canal: the water table is shallowest by the canal
    const result = await screenOver((_x, y) => 104 - 0.01 * y);
    const want = closedMinDepth((x) => 104 + 0.01 * x);
    expect(result.strips).toHaveLength(1);
    expect(result.strips[0].minDepthM).toBeCloseTo(want, 2);
    // the zone's own ground (130 m) would say 15 m deeper: the DEM's is what counts
    expect(result.warnings.join('\n')).toMatch(/ground from the DEM dem\.tif/);
  });

  it('over a valley midway, finds the shallowest water table in the valley', async () => {
    // its bottom on a pixel centre (the DEM's pixel centres lie at 5 m + multiples of 10 m): bilinear is exact on each flank
    const valley = (d: number) => 104.5 + 0.02 * Math.abs(d - 195);
    const result = await screenOver((_x, y) => valley(-y));
    expect(result.strips[0].minDepthM).toBeCloseTo(closedMinDepth(valley), 2);
    // the cross-section draws the sampled ground: its lowest ground is the valley's bottom
    const strip = result.strips[0];
    const profile = profileOfFacing(result, strip, keyFacing(result, strip))!;
    expect(Math.min(...profile.groundM)).toBeCloseTo(104.5, 1);
    // its smallest depth is its own transect's, over the same sampled ground: never below the strip's smallest
    expect(profile.minDepthM).toBeGreaterThanOrEqual(strip.minDepthM - 1e-9);
    expect(profile.minDepthM - strip.minDepthM).toBeLessThan(0.05);
  });

  it('needs no zone ground where the DEM covers the strip, and leaves sides with no ground at all unsolved', async () => {
    const covered = await screenOver((_x, y) => 104 - 0.01 * y, undefined, null);
    expect(covered.strips[0].minDepthM).toBeCloseTo(closedMinDepth((x) => 104 + 0.01 * x), 2);
    // the DEM covers the western half and no zone ground backs it: the eastern sides are left unsolved, with their reason
    const half = await screenOver((_x, y) => 104 - 0.01 * y, [-200, -700, 1000, 300], null);
    expect(half.warnings.join('\n')).toMatch(/transect sides have no ground at all \(no DEM data, no ground_m\) and are left unsolved \(no-ground\)/);
    expect(half.strips.flatMap((s) => s.flags).join(';')).toMatch(/unsolved-\d+:no-ground/);
  });

  it('takes the zone ground where the DEM has none, and says so', async () => {
    // the DEM covers only the western half of the strip
    const result = await screenOver((_x, y) => 104 - 0.01 * y, [-200, -700, 1000, 300]);
    expect(result.warnings.join('\n')).toMatch(/samples \(on \d+ transects\) fell where the DEM has no data and took their zone's ground_m/);
    // the smallest depth is still the DEM's where it covers the strip
    expect(result.strips[0].minDepthM).toBeCloseTo(closedMinDepth((x) => 104 + 0.01 * x), 2);
  });
});
