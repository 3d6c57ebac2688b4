// The spread from uncertain K: draws per second on a generated district (strips only), for the
// README. Run: npx tsx bench/spread.bench.ts [lines] [draws]
import { checkLines, checkZones } from '../src/screening/district-inputs.js';
import { screenDistrict } from '../src/screening/screen.js';
import { readZoneSpreads, spreadFromK } from '../src/screening/spread.js';
import { DEFAULT_RULES } from '../src/shared/input-rules.js';
import { DEFAULT_SETTINGS } from '../src/shared/settings.js';
import { syntheticDistrict } from './network.js';

const lineCount = Number(process.argv[2] ?? 1000);
const draws = Number(process.argv[3] ?? 50);
const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(lineCount);
// the one zone knows its K to a factor of two either way
for (const zone of zoneFeatures as { properties: Record<string, unknown> }[]) Object.assign(zone.properties, { k_low_m_d: 4, k_high_m_d: 16 });
const lines = checkLines('lines', lineFeatures, DEFAULT_RULES).records;
const zones = checkZones('zones', zoneFeatures, DEFAULT_RULES).records;
const settings = { ...DEFAULT_SETTINGS, crs, stripsOnly: true, workers: 1 };
let t = performance.now();
const result = screenDistrict(lines, zones, settings);
const screenS = (performance.now() - t) / 1000;
const { spreads } = readZoneSpreads('zones', zoneFeatures, zones, DEFAULT_RULES);
t = performance.now();
const spread = spreadFromK(result, spreads, { samples: draws, seed: 1, correlated: false, top: 20 });
const spreadS = (performance.now() - t) / 1000;
console.log(`${lineCount} lines, ${result.counts.stations} stations, ${result.counts.facingsByReason.paired} paired transect sides, ${result.strips.length} strips`);
console.log(`one screening (strips only): ${screenS.toFixed(2)} s`);
console.log(`${draws} draws: ${spreadS.toFixed(2)} s, ${(draws / spreadS).toFixed(1)} draws/s (${((spreadS / draws / screenS) * 100).toFixed(0)}% of a screening each: the geometry is not redone)`);
console.log(`lost by losing lines P10 ${spread.lostByLosingLinesM3PerDay.p10.toFixed(0)}, P50 ${spread.lostByLosingLinesM3PerDay.p50.toFixed(0)}, P90 ${spread.lostByLosingLinesM3PerDay.p90.toFixed(0)} m3/d`);
