import { describe, expect, it } from 'vitest';
import {
	AVGAS_DENSITY_KG_PER_L,
	AVGAS_LB_PER_US_GALLON,
	JET_FUEL_DENSITY_KG_PER_L,
	JET_FUEL_LB_PER_US_GALLON,
	KG_PER_POUND,
	LITRES_PER_IMPERIAL_GALLON,
	LITRES_PER_US_GALLON,
	METRES_PER_NAUTICAL_MILE,
	METRES_PER_SECOND_PER_KNOT,
	METRES_PER_STATUTE_MILE,
	defaultDensityKgPerL,
	distanceUnits,
	flowUnitLabels,
	flowUnits,
	fromKnots,
	fromLitres,
	fromLitresPerHour,
	fromNauticalMiles,
	fromNmPerLitre,
	fuelUnitLabels,
	fuelUnits,
	kgPerLitreToLbPerUsGallon,
	lbPerUsGallonToKgPerLitre,
	specificRangeLabel,
	speedUnits,
	toKnots,
	toLitres,
	toLitresPerHour,
	toNauticalMiles
} from './units';

describe('unit constants', () => {
	it('US gallon is 231 cubic inches = 3.785411784 L', () => {
		// NIST Handbook 44, Appendix C: 1 gallon (US) = 231 in³ = 3.785 411 784 L (exactly).
		expect(LITRES_PER_US_GALLON).toBe(3.785411784);
		// The inch is 2.54 cm exactly (NIST Handbook 44, Appendix C), so 231 in³ in litres:
		expect(231 * 2.54 ** 3 / 1000).toBeCloseTo(LITRES_PER_US_GALLON, 12);
		expect(toLitres(1, 'usgal')).toBe(3.785411784);
	});

	it('imperial gallon is 4.54609 L', () => {
		// NIST Handbook 44, Appendix C: 1 gallon (imperial) = 4.546 09 L (exactly).
		expect(LITRES_PER_IMPERIAL_GALLON).toBe(4.54609);
		expect(toLitres(2, 'impgal')).toBe(9.09218);
	});

	it('pound is 0.45359237 kg', () => {
		// International yard and pound agreement, 1959 (from memory; high confidence).
		expect(KG_PER_POUND).toBe(0.45359237);
	});

	it('nautical mile is 1852 m and a knot is 1852/3600 m/s', () => {
		// BIPM SI Brochure, table of non-SI units: 1 M = 1852 m; 1 kn = (1852/3600) m/s.
		expect(METRES_PER_NAUTICAL_MILE).toBe(1852);
		expect(METRES_PER_SECOND_PER_KNOT).toBeCloseTo(0.514444444, 9);
		expect(toKnots(1.852, 'km/h')).toBeCloseTo(1, 12);
		expect(toNauticalMiles(1.852, 'km')).toBeCloseTo(1, 12);
	});

	it('statute mile is 5280 ft of 0.3048 m', () => {
		// NIST Handbook 44, Appendix C: 1 mile = 5280 ft; 1 ft = 0.3048 m (exactly).
		expect(METRES_PER_STATUTE_MILE).toBe(5280 * 0.3048);
		expect(toNauticalMiles(1, 'sm')).toBeCloseTo(1609.344 / 1852, 12);
		expect(fromKnots(100, 'mph')).toBeCloseTo((100 * 1852) / 1609.344, 9);
	});
});

describe('fuel densities', () => {
	it('avgas 6.0 lb and jet fuel 6.7 lb per US gallon', () => {
		// FAA-H-8083-30 (AMT Handbook – General), ch. 4 standard weights: avgas 6.0 lb/gal, jet fuel 6.7 lb/gal.
		expect(AVGAS_LB_PER_US_GALLON).toBe(6.0);
		expect(JET_FUEL_LB_PER_US_GALLON).toBe(6.7);
		expect(fromLitres(LITRES_PER_US_GALLON, 'lb', AVGAS_DENSITY_KG_PER_L)).toBeCloseTo(6.0, 12);
		expect(fromLitres(LITRES_PER_US_GALLON, 'lb', JET_FUEL_DENSITY_KG_PER_L)).toBeCloseTo(6.7, 12);
		expect(AVGAS_DENSITY_KG_PER_L).toBeCloseTo(0.718959, 6);
		expect(JET_FUEL_DENSITY_KG_PER_L).toBeCloseTo(0.802837, 6);
		expect(defaultDensityKgPerL('jet')).toBe(JET_FUEL_DENSITY_KG_PER_L);
		expect(defaultDensityKgPerL('avgas')).toBe(AVGAS_DENSITY_KG_PER_L);
	});

	it('a hot-day avgas density moves 100 gal by 10–15 lb', () => {
		// FAA-H-8083-30, same page: avgas on a hot day 5.85–5.9 lb/gal, 10–15 lb less over 100 gal.
		const standard = fromLitres(toLitres(100, 'usgal'), 'lb', AVGAS_DENSITY_KG_PER_L);
		const hot = fromLitres(toLitres(100, 'usgal'), 'lb', lbPerUsGallonToKgPerLitre(5.85));
		const warm = fromLitres(toLitres(100, 'usgal'), 'lb', lbPerUsGallonToKgPerLitre(5.9));
		expect(standard - warm).toBeCloseTo(10, 9);
		expect(standard - hot).toBeCloseTo(15, 9);
	});

	it('converts density both ways', () => {
		expect(kgPerLitreToLbPerUsGallon(lbPerUsGallonToKgPerLitre(6.7))).toBeCloseTo(6.7, 12);
		expect(toLitres(0.72, 'kg', 0.72)).toBeCloseTo(1, 12);
	});

	it('refuses a mass unit without a usable density', () => {
		expect(() => toLitres(10, 'kg')).toThrow(/density/);
		expect(() => fromLitres(10, 'lb', 0)).toThrow(RangeError);
		expect(() => toLitresPerHour(10, 'kg/h', NaN)).toThrow(/kg\/L/);
		// Volume units do not need one.
		expect(toLitres(10, 'l')).toBe(10);
	});
});

describe('conversions', () => {
	const density = 0.72;
	it('round-trips every fuel and flow unit', () => {
		for (const u of fuelUnits) expect(fromLitres(toLitres(37.5, u, density), u, density)).toBeCloseTo(37.5, 10);
		for (const u of flowUnits)
			expect(fromLitresPerHour(toLitresPerHour(9.5, u, density), u, density)).toBeCloseTo(9.5, 10);
		for (const u of speedUnits) expect(fromKnots(toKnots(123, u), u)).toBeCloseTo(123, 10);
		for (const u of distanceUnits) expect(fromNauticalMiles(toNauticalMiles(42, u), u)).toBeCloseTo(42, 10);
	});

	it('converts flows like volumes per hour', () => {
		expect(toLitresPerHour(5, 'usgal/h')).toBeCloseTo(18.92705892, 8);
		expect(fromLitresPerHour(45.4609, 'impgal/h')).toBeCloseTo(10, 12);
		expect(toLitresPerHour(30, 'lb/h', AVGAS_DENSITY_KG_PER_L)).toBeCloseTo(5 * LITRES_PER_US_GALLON, 10);
	});

	it('shows specific range in any distance per fuel unit', () => {
		expect(fromNmPerLitre(1, 'nm', 'usgal')).toBeCloseTo(LITRES_PER_US_GALLON, 12);
		expect(fromNmPerLitre(1, 'km', 'l')).toBeCloseTo(1.852, 12);
		expect(specificRangeLabel('nm', 'usgal')).toBe('NM/US gal');
	});

	it('labels every unit', () => {
		for (const u of fuelUnits) expect(fuelUnitLabels[u]).toBeTruthy();
		for (const u of flowUnits) expect(flowUnitLabels[u]).toMatch(/\/h$/);
	});
});

