// Great-circle distance between two positions, for plan legs made from a route's positions.
// A sphere of the mean Earth radius is within about 0.5 % of the WGS84 ellipsoid's geodesic —
// well inside what a fuel plan can use; the tests check it against a geodesic library.

/** Mean Earth radius R1 = 6,371,008.8 m (IUGG; from memory), in NM of 1852 m (BIPM SI Brochure). */
const EARTH_RADIUS_NM = 6_371_008.8 / 1852;
const RAD = Math.PI / 180;

/** Haversine distance in NM; NaN when a coordinate is not a number. */
export function greatCircleNm(lat1: number, lon1: number, lat2: number, lon2: number): number {
	const dLat = (lat2 - lat1) * RAD;
	const dLon = (lon2 - lon1) * RAD;
	const h = Math.sin(dLat / 2) ** 2 + Math.cos(lat1 * RAD) * Math.cos(lat2 * RAD) * Math.sin(dLon / 2) ** 2;
	return 2 * EARTH_RADIUS_NM * Math.asin(Math.min(1, Math.sqrt(h)));
}
