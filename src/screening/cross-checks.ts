// Checks that need lines and zones together, or zones against each other: a line's stage at or
// below the aquifer base under it (an error: the strip solution cannot hold), a stage far above
// ground, and zones that overlap. Runs on valid records, in lon/lat, before projection.
import Flatbush from 'flatbush';
import { area } from '@turf/area';
import { bbox } from '@turf/bbox';
import { booleanPointInPolygon } from '@turf/boolean-point-in-polygon';
import { centroid } from '@turf/centroid';
import { featureCollection, multiPolygon, polygon } from '@turf/helpers';
import { intersect } from '@turf/intersect';
import { union } from '@turf/union';
import type { Feature, MultiPolygon } from 'geojson';
import { buildLineTable } from '../geometry/lines.js';
import { boundsOfParts, chooseWorkCrs, projectPositions } from '../geometry/work-crs.js';
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

function zoneShapes(zones: ZoneRecord[]): { shapes: Feature<MultiPolygon>[]; index: Flatbush | null } {
  const shapes = zones.map((zone) => multiPolygon(zone.polygonsLonLat));
  if (zones.length === 0) return { shapes, index: null };
  const index = new Flatbush(zones.length);
  for (const shape of shapes) {
    const [w, s, e, n] = bbox(shape);
    index.add(w, s, e, n);
  }
  index.finish();
  return { shapes, index };
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
  const { shapes, index } = zoneShapes(zones);
  if (!index) return { problems, badLines };

  shapes.forEach((shape, i) => {
    const [w, s, e, n] = bbox(shape);
    for (const j of index.search(w, s, e, n)) {
      if (j <= i) continue;
      const overlap = intersect(featureCollection([shape, shapes[j]]));
      const overlapM2 = overlap ? area(overlap) : 0;
      if (overlapM2 > OVERLAP_TOLERANCE_M2) {
        problems.push({
          severity: 'warning',
          place: { file: files.zones, featureIndex: zones[j].featureIndex, featureId: zones[j].id, field: 'geometry' },
          message: `overlaps zone "${zones[i].id}" (feature ${zones[i].featureIndex}) over ${(overlapM2 / 10_000).toFixed(2)} ha; where zones overlap doab uses the one listed first`,
        });
      }
    }
  });

  for (const item of holesBetweenZones(shapes, files.zones)) problems.push(item);

  const crs = lines.length > 0 ? chooseWorkCrs(boundsOfParts(lines.map((line) => line.partsLonLat)), workCrs ?? undefined).crs : null;
  const outside: string[] = [];
  lines.forEach((line, lineNumber) => {
    const table = buildLineTable([{ id: line.id, parts: line.partsLonLat.map((part) => projectPositions(crs!, part)) }]);
    const lengthM = table.chainageM[table.chainageM.length - 1];
    let vertex = 0, reported = false, warned = false, inside = false;
    for (const part of line.partsLonLat) {
      part.forEach((position) => {
        const chainageM = table.chainageM[vertex++];
        if (reported) return;
        const stageM = stageAtChainage(line, chainageM, lengthM);
        for (const z of index.search(position[0], position[1], position[0], position[1])) {
          if (!booleanPointInPolygon(position, shapes[z])) continue;
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
      });
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

/** Holes that the zones together leave inside the aquifer: gaps between zones that should share an edge. */
function holesBetweenZones(shapes: Feature<MultiPolygon>[], file: string): Problem[] {
  if (shapes.length < 2) return [];
  let merged;
  try {
    merged = union(featureCollection(shapes));
  } catch {
    return [];
  }
  if (!merged) return [];
  const polygons = merged.geometry.type === 'Polygon' ? [merged.geometry.coordinates] : merged.geometry.coordinates;
  const problems: Problem[] = [];
  for (const rings of polygons as number[][][][]) {
    for (const hole of rings.slice(1)) {
      const holeArea = area(polygon([hole]));
      if (holeArea <= HOLE_WARN_M2) continue;
      const [lon, lat] = centroid(polygon([hole])).geometry.coordinates;
      problems.push({
        severity: 'warning',
        place: { file, field: 'geometry' },
        message: `the zones leave a gap of ${holeArea < 10_000 ? `${Math.round(holeArea)} m2` : `${(holeArea / 10_000).toFixed(2)} ha`} between them near lon ${lon.toFixed(5)}, lat ${lat.toFixed(5)}; ` +
          'transects that cross it are joined to a neighbour zone when the gap is small (up to 2 m or 1% of the transect), else left unsolved',
      });
    }
  }
  return problems;
}
