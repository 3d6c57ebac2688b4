// A GeoPackage's layers as text, for tests that compare runs whose run records differ (the
// GeoPackage holds the run record, with its start time and command line, as metadata).
import Database from 'better-sqlite3';

export function gpkgLayersText(path: string): string {
  const db = new Database(path, { readonly: true });
  try {
    const tables = db.prepare("SELECT table_name FROM gpkg_contents WHERE table_name <> 'layer_styles' ORDER BY table_name").all() as { table_name: string }[];
    const dump: Record<string, unknown[]> = {};
    for (const { table_name: table } of tables) {
      dump[table] = (db.prepare(`SELECT * FROM "${table.replace(/"/g, '""')}" ORDER BY fid`).all() as Record<string, unknown>[]).map((row) =>
        Object.fromEntries(Object.entries(row).map(([key, value]) => [key, Buffer.isBuffer(value) ? value.toString('hex') : value])),
      );
    }
    return JSON.stringify(dump);
  } finally {
    db.close();
  }
}
