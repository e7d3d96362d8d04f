import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { haversineKm, IUGG_MEAN_EARTH_RADIUS_KM } from '../../shared/routing/haversine.js';

/**
 * The distance routing uses, checked against published sources:
 * - the worked example of the haversine formula on Rosetta Code ("Haversine formula" task): Nashville
 *   International Airport (BNA) 36.12, −86.67 to Los Angeles International Airport (LAX) 33.94, −118.40
 *   is 2886.444 km with R = 6371.0 km;
 * - the IUGG mean Earth radius R1 = 6371.0088 km of the Geodetic Reference System 1980 (H. Moritz,
 *   Bulletin Géodésique 54, 1980; republished in Journal of Geodesy 74, 2000);
 * - geographiclib-geodesic (C. F. F. Karney's GeographicLib, "Algorithms for geodesics", Journal of
 *   Geodesy 87, 2013), the WGS84 ellipsoid's inverse problem, as the general-purpose reference: a
 *   sphere stays within about 0.5 % of the ellipsoid's geodesic.
 */
describe('haversine distance against published sources', () => {
  it('matches the Rosetta Code worked example, BNA → LAX with R = 6371.0 km', () => {
    const km = haversineKm({ latitude: 36.12, longitude: -86.67 }, { latitude: 33.94, longitude: -118.4 }, 6371.0);
    expect(km).toBeCloseTo(2886.444, 3);
  });

  it('uses the IUGG mean radius of GRS 80 by default', () => {
    expect(IUGG_MEAN_EARTH_RADIUS_KM).toBe(6371.0088);
    // Arcs whose angle is known without the formula, worked by hand with R = 6371.0088 km:
    // a quarter of the equator is R × π/2 = 10 007.557 km; one degree of a meridian is R × π/180 = 111.195 km.
    expect(haversineKm({ latitude: 0, longitude: 0 }, { latitude: 0, longitude: 90 })).toBeCloseTo(10007.557, 2);
    expect(haversineKm({ latitude: 45, longitude: 7 }, { latitude: 46, longitude: 7 })).toBeCloseTo(111.195, 2);
  });

  const pairs: Array<[string, [number, number], [number, number]]> = [
    ['BNA → LAX', [36.12, -86.67], [33.94, -118.4]],
    ['Seattle → Portland', [47.6062, -122.3321], [45.5152, -122.6784]],
    ['Seattle → Chicago', [47.6062, -122.3321], [41.8781, -87.6298]],
    ['Sacramento → Denver', [38.5816, -121.4944], [39.7392, -104.9903]],
    ['Denver → Chicago', [39.7392, -104.9903], [41.8781, -87.6298]],
    ['north–south along a meridian', [10, 5], [60, 5]],
    ['along the equator', [0, -30], [0, 40]],
  ];

  it.each(pairs)('is within 0.5 %% of the WGS84 geodesic (geographiclib-geodesic): %s', (_name, [lat1, lon1], [lat2, lon2]) => {
    const reference = geodesic.Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2).s12! / 1000;
    const km = haversineKm({ latitude: lat1, longitude: lon1 }, { latitude: lat2, longitude: lon2 });
    expect(Math.abs(km - reference) / reference).toBeLessThan(0.005);
  });

  it('is zero for the same place and half the circumference for antipodes', () => {
    expect(haversineKm({ latitude: 45, longitude: 10 }, { latitude: 45, longitude: 10 })).toBe(0);
    expect(haversineKm({ latitude: 0, longitude: 0 }, { latitude: 0, longitude: 180 })).toBeCloseTo(Math.PI * IUGG_MEAN_EARTH_RADIUS_KM, 6);
  });
});
