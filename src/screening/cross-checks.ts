// Checks that need lines and zones together, or zones against each other: a line's stage at or
// below the aquifer base under it (an error: the strip solution cannot hold), a stage far above
// ground, and zones that overlap. Runs on valid records, in lon/lat, before projection.
import type Flatbush from 'flatbush';
import { area } from '@turf/area';
import { centroid } from '@turf/centroid';
import { featureCollection, multiPolygon, polygon } from '@turf/helpers';
import { union } from '@turf/union';
import { boxIndex } from '../geometry/box-index.js';
import { buildLineTable } from '../geometry/lines.js';
import { boundsOfParts, chooseWorkCrs, projectPositions } from '../geometry/work-crs.js';
import { pointInOutline, zoneOutline, type ZoneOutline } from '../geometry/zone-outlines.js';
import { overlapKey, zoneOverlay, type ZoneHole } from '../geometry/zone-overlay.js';
import type { Problem } from '../shared/errors.js';
import { stageAtChainage, type LineRecord, type ZoneRecord } from './district-inputs.js';

// An embankment canal stands a few metres above the land at most; more is most often a datum
// or unit mix-up (common practice).
export const STAGE_ABOVE_GROUND_WARN_M = 5;
// Overlaps smaller than this (m^2) are digitising slivers along shared edges.
const OVERLAP_TOLERANCE_M2 = 1;

export interface CrossCheckFiles {
  lines: string;
  zones: string;
}

/** Each zone's outline with its edge index, and an index of the zones' boxes. */
function zoneOutlines(zones: ZoneRecord[]): { outlines: ZoneOutline[]; index: Flatbush | null } {
  const outlines = zones.map((zone) => zoneOutline(zone.polygonsLonLat));
  if (zones.length === 0) return { outlines, index: null };
  const index = boxIndex(outlines.length, (i, add) => add(outlines[i].minX, outlines[i].minY, outlines[i].maxX, outlines[i].maxY));
  return { outlines, index };
}

/**
 * Stage against base and ground under every vertex of each line, and overlaps and holes between
 * zones. The stage at a vertex is interpolated by the same chainage the solve uses: planar, in the
 * work CRS (`workCrs`, the user's or null for the UTM zone of the lines' centre).
 */
export function crossCheck(
  lines: LineRecord[],
  zones: ZoneRecord[],
  files: CrossCheckFiles,
  workCrs: string | null = null,
): { problems: Problem[]; badLines: Set<number> } {
  const problems: Problem[] = [];
  const badLines = new Set<number>();
  const { outlines, index } = zoneOutlines(zones);
  if (!index) return { problems, badLines };

  // overlaps and holes from the zones' edges: the cost follows the edges near other zones, not every vertex
  const overlay = zoneOverlay(outlines);
  outlines.forEach((outline, i) => {
    for (const j of index.search(outline.minX, outline.minY, outline.maxX, outline.maxY)) {
      if (j <= i) continue;
      const overlapM2 = overlay.overlapM2.get(overlapKey(i, j, zones.length)) ?? 0;
      if (overlapM2 > OVERLAP_TOLERANCE_M2) {
        problems.push({
          severity: 'warning',
          place: { file: files.zones, featureIndex: zones[j].featureIndex, featureId: zones[j].id, field: 'geometry' },
          message: `overlaps zone "${zones[i].id}" (feature ${zones[i].featureIndex}) over ${(overlapM2 / 10_000).toFixed(2)} ha; where zones overlap doab uses the one listed first`,
        });
      }
    }
  });

  if (zones.length >= 2) for (const item of holeProblems(overlay.holes ?? holesByUnion(zones), files.zones)) problems.push(item);

  const crs = lines.length > 0 ? chooseWorkCrs(boundsOfParts(lines.map((line) => line.partsLonLat)), workCrs ?? undefined).crs : null;
  const outside: string[] = [];
  lines.forEach((line, lineNumber) => {
    const table = buildLineTable([{ id: line.id, parts: line.partsLonLat.map((part) => projectPositions(crs!, part)) }]);
    const lengthM = table.chainageM[table.chainageM.length - 1];
    let vertex = 0, reported = false, warned = false, inside = false;
    for (const part of line.partsLonLat) {
      for (let p = 0; p < part.length; p += 2) {
        const chainageM = table.chainageM[vertex++];
        if (reported) continue;
        const stageM = stageAtChainage(line, chainageM, lengthM);
        const lon = part[p], lat = part[p + 1];
        for (const z of index.search(lon, lat, lon, lat)) {
          if (!pointInOutline(outlines[z], lon, lat)) continue;
          inside = true;
          const zone = zones[z];
          const place = { file: files.lines, featureIndex: line.index, featureId: line.id, field: line.stageField };
          if (stageM <= zone.baseM) {
            problems.push({ severity: 'error', place, message: `stage ${round(stageM)} m at chainage ${Math.round(chainageM)} m is at or below the aquifer base ${zone.baseM} m of zone "${zone.id}"` });
            badLines.add(lineNumber);
            reported = true;
          } else if (!warned && stageM > zone.groundM + STAGE_ABOVE_GROUND_WARN_M) {
            problems.push({ severity: 'warning', place, message: `stage ${round(stageM)} m at chainage ${Math.round(chainageM)} m is ${round(stageM - zone.groundM)} m above the ground of zone "${zone.id}" (${zone.groundM} m); check the datum and units` });
            warned = true;
          }
          break;
        }
      }
    }
    if (!inside) outside.push(line.id);
  });
  if (outside.length > 0) {
    const named = outside.slice(0, 5).map((id) => `"${id}"`).join(', ') + (outside.length > 5 ? `, ... (${outside.length} in all)` : '');
    problems.push({
      severity: outside.length === lines.length ? 'error' : 'warning',
      place: { file: files.lines },
      message:
        outside.length === lines.length
          ? `none of the ${lines.length} lines has a vertex inside any zone of ${files.zones}: nothing could be solved; do both files cover the same place (and CRS)?`
          : `${outside.length} of ${lines.length} lines have no vertex inside any zone of ${files.zones} (${named}): nothing is computed for them`,
    });
  }
  return { problems, badLines };
}

function round(value: number): number {
  return Math.round(value * 100) / 100;
}

// Larger holes than this (m^2) inside the zones' union are worth a warning: a 100 m transect
// crossing a sliver 2 m wide covers 200 m^2.
const HOLE_WARN_M2 = 100;

/** A warning for each hole larger than HOLE_WARN_M2 that the zones together leave inside the aquifer. */
function holeProblems(holes: ZoneHole[], file: string): Problem[] {
  return holes
    .filter((hole) => hole.areaM2 > HOLE_WARN_M2)
    .map(({ areaM2, lon, lat }) => ({
      severity: 'warning',
      place: { file, field: 'geometry' },
      message: `the zones leave a gap of ${areaM2 < 10_000 ? `${Math.round(areaM2)} m2` : `${(areaM2 / 10_000).toFixed(2)} ha`} between them near lon ${lon.toFixed(5)}, lat ${lat.toFixed(5)}; ` +
        'transects that cross it are joined to a neighbour zone when the gap is small (up to 2 m or 1% of the transect), else left unsolved',
    }));
}

/**
 * The holes of the zones' union by turf's union, for the rare layout whose union rings the edge
 * overlay could not close (edges that meet within rounding in more ways than it resolves).
 */
function holesByUnion(zones: ZoneRecord[]): ZoneHole[] {
  let merged;
  try {
    merged = union(featureCollection(zones.map((zone) => multiPolygon(zone.polygonsLonLat))));
  } catch {
    return [];
  }
  if (!merged) return [];
  const polygons = merged.geometry.type === 'Polygon' ? [merged.geometry.coordinates] : merged.geometry.coordinates;
  const holes: ZoneHole[] = [];
  for (const rings of polygons as number[][][][]) {
    for (const hole of rings.slice(1)) {
      const [lon, lat] = centroid(polygon([hole])).geometry.coordinates;
      holes.push({ areaM2: area(polygon([hole])), lon, lat });
    }
  }
  return holes;
}
