import { describe, expect, it } from 'vitest';
import { featureCollection, layerText } from '../../src/output/layers.js';

// 3,000 features of about 1 kB: more than one 1 MiB piece
const features = Array.from({ length: 3000 }, (_, i) => ({
  type: 'Feature',
  properties: { id: `f${i}`, note: 'x'.repeat(1000) },
  geometry: { type: 'Point', coordinates: [i / 100, 0] },
}));

describe('layers written in pieces', () => {
  it('gives a FeatureCollection that parses whole, in several pieces', () => {
    const pieces = [...featureCollection(features, 'collection')];
    expect(pieces.length).toBeGreaterThan(1);
    expect(JSON.parse(layerText(pieces))).toEqual({ type: 'FeatureCollection', features });
  });

  it('gives a GeoJSON text sequence, one RS-led record per feature (RFC 8142 [published])', () => {
    const text = layerText(featureCollection(features, 'sequence'));
    const records = text.split('\u001e');
    expect(records[0]).toBe('');
    expect(records.slice(1).map((record) => JSON.parse(record))).toEqual(features);
  });

  it('writes an empty layer as an empty collection', () => {
    expect(JSON.parse(layerText(featureCollection([], 'collection')))).toEqual({ type: 'FeatureCollection', features: [] });
    expect(layerText(featureCollection([], 'sequence'))).toBe('');
  });
});

describe('which line of a strip is losing', () => {
  it('names the line with the larger positive loss and its share, and nothing when neither loses', async () => {
    const { losingLine } = await import('../../src/output/layers.js');
    const strip = (lossA: number, lossB: number) => ({ lineAId: 'A', lineBId: 'B', lossAM3PerDay: lossA, lossBM3PerDay: lossB }) as never;
    // a gains 50 while b loses 200: b is the line to line, with all of the strip's loss
    expect(losingLine(strip(-50, 200))).toEqual({ id: 'B', share: 1 });
    expect(losingLine(strip(300, 100))).toEqual({ id: 'A', share: 0.75 });
    expect(losingLine(strip(-1, -2)).id).toBeNull();
    expect(losingLine(strip(Number.NaN, 40))).toEqual({ id: 'B', share: 1 });
  });
});
