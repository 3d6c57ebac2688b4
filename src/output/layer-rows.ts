// What the database writers (the GeoPackage and PostGIS) share besides the layers' records
// (layers.ts gives those as a reader of the GeoJSON gets them back): rings closed as WKB wants
// them; quoted SQL identifiers; the WKB geometry type codes.

/** A strip's ring closed, as WKB wants it. */
export function closedRing(ringM: Float64Array): Float64Array {
  const n = ringM.length;
  if (n >= 2 && ringM[0] === ringM[n - 2] && ringM[1] === ringM[n - 1]) return ringM;
  const ring = new Float64Array(n + 2);
  ring.set(ringM);
  ring[n] = ringM[0];
  ring[n + 1] = ringM[1];
  return ring;
}

/** An SQL identifier, double-quoted with its own quotes doubled. */
export const quoteId = (name: string) => `"${name.replace(/"/g, '""')}"`;

// OGC Simple Features, well-known binary geometry types [published]
export const WKB_LINESTRING = 2, WKB_POLYGON = 3, WKB_MULTILINESTRING = 5;
