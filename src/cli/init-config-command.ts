// `doab init-config`: a commented starting config, with doab's fields matched to the attributes
// found in the user's files where a name makes the match plain, and every attribute listed.
import { existsSync, lstatSync } from 'node:fs';
import { basename, dirname } from 'node:path';
import { CONDUCTIVITY_UNITS, DEFAULT_RULES, filesOfInput, RECHARGE_UNITS, readFeatureFile, realPathOf, SETTINGS, SETTING_KEYS, UsageError, writeAllOrNothing, type SettingKey } from '../index.js';
import type { CliIo } from './io.js';

export interface InitConfigOptions {
  canals: string;
  aquifer: string;
  out: string;
  inputCrs?: string;
  force?: boolean;
}

// Attribute names that plainly mean one of doab's fields, compared without case or separators.
const ALIASES: Record<string, string[]> = {
  'lines.id': ['id', 'lineid', 'canalid', 'code', 'fid'],
  'lines.kind': ['kind', 'type', 'class', 'linetype'],
  'lines.name': ['name', 'canalname', 'label'],
  'lines.stage': ['stagem', 'stage', 'wl', 'waterlevel', 'fsl', 'level'],
  'lines.stageStart': ['stagestartm', 'stagestart', 'wlstart', 'wlup', 'fslstart', 'levelstart'],
  'lines.stageEnd': ['stageendm', 'stageend', 'wlend', 'wldown', 'fslend', 'levelend'],
  'zones.id': ['id', 'zoneid', 'zone', 'code', 'fid'],
  'zones.k': ['kmd', 'k', 'ksat', 'conductivity', 'hydcond'],
  'zones.base': ['basem', 'base', 'bottom', 'bot', 'aquiferbase'],
  'zones.ground': ['groundm', 'ground', 'gl', 'dem', 'surface', 'elevation', 'elev'],
  'zones.recharge': ['rechargemmyr', 'recharge', 'netrecharge'],
  'zones.edgeHead': ['edgeheadm', 'edgehead', 'boundaryhead'],
  'lines.bedResistance': ['bedresistanced', 'bedresistance', 'resistance', 'clogging'],
  'lines.wettedPerimeter': ['wettedperimeterm', 'wettedperimeter', 'perimeter'],
  'lines.bottomWidth': ['bottomwidthm', 'bottomwidth', 'bedwidth'],
  'lines.waterDepth': ['waterdepthm', 'waterdepth', 'flowdepth'],
  'zones.kLow': ['klowmd', 'klow', 'kmin'],
  'zones.kHigh': ['khighmd', 'khigh', 'kmax'],
  'zones.kLogSd': ['klogsd', 'lnksd', 'sdlnk'],
};

/** Fields a file may leave out: said as optional where not found, never as missing. */
const OPTIONAL_FIELDS = new Set(['edgeHead', 'bedResistance', 'wettedPerimeter', 'bottomWidth', 'waterDepth', 'kLow', 'kHigh', 'kLogSd']);

interface AttributeSummary {
  name: string;
  types: Set<string>;
  sample: unknown;
}

/** The distinct values an attribute takes, the first 20 of them (text as it is written). */
function distinctValues(features: unknown[], name: string): string[] {
  const values = new Set<string>();
  for (const feature of features) {
    const properties = (feature as { properties?: unknown } | null)?.properties;
    if (properties === null || typeof properties !== 'object') continue;
    const value = (properties as Record<string, unknown>)[name];
    if (typeof value === 'string' || typeof value === 'number') values.add(String(value).slice(0, 40));
    if (values.size >= 20) break;
  }
  return [...values];
}

function attributesOf(features: unknown[]): AttributeSummary[] {
  const found = new Map<string, AttributeSummary>();
  for (const feature of features.slice(0, 1000)) {
    const properties = (feature as { properties?: unknown } | null)?.properties;
    if (properties === null || typeof properties !== 'object') continue;
    for (const [name, value] of Object.entries(properties as object)) {
      const entry = found.get(name) ?? { name, types: new Set<string>(), sample: value };
      entry.types.add(value === null ? 'null' : typeof value);
      found.set(name, entry);
    }
  }
  return [...found.values()];
}

const squash = (name: string) => name.toLowerCase().replace(/[^a-z0-9]/g, '');

function match(key: string, attributes: AttributeSummary[], fallback: string): { name: string; found: boolean } {
  for (const alias of ALIASES[key]) {
    const hit = attributes.find((a) => squash(a.name) === alias);
    if (hit) return { name: hit.name, found: true };
  }
  return { name: fallback, found: false };
}

function listing(attributes: AttributeSummary[]): string {
  if (attributes.length === 0) return '  //   (no attributes found)\n';
  return attributes.map((a) => `  //   ${a.name} (${[...a.types].join('/')}), e.g. ${JSON.stringify(a.sample)?.slice(0, 40)}\n`).join('');
}

/** One line per setting of the table (but the advanced ones and inputCrs, said above), with its default and doc. */
function settingLines(): string {
  const shown = SETTING_KEYS.filter((key) => !SETTINGS[key].advanced && key !== 'inputCrs');
  const line = (name: string, key: SettingKey, indent: string) => {
    const spec = SETTINGS[key];
    return `${indent}${JSON.stringify(name)}: ${JSON.stringify(spec.default)}, // ${spec.doc}${spec.unit && spec.unit !== 'fraction' ? `, ${spec.unit}` : ''}`;
  };
  const top = shown.filter((key) => !key.includes('.')).map((key) => line(key, key, '  '));
  const risk = shown.filter((key) => key.startsWith('risk.')).map((key) => line(key.slice(5), key, '    '));
  // the risk defaults: Government of India, Ministry of Water Resources working group on waterlogging (1991)
  return [
    ...top,
    '  // Risk classes from the smallest depth to the water table; defaults from the Government of India,',
    '  // Ministry of Water Resources working group on waterlogging (1991).',
    '  "risk": {',
    risk.join('\n').replace(/,( \/\/[^\n]*)$/, '$1'),
    '  }',
  ].join('\n');
}

export async function initConfigCommand(options: InitConfigOptions, io: CliIo): Promise<number> {
  // never over an input, whatever --force says; over any other file only with --force
  const inputs = [options.canals, options.aquifer].flatMap((path) => filesOfInput(path));
  const target = realPathOf(options.out);
  const input = inputs.find((path) => realPathOf(path) === target);
  if (options.out.trim() === '') throw new UsageError('--out is empty: name the config file to write', 'out');
  if (input !== undefined) throw new UsageError(`--out ${options.out} is your input ${input}; name another file for the config`, 'out');
  // a folder or a link is no config to replace, --force or not
  if (existsSync(options.out) && !lstatSync(options.out).isFile()) throw new UsageError(`--out ${options.out} is not a regular file; name a file for the config`, 'out');
  if (existsSync(options.out) && !options.force) throw new UsageError(`--out ${options.out} already exists; give --force to replace it, or another --out`, 'out');
  const canals = await readFeatureFile(options.canals, { inputCrs: options.inputCrs });
  const aquifer = await readFeatureFile(options.aquifer, { inputCrs: options.inputCrs });
  const lineAttributes = attributesOf(canals.features);
  const zoneAttributes = attributesOf(aquifer.features);
  const matched = (section: 'lines' | 'zones', key: string) =>
    match(`${section}.${key}`, section === 'lines' ? lineAttributes : zoneAttributes, (DEFAULT_RULES.fields[section] as unknown as Record<string, string>)[key]);
  // one stage field, or a start and end pair, is enough: the other form is not missing
  const stageSingle = matched('lines', 'stage').found;
  const stagePair = matched('lines', 'stageStart').found && matched('lines', 'stageEnd').found;
  const field = (section: 'lines' | 'zones', key: string, comment: string) => {
    const hit = matched(section, key);
    const alternative = (key === 'stage' && stagePair) || ((key === 'stageStart' || key === 'stageEnd') && stageSingle);
    const optional = OPTIONAL_FIELDS.has(key);
    const note = hit.found
      ? comment
      : alternative
        ? `${comment}; not in your file, and not needed: the other stage form is`
        : optional
          ? `${comment}; not in your file${key === 'edgeHead' ? ", so no flow across the aquifer's outer edge" : ''}`
          : `${comment}; NOT FOUND in your file: pick one of the attributes listed above`;
    return `      ${JSON.stringify(key)}: ${JSON.stringify(hit.name)}, // ${note}`;
  };
  const kindHit = matched('lines', 'kind');
  const kindValues = kindHit.found ? distinctValues(canals.features, kindHit.name) : [];
  const command = (verb: string) =>
    ['doab', verb, '--canals', options.canals, '--aquifer', options.aquifer, '--config', options.out].map((word) => (/^[\w./:-]+$/.test(word) ? word : `'${word.replace(/'/g, "'\\''")}'`)).join(' ');
  const crsLine = canals.sourceCrs ?? aquifer.sourceCrs;
  const text = `// doab config, started by \`doab init-config\` from ${basename(options.canals)} and ${basename(options.aquifer)}.
// JSON with comments. Every key is optional; delete what you do not need. Options given on the
// command line win over this file. Check the result, then screen, with:
//   ${command('check')}
//   ${command('screen')} --out doab-out
{
  // Which of your attributes holds each of doab's fields.
  // Attributes found in ${basename(options.canals)}:
${listing(lineAttributes)}  // Attributes found in ${basename(options.aquifer)}:
${listing(zoneAttributes)}  "fields": {
    "lines": {
${field('lines', 'id', 'unique text id of each line')}
${field('lines', 'kind', 'canal or drain (see kindWords)')}
${field('lines', 'name', 'optional name')}
${field('lines', 'stage', 'water level, constant along the line')}
${field('lines', 'stageStart', 'or: water level at the first vertex')}
${field('lines', 'stageEnd', 'and at the last vertex')}
${field('lines', 'bedResistance', 'optional: the bed\'s resistance to seepage, days (0: a clean bed)')}
${field('lines', 'wettedPerimeter', 'optional: wetted perimeter, in units.elevation (needed with a bed resistance, or the two below)')}
${field('lines', 'bottomWidth', 'optional: bottom width, and')}
${field('lines', 'waterDepth', 'optional: water depth, in units.elevation')}
    },
    "zones": {
${field('zones', 'id', 'unique text id of each zone')}
${field('zones', 'k', 'hydraulic conductivity, in units.k')}
${field('zones', 'base', 'aquifer base elevation, in units.elevation')}
${field('zones', 'ground', 'ground elevation, in units.elevation')}
${field('zones', 'recharge', 'areal recharge, in units.recharge')}
${field('zones', 'edgeHead', 'optional: the head held where the zone meets the aquifer\'s outer edge (else no flow there), in units.elevation')}
${field('zones', 'kLow', 'optional, for --samples: K range, P10, in units.k')}
${field('zones', 'kHigh', 'optional, for --samples: K range, P90, in units.k')}
${field('zones', 'kLogSd', 'optional, for --samples: or the standard deviation of ln K')}
    },
    // The wells file of --wells (points): its id, the observed water-table elevation (units.elevation) and an optional date.
    "wells": { "id": "id", "observed": "water_table_m", "date": "date" }
  },
  // Your words for the two kinds of line (compared without case).${kindValues.length > 0 ? `\n  // Values of "${kindHit.name}" in your file: ${kindValues.map((value) => JSON.stringify(value)).join(', ')}` : ''}
  "kindWords": { "canal": ["canal"], "drain": ["drain"] },
  // Units of your attributes: k in ${CONDUCTIVITY_UNITS.map((unit) => `"${unit}"`).join(', ')}; recharge in ${RECHARGE_UNITS.map((unit) => `"${unit}"`).join(', ')};
  // elevations (stages, base, ground) in "m" or "ft". All elevations in ONE vertical datum.
  "units": { "k": "m/d", "recharge": "mm/yr", "elevation": "m" },
  // Used where a feature leaves the attribute out (recharge in units.recharge; bed resistance in days, 0 a clean bed;
  // wetted perimeter in m, null for none; side slope horizontal over vertical, for the perimeter from width and depth).
  "defaults": { "kind": "canal", "recharge": 0, "bedResistanceD": 0, "wettedPerimeterM": null, "bankSlope": 1.5 },
  // CRS of your files when they do not declare one (EPSG:<code>, a proj4 string, or null).
  "inputCrs": null, // ${crsLine ? `your files declare ${crsLine}` : 'your files declare no CRS: lon/lat (WGS 84) is assumed'}
  // Screening options.
${settingLines()}
}
`;
  await writeAllOrNothing(dirname(options.out), [{ name: basename(options.out), content: text }]);
  io.err(`wrote ${options.out}; review it, then run doab check with --config ${options.out}\n`);
  return 0;
}
