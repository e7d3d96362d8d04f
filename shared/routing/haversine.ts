/**
 * Great-circle distance on a sphere by the haversine formula.
 *
 * The radius is the IUGG mean Earth radius R1 = (2a + b) / 3 = 6371.0088 km of the Geodetic Reference
 * System 1980 (H. Moritz, "Geodetic Reference System 1980", Bulletin Géodésique 54, 1980; values as
 * republished in the Journal of Geodesy 74, 2000). A sphere is within about 0.5 % of the ellipsoid,
 * which is far finer than a courier's road, so routing needs nothing better.
 */
export const IUGG_MEAN_EARTH_RADIUS_KM = 6371.0088;

export interface LatLon {
  latitude: number;
  longitude: number;
}

const RADIANS = Math.PI / 180;

export function haversineKm(from: LatLon, to: LatLon, radiusKm: number = IUGG_MEAN_EARTH_RADIUS_KM): number {
  const dLat = (to.latitude - from.latitude) * RADIANS;
  const dLon = (to.longitude - from.longitude) * RADIANS;
  const h =
    Math.sin(dLat / 2) ** 2 + Math.cos(from.latitude * RADIANS) * Math.cos(to.latitude * RADIANS) * Math.sin(dLon / 2) ** 2;
  // min() guards against rounding pushing h a hair above 1 for antipodal points, where asin is undefined
  return 2 * radiusKm * Math.asin(Math.min(1, Math.sqrt(h)));
}
