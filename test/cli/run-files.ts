// Every file of a run as text, for tests that compare two runs byte for byte: the run record and
// the report without when the run started and its command line (which differ between any two runs),
// the GeoPackage by its layers (it holds the run record as metadata).
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';
import { gpkgLayersText } from '../output/gpkg-layers.js';

export function runFiles(out: string, check: (record: { command_line: string[]; settings: object }) => void = () => {}): Map<string, string> {
  const files = new Map<string, string>();
  for (const name of readdirSync(out).sort()) {
    let text = readFileSync(join(out, name), 'latin1');
    if (name === 'run.json') {
      const record = JSON.parse(text);
      check(record);
      delete record.started_at;
      delete record.command_line;
      text = JSON.stringify(record);
    }
    if (name === 'doab.gpkg') text = gpkgLayersText(join(out, name));
    if (name === 'report.html') {
      text = text
        .replace(/\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d+Z/g, 'START')
        .replace(/\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC/g, 'START')
        .replace(/<td class="hash">doab (screen|gather) [^<]*<\/td>/, '<td class="hash">COMMAND</td>');
    }
    files.set(name, text);
  }
  return files;
}

export function expectSameFiles(one: Map<string, string>, other: Map<string, string>, label: string): void {
  expect([...other.keys()], label).toEqual([...one.keys()]);
  for (const [name, text] of one) expect(other.get(name) === text, `${name}, ${label}`).toBe(true);
}
