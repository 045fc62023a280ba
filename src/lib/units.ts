// Unit constants and conversions for every quantity Burndown shows, in one place.
// Internally the engine works in litres, litres per hour, knots, nautical miles, feet and seconds;
// everything else is converted at the edges with the exact factors below.

/** 1 US gallon = 231 in³ = 3.785411784 L exactly (NIST Handbook 44, Appendix C). */
export const LITRES_PER_US_GALLON = 3.785411784;
/** 1 imperial gallon = 4.54609 L exactly (NIST Handbook 44, Appendix C). */
export const LITRES_PER_IMPERIAL_GALLON = 4.54609;
/** 1 avoirdupois pound = 0.45359237 kg exactly (international yard and pound agreement, 1959; from memory). */
export const KG_PER_POUND = 0.45359237;
/** 1 international foot = 0.3048 m exactly (same 1959 agreement; from memory). */
export const METRES_PER_FOOT = 0.3048;
/** 1 nautical mile = 1852 m exactly (BIPM SI Brochure, non-SI units accepted for use with the SI). */
export const METRES_PER_NAUTICAL_MILE = 1852;
/** 1 statute mile = 5280 ft = 1609.344 m exactly (follows from the international foot). */
export const METRES_PER_STATUTE_MILE = 1609.344;
/** 1 knot = 1 NM per hour = 1852/3600 m/s (BIPM SI Brochure). */
export const METRES_PER_SECOND_PER_KNOT = 1852 / 3600;

/** Standard weight of avgas: 6.0 lb per US gallon (FAA-H-8083-30, ch. 4). */
export const AVGAS_LB_PER_US_GALLON = 6.0;
/** Standard weight of jet fuel (Jet A, burnt by diesel piston engines): 6.7 lb per US gallon (FAA-H-8083-30). */
export const JET_FUEL_LB_PER_US_GALLON = 6.7;

/** Converts a density in lb per US gallon to kg per litre. */
export function lbPerUsGallonToKgPerLitre(lbPerUsGallon: number): number {
	return (lbPerUsGallon * KG_PER_POUND) / LITRES_PER_US_GALLON;
}

/** Converts a density in kg per litre to lb per US gallon. */
export function kgPerLitreToLbPerUsGallon(kgPerLitre: number): number {
	return (kgPerLitre * LITRES_PER_US_GALLON) / KG_PER_POUND;
}

/** Default avgas density, about 0.719 kg/L. */
export const AVGAS_DENSITY_KG_PER_L = lbPerUsGallonToKgPerLitre(AVGAS_LB_PER_US_GALLON);
/** Default jet fuel density, about 0.803 kg/L. */
export const JET_FUEL_DENSITY_KG_PER_L = lbPerUsGallonToKgPerLitre(JET_FUEL_LB_PER_US_GALLON);

/** An aircraft's fuel: the one list the schema's enum and the aircraft form take. */
export const fuelTypes = ['avgas', 'jet', 'other'] as const;
export type AircraftFuelType = (typeof fuelTypes)[number];
/** The fuels with a known default density. */
export type FuelType = Exclude<AircraftFuelType, 'other'>;

/** The density to use when an aircraft profile has none of its own. */
export function defaultDensityKgPerL(fuel: FuelType): number {
	return fuel === 'jet' ? JET_FUEL_DENSITY_KG_PER_L : AVGAS_DENSITY_KG_PER_L;
}

/** Display units for fuel amounts: the one list the schema's enum and the forms take. */
export const fuelUnits = ['usgal', 'l', 'impgal', 'lb', 'kg'] as const;
export type FuelUnit = (typeof fuelUnits)[number];
export const flowUnits = ['usgal/h', 'l/h', 'impgal/h', 'lb/h', 'kg/h'] as const;
export type FlowUnit = (typeof flowUnits)[number];
export const speedUnits = ['kt', 'km/h', 'mph'] as const;
export type SpeedUnit = (typeof speedUnits)[number];
export const distanceUnits = ['nm', 'km', 'sm'] as const;
export type DistanceUnit = (typeof distanceUnits)[number];


export const fuelUnitLabels: Record<FuelUnit, string> = {
	usgal: 'US gal',
	l: 'L',
	impgal: 'imp gal',
	lb: 'lb',
	kg: 'kg'
};

export const flowUnitLabels: Record<FlowUnit, string> = {
	'usgal/h': 'US gal/h',
	'l/h': 'L/h',
	'impgal/h': 'imp gal/h',
	'lb/h': 'lb/h',
	'kg/h': 'kg/h'
};

export const speedUnitLabels: Record<SpeedUnit, string> = { kt: 'kt', 'km/h': 'km/h', mph: 'mph' };
export const distanceUnitLabels: Record<DistanceUnit, string> = { nm: 'NM', km: 'km', sm: 'SM' };

/** The volume unit a flow unit is "per hour" of. */
export function flowUnitVolume(unit: FlowUnit): FuelUnit {
	switch (unit) {
		case 'usgal/h':
			return 'usgal';
		case 'l/h':
			return 'l';
		case 'impgal/h':
			return 'impgal';
		case 'lb/h':
			return 'lb';
		case 'kg/h':
			return 'kg';
	}
}

/** The flow unit that is "per hour" of a fuel unit: usgal → usgal/h. */
export function flowUnitOf(unit: FuelUnit): FlowUnit {
	return `${unit}/h`;
}

function checkDensity(densityKgPerL: number | undefined, unit: string): number {
	// A mass unit without a usable density would silently give NaN or Infinity; say so instead.
	if (densityKgPerL === undefined || !Number.isFinite(densityKgPerL) || densityKgPerL <= 0) {
		throw new RangeError(
			`Converting ${unit} needs a fuel density in kg/L greater than zero (got ${String(densityKgPerL)})`
		);
	}
	return densityKgPerL;
}

/** Litres in one of `unit`. Mass units need the fuel's density in kg/L. */
export function litresPerUnit(unit: FuelUnit, densityKgPerL?: number): number {
	switch (unit) {
		case 'l':
			return 1;
		case 'usgal':
			return LITRES_PER_US_GALLON;
		case 'impgal':
			return LITRES_PER_IMPERIAL_GALLON;
		case 'kg':
			return 1 / checkDensity(densityKgPerL, unit);
		case 'lb':
			return KG_PER_POUND / checkDensity(densityKgPerL, unit);
	}
}

/** A fuel quantity in `unit` converted to litres. */
export function toLitres(value: number, unit: FuelUnit, densityKgPerL?: number): number {
	return value * litresPerUnit(unit, densityKgPerL);
}

/** A fuel quantity in litres converted to `unit`. */
export function fromLitres(litres: number, unit: FuelUnit, densityKgPerL?: number): number {
	return litres / litresPerUnit(unit, densityKgPerL);
}

/** A fuel flow in `unit` converted to litres per hour. */
export function toLitresPerHour(value: number, unit: FlowUnit, densityKgPerL?: number): number {
	return value * litresPerUnit(flowUnitVolume(unit), densityKgPerL);
}

/** A fuel flow in litres per hour converted to `unit`. */
export function fromLitresPerHour(lph: number, unit: FlowUnit, densityKgPerL?: number): number {
	return lph / litresPerUnit(flowUnitVolume(unit), densityKgPerL);
}

/** Knots in one of `unit`. */
export function knotsPerUnit(unit: SpeedUnit): number {
	switch (unit) {
		case 'kt':
			return 1;
		case 'km/h':
			return 1000 / METRES_PER_NAUTICAL_MILE;
		case 'mph':
			return METRES_PER_STATUTE_MILE / METRES_PER_NAUTICAL_MILE;
	}
}

export function toKnots(value: number, unit: SpeedUnit): number {
	return value * knotsPerUnit(unit);
}

export function fromKnots(knots: number, unit: SpeedUnit): number {
	return knots / knotsPerUnit(unit);
}

/** Nautical miles in one of `unit`. */
export function nauticalMilesPerUnit(unit: DistanceUnit): number {
	switch (unit) {
		case 'nm':
			return 1;
		case 'km':
			return 1000 / METRES_PER_NAUTICAL_MILE;
		case 'sm':
			return METRES_PER_STATUTE_MILE / METRES_PER_NAUTICAL_MILE;
	}
}

export function toNauticalMiles(value: number, unit: DistanceUnit): number {
	return value * nauticalMilesPerUnit(unit);
}

export function fromNauticalMiles(nm: number, unit: DistanceUnit): number {
	return nm / nauticalMilesPerUnit(unit);
}

export function feetToMetres(feet: number): number {
	return feet * METRES_PER_FOOT;
}

export function metresToFeet(metres: number): number {
	return metres / METRES_PER_FOOT;
}

/**
 * Specific range held internally in NM per litre, converted for display to distance units per
 * fuel unit (e.g. NM per US gal, km per kg).
 */
export function fromNmPerLitre(
	nmPerLitre: number,
	distance: DistanceUnit,
	fuel: FuelUnit,
	densityKgPerL?: number
): number {
	return fromNauticalMiles(nmPerLitre * litresPerUnit(fuel, densityKgPerL), distance);
}

export function specificRangeLabel(distance: DistanceUnit, fuel: FuelUnit): string {
	return `${distanceUnitLabels[distance]}/${fuelUnitLabels[fuel]}`;
}
