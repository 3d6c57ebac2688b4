// The settings table makes the defaults, the config schema, the command line's options and help,
// the starting config and run.json's settings: each of these is checked against the table here,
// so a setting added to the table shows up everywhere or a test says where it does not.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/input/config.js';
import { defaultSettings, flagAttribute, getSetting, SETTING_KEYS, SETTINGS, settingsAsConfig } from '../../src/shared/settings.js';
import { freshDir, ROOT, runCliInProcess } from '../cli/run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');

describe('the settings table', () => {
  it('gives every setting a default that passes its own check, a doc and a unit field', () => {
    const settings = defaultSettings();
    for (const key of SETTING_KEYS) {
      expect(getSetting(settings, key), key).toEqual(SETTINGS[key].default);
      expect(SETTINGS[key].doc.length, key).toBeGreaterThan(10);
    }
  });

  it('is the config schema: every key parses at its default, and a wrong value names the key', () => {
    const config = parseConfig('c.jsonc', JSON.stringify(settingsAsConfig(defaultSettings())));
    expect(config.settings).toEqual(defaultSettings());
    for (const key of SETTING_KEYS) {
      const [head, tail] = key.split('.');
      const wrong = tail ? { [head]: { [tail]: { not: 'right' } } } : { [head]: { not: 'right' } };
      expect(() => parseConfig('c.jsonc', JSON.stringify(wrong)), key).toThrow(new RegExp(`c\\.jsonc: "${key.replace('.', '\\.')}" must be`));
    }
  });

  it('gives every flagged setting an option in the help of doab screen, with its default', async () => {
    const help = await runCliInProcess(['screen', '--help']);
    // the help wraps its descriptions to the terminal's width: read it as one line of words
    const words = help.stdout.replace(/\s+/g, ' ');
    for (const key of SETTING_KEYS) {
      const spec = SETTINGS[key];
      if (!spec.flag) continue;
      expect(words, key).toContain(spec.flag);
      if (spec.type !== 'boolean') expect(words, key).toContain(`default ${spec.default === null ? 'none' : spec.default}`);
      expect(flagAttribute(spec.flag)).toMatch(/^[a-z][A-Za-z]*$/);
    }
  });

  it('writes every setting but the advanced ones into the starting config, which then parses to the defaults', async () => {
    const file = join(freshDir('settings-init'), 'doab.jsonc');
    const made = await runCliInProcess(['init-config', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', file]);
    expect(made.status, made.stderr).toBe(0);
    const text = readFileSync(file, 'utf8');
    for (const key of SETTING_KEYS) {
      const name = key.split('.').pop()!;
      if (!SETTINGS[key].advanced) expect(text, key).toContain(`"${name}":`);
    }
    expect(parseConfig(file, text).settings).toEqual(defaultSettings());
  });

  it('records the settings in run.json in config form, which the config parser reads back', async () => {
    const out = join(freshDir('settings-run'), 'out');
    const run = await runCliInProcess(['screen', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out, '--step', '50', '--rank-by', 'risk', '--quiet']);
    expect(run.status, run.stderr).toBe(0);
    const record = JSON.parse(readFileSync(join(out, 'run.json'), 'utf8'));
    const config = parseConfig('run.json', JSON.stringify(record.settings), 'settings');
    expect(config.settings).toEqual({ ...defaultSettings(), stepM: 50, rankBy: 'risk' });
  });
});
