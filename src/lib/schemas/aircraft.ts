// The aircraft form: quantities are typed in the aircraft's display unit and stored in litres.
import { z } from 'zod';
import { defaultDensityKgPerL, fuelTypes, fuelUnits, toLitres, type FuelUnit } from '$lib/units';
import { RESERVE_RULE_IDS } from '$lib/fuel';
import { parseTypedNumber } from '$lib/csv/values';
import { plainText } from './text';

/** A number typed in a form (the shared grammar: a decimal comma is accepted), blank means "not set". */
export const optionalNumber = (min: number, max: number, what: string) =>
	z
		.string()
		.optional()
		.transform((raw, ctx) => {
			const n = parseTypedNumber(raw ?? '');
			if (n === null) return null;
			if (!Number.isFinite(n)) {
				ctx.addIssue({ code: 'custom', message: `Enter ${what} as a number.` });
				return z.NEVER;
			}
			if (n < min || n > max) {
				ctx.addIssue({ code: 'custom', message: `Enter ${what} between ${min} and ${max}.` });
				return z.NEVER;
			}
			return n;
		});

export const requiredNumber = (min: number, max: number, what: string) =>
	optionalNumber(min, max, what).refine((v) => v !== null, { message: `Enter ${what}.` }) as z.ZodType<number>;

export const aircraftFormSchema = z
	.object({
		registration: z
			.string()
			.trim()
			.toUpperCase()
			.regex(/^[A-Z0-9][A-Z0-9-]{1,9}$/, 'Use 2 to 10 letters, digits or hyphens, e.g. N4821K or G-ABCD.'),
		type: plainText(60, { required: 'Enter the aircraft type.' }),
		engine: plainText(80).default(''),
		fuelType: z.enum(fuelTypes, 'Choose a fuel type.'),
		densityKgPerL: optionalNumber(0.5, 1.0, 'the density in kg/L'),
		displayUnit: z.enum(fuelUnits, 'Choose a unit.'),
		capacity: requiredNumber(1, 5000, 'the usable capacity'),
		lowerLevel: optionalNumber(0, 5000, 'the lower fill level'),
		unusable: optionalNumber(0, 500, 'the unusable fuel'),
		meterFactor: requiredNumber(0.5, 1.5, 'the meter factor'),
		kFactor: optionalNumber(1, 10_000_000, 'the K-factor in pulses per unit'),
		lowFuel: optionalNumber(0, 5000, 'the low-fuel alarm amount'),
		lowEnduranceMin: optionalNumber(0, 600, 'the low-endurance alarm in minutes'),
		reserveRule: z.enum(RESERVE_RULE_IDS, 'Choose the reserve rule.'),
		reserveCustomMin: optionalNumber(0, 300, 'the reserve in minutes'),
		baselineCruise: optionalNumber(0.1, 1000, 'the cruise flow per hour')
	})
	.superRefine((v, ctx) => {
		if (v.fuelType === 'other' && v.densityKgPerL === null)
			ctx.addIssue({ code: 'custom', path: ['densityKgPerL'], message: 'Enter the density of this fuel in kg/L.' });
		if (v.lowerLevel !== null && v.lowerLevel >= v.capacity)
			ctx.addIssue({ code: 'custom', path: ['lowerLevel'], message: 'The lower fill level must be below the full capacity.' });
		if (v.reserveRule === 'custom' && v.reserveCustomMin === null)
			ctx.addIssue({ code: 'custom', path: ['reserveCustomMin'], message: 'Enter the reserve in minutes for a custom rule.' });
	})
	.transform((v) => {
		const densityKgPerL = v.fuelType === 'other' ? v.densityKgPerL! : defaultDensityKgPerL(v.fuelType);
		const L = (x: number | null) => (x === null ? null : toLitres(x, v.displayUnit, densityKgPerL));
		return {
			registration: v.registration,
			type: v.type,
			engine: v.engine,
			fuelType: v.fuelType,
			densityKgPerL,
			displayUnit: v.displayUnit,
			capacityL: L(v.capacity)!,
			lowerLevelL: L(v.lowerLevel),
			unusableL: L(v.unusable) ?? 0,
			meterFactor: v.meterFactor,
			kFactor: v.kFactor,
			lowFuelL: L(v.lowFuel),
			lowEnduranceMin: v.lowEnduranceMin,
			reserveRule: v.reserveRule,
			reserveCustomMin: v.reserveRule === 'custom' ? v.reserveCustomMin : null,
			baselineCruiseLph: L(v.baselineCruise)
		};
	});

export type AircraftInput = z.output<typeof aircraftFormSchema>;
