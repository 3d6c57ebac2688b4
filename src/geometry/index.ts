export { buildLineTable, cutByChainage, lineLengthM, type LineGeometry, type LineTable } from './lines.js';
export { placeStations, type StationTable } from './stations.js';
export {
  castTransects,
  FACING_PAIRED,
  FACING_NO_PARTNER,
  FACING_NOT_PARALLEL,
  FACING_OUTSIDE_AQUIFER,
  FACING_REASON_NAMES,
  type CastOptions,
  type FacingTable,
} from './transects.js';
export { buildStrips, type Strip, type StripOptions } from './strips.js';
export { buildZoneIndex, cutTransect, zonePolygons, type TransectCut, type ZoneIndex, type ZonePolygons } from './zones.js';
