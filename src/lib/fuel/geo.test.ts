import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { greatCircleNm } from './geo';

const wgs84Nm = (a: number, b: number, c: number, d: number) => geodesic.Geodesic.WGS84.Inverse(a, b, c, d).s12! / 1852;

describe('greatCircleNm', () => {
	it('agrees with the WGS84 geodesic (geographiclib-geodesic) within 0.5 %', () => {
		// The package README's case: (−41.32, 174.81) → (40.96, −5.50) = 19,959,679.267 m.
		expect(wgs84Nm(-41.32, 174.81, 40.96, -5.5) * 1852).toBeCloseTo(19_959_679.267, 2);
		const legs: [number, number, number, number][] = [
			[-41.32, 174.81, 40.96, -5.5],
			[47.2, -31.4, 47.7, -30.9],
			[47.95, -30.1, 47.55, -28.75],
			[0, 0, 0, 1],
			[60, 10, 61, 10]
		];
		for (const l of legs) expect(Math.abs(greatCircleNm(...l) / wgs84Nm(...l) - 1)).toBeLessThan(0.005);
	});
	it('is zero for one point and NaN for a missing coordinate', () => {
		expect(greatCircleNm(47, -31, 47, -31)).toBe(0);
		expect(greatCircleNm(NaN, 0, 1, 1)).toBeNaN();
	});
});
