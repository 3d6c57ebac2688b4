import { describe, expect, it } from 'vitest';
import { chooseWorkCrs, scaleAt, utmZone } from '../../src/geometry/work-crs.js';

const BNG = '+proj=tmerc +lat_0=49 +lon_0=-2 +k=0.9996012717 +x_0=400000 +y_0=-100000 +ellps=airy +units=m +no_defs';

describe('chooseWorkCrs', () => {
  it('reproduces the EPSG Transverse Mercator worked example to 1 cm', () => {
    const { crs, warnings } = chooseWorkCrs([0, 50, 1, 51], BNG);
    // EPSG Guidance Note 7-2, Transverse Mercator example: 50 deg 30' N, 0 deg 30' E
    // -> E 577274.99 m, N 69740.50 m [published]
    const [e, n] = crs.forward([0.5, 50.5]);
    expect(Math.abs(e - 577274.99)).toBeLessThan(0.01);
    expect(Math.abs(n - 69740.5)).toBeLessThan(0.01);
    const [lon, lat] = crs.inverse([e, n]);
    expect(lon).toBeCloseTo(0.5, 9);
    expect(lat).toBeCloseTo(50.5, 9);
    expect(crs.epsg).toBeNull();
    expect(warnings).toEqual([]);
  });

  it('picks the UTM zone of the bbox centre, north and south', () => {
    // UTM zones are 6 degrees wide numbered eastwards from 180 W, EPSG 326zz north and 327zz
    // south of the equator: J.P. Snyder (1987), Map Projections - A Working Manual, USGS PP 1395 [from memory]
    expect(chooseWorkCrs([30.4, 29.4, 30.6, 29.6]).crs.epsg).toBe(32636);
    expect(chooseWorkCrs([-58.5, -34.7, -58.3, -34.5]).crs.epsg).toBe(32721);
    expect(chooseWorkCrs([2.9, -0.2, 3.1, 0.4]).crs.epsg).toBe(32631);
    expect(chooseWorkCrs([2.9, -0.4, 3.1, 0.2]).crs.epsg).toBe(32731);
    expect([utmZone(-180), utmZone(-174.0001), utmZone(-174), utmZone(0), utmZone(179.99), utmZone(180)]).toEqual([1, 1, 2, 31, 60, 60]);
    const { crs } = chooseWorkCrs([-58.5, -34.7, -58.3, -34.5]);
    expect(crs.name).toBe('WGS 84 / UTM zone 21S');
    // false northing of 10 000 km in the south keeps northings positive [from memory, Snyder 1987]
    expect(crs.forward([-57, -0.000001])[1]).toBeCloseTo(10_000_000, -1);
  });

  it('takes a user EPSG code and round-trips through it', () => {
    const { crs } = chooseWorkCrs([30.4, 29.4, 30.6, 29.6], 'EPSG:32636');
    expect(crs.epsg).toBe(32636);
    const xy = crs.forward([30.5, 29.5]);
    const back = crs.inverse(xy);
    expect(back[0]).toBeCloseTo(30.5, 10);
    expect(back[1]).toBeCloseTo(29.5, 10);
    // UTM central meridian scale 0.9996 (Snyder 1987) [from memory]; zone 36 is centred on 33 E
    expect(scaleAt(crs, [33, 10])).toBeCloseTo(0.9996, 6);
  });

  it('warns when the data span more than one zone width or the CRS distorts distances', () => {
    expect(chooseWorkCrs([20, 10, 30, 12]).warnings.some((w) => w.includes('more than one UTM zone'))).toBe(true);
    expect(chooseWorkCrs([20, 10, 25, 12]).warnings).toEqual([]);
    // zone 35 (central meridian 27 E) used at 32.9 E, just past the zone's edge: a scale a little
    // over 1.003, worth a warning, not a refusal
    const warned = chooseWorkCrs([32.8, 29.4, 33.0, 29.6], 'EPSG:32635').warnings.find((w) => w.includes('scale'));
    expect(warned).toMatch(/scale of 1\.00[2-9]/);
  });

  it('refuses a CRS that would put every distance off by more than 1 %', () => {
    // zone 30 (central meridian 3 W) at 30.5 E: a scale of about 1.14
    expect(() => chooseWorkCrs([30.4, 29.4, 30.6, 29.6], 'EPSG:32630')).toThrow(/scale of 1\.1\d+ .*off by 1\d\.\d%/);
    expect(() => chooseWorkCrs([30.4, 29.4, 30.6, 29.6], '+proj=geocent +datum=WGS84 +units=m')).toThrow(/geocentric/);
  });

  it('rejects what it cannot use, naming the value and what is accepted', () => {
    for (const bad of ['EPSG:4326', 'EPSG:32661', 'EPSG:32700', 'british grid', '+proj=nonsense', '+proj=longlat +datum=WGS84', '+proj=merc +units=us-ft']) {
      expect(() => chooseWorkCrs([30.4, 29.4, 30.6, 29.6], bad)).toThrow(bad);
      expect(() => chooseWorkCrs([30.4, 29.4, 30.6, 29.6], bad)).toThrow(/accepted: EPSG:32601/);
    }
    expect(() => chooseWorkCrs([30.6, 29.4, 30.4, 29.6])).toThrow(/bbox/);
    expect(() => chooseWorkCrs([NaN, 29.4, 30.4, 29.6])).toThrow(/bbox/);
  });
});
