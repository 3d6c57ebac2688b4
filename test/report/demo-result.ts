// The demo district screened in-process, as `doab screen` does with default settings, for the
// report tests; and a copy of its data with hostile text injected.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { loadDistrict } from '../../src/input/load-district.js';
import type { ReportMeta } from '../../src/report/report.js';
import { defaultConfig } from '../../src/input/config.js';
import { screenDistrict, type ScreenResult } from '../../src/screening/screen.js';
import type { ScreenSettings } from '../../src/shared/settings.js';

export const ROOT = resolve(import.meta.dirname, '../..');
export const DEMO_CANALS = join(ROOT, 'data-demo/canals.geojson');
export const DEMO_AQUIFER = join(ROOT, 'data-demo/aquifer.geojson');

/** Screens with the default settings, or these over them (stripsOnly for tests that draw only strips: the district solve takes seconds). */
export async function screenFiles(canals: string, aquifer: string, settings: Partial<ScreenSettings> = {}): Promise<{ result: ScreenResult; meta: ReportMeta }> {
  const config = defaultConfig();
  Object.assign(config.settings, settings);
  const district = await loadDistrict(canals, aquifer, config);
  const errors = district.problems.filter((p) => p.severity === 'error');
  if (errors.length > 0 || !district.canals || !district.aquifer) throw new Error(`demo inputs have problems: ${JSON.stringify(errors)}`);
  const result = screenDistrict(district.lines, district.zones, config.settings);
  const meta: ReportMeta = {
    version: '0.0.0-test',
    commandLine: ['doab', 'screen', '--canals', canals, '--aquifer', aquifer, '--out', 'out dir'],
    inputs: [
      { label: 'canals', path: canals, sha256: district.canals.sha256, sourceCrs: district.canals.sourceCrs },
      { label: 'aquifer', path: aquifer, sha256: district.aquifer.sha256, sourceCrs: district.aquifer.sourceCrs },
    ],
    rules: config.rules,
  };
  return { result, meta };
}

export const HOSTILE_NAME = '<script>alert(1)</script>';
export const HOSTILE_ID = `C-01&"'<>`;

/** The demo data with C-01 renamed to HOSTILE_ID and its name set to HOSTILE_NAME. */
export function hostileDemoCopy(): { canals: string; aquifer: string } {
  const dir = mkdtempSync(join(tmpdir(), 'doab-report-'));
  const collection = JSON.parse(readFileSync(DEMO_CANALS, 'utf8'));
  const feature = collection.features.find((f: { properties: { id: string } }) => f.properties.id === 'C-01');
  if (!feature) throw new Error('the demo district has no line C-01');
  feature.properties.id = HOSTILE_ID;
  feature.properties.name = HOSTILE_NAME;
  const canals = join(dir, 'canals.geojson');
  writeFileSync(canals, JSON.stringify(collection));
  return { canals, aquifer: DEMO_AQUIFER };
}
