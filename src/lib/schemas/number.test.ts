// The one number grammar ($lib/csv/values) as every form field and the CSV reader use it.
import { describe, expect, it } from 'vitest';
import { parseNumber, parseTypedNumber } from '$lib/csv/values';
import { aircraftFormSchema } from './aircraft';
import { receiptFormSchema } from './pump';
import { declarationFormSchema, fuelEventFormSchema } from './flight';

/** [typed text, value a form reads, value a CSV cell reads (no decimal comma)] */
const ACCEPTED: [string, number, number | null][] = [
	['12', 12, 12],
	['12.5', 12.5, 12.5],
	['-3', -3, -3],
	['+3', 3, 3],
	['.5', 0.5, 0.5],
	['5.', 5, 5],
	['1e3', 1000, 1000],
	['2.5E-1', 0.25, 0.25],
	[' 7 ', 7, 7],
	['0', 0, 0],
	['007', 7, 7],
	['1,5', 1.5, null],
	['-2,75', -2.75, null]
];
const REFUSED = ['0x10', '0X10', ' 0x10', '0b101', '0o17', 'Infinity', '-Infinity', 'NaN', '1e400', '1_000', '1.2.3', '1,2,3', '1.000,5', '1,000.5', '12abc', '12 kt', '--1', '.', ',', '٣', '１２', '1 000', '0x1p3'];

describe('the shared number grammar', () => {
	it.each(ACCEPTED)('reads %j', (text, form, cell) => {
		expect(parseTypedNumber(text)).toBe(form);
		if (cell === null) expect(parseNumber(text, false)).toBeNaN();
		else expect(parseNumber(text, false)).toBe(cell);
	});

	it.each(REFUSED)('refuses %j in forms and in CSV cells alike', (text) => {
		expect(parseTypedNumber(text)).toBeNaN();
		expect(parseNumber(text, false)).toBeNaN();
		expect(parseNumber(text, true)).toBeNaN();
	});

	it('reads blank as "not set", never as zero', () => {
		expect(parseTypedNumber('')).toBeNull();
		expect(parseTypedNumber('   ')).toBeNull();
	});

	it('a CSV file with a decimal comma reads the same numbers a form does', () => {
		for (const [text, form] of ACCEPTED) expect(parseNumber(text.trim(), true)).toBe(text.includes('.') ? NaN : form);
	});
});

describe('every numeric form field refuses what the grammar refuses', () => {
	const aircraft = { registration: 'BD-KES', type: 'Trainer', fuelType: 'avgas', displayUnit: 'l', capacity: '150', meterFactor: '1', reserveRule: 'faa-91.151-vfr-day' };
	it('aircraft fields', () => {
		expect(aircraftFormSchema.safeParse(aircraft).success).toBe(true);
		for (const field of ['capacity', 'meterFactor', 'lowerLevel', 'unusable', 'kFactor', 'lowFuel', 'lowEnduranceMin', 'baselineCruise'])
			for (const bad of ['0x10', '1e400', '1_0']) expect(aircraftFormSchema.safeParse({ ...aircraft, [field]: bad }).success, `${field}=${bad}`).toBe(false);
		expect(aircraftFormSchema.parse({ ...aircraft, capacity: '150,5' }).capacityL).toBe(150.5);
	});
	it('pump receipt amounts', () => {
		const r = (amount: string) => receiptFormSchema(0.719).safeParse({ at: '2026-05-01T10:00', amount, unit: 'l', full: '1' });
		expect(r('10,5').data?.amount).toBe(10.5);
		expect(r('0x10').success).toBe(false);
		expect(r('0b1011').success).toBe(false);
	});
	it('declaration and fuel-event amounts', () => {
		expect(declarationFormSchema(0.72).safeParse({ kind: 'onBoard', amount: '0x10', unit: 'l' }).success).toBe(false);
		expect(declarationFormSchema(0.72).safeParse({ kind: 'onBoard', amount: '16', unit: 'l' }).success).toBe(true);
		expect(declarationFormSchema(0.72).safeParse({ kind: 'onBoard', amount: '30', unit: 'l', previous: '0o17' }).success).toBe(false);
		expect(fuelEventFormSchema(0.72).safeParse({ kind: 'added', amount: '0x10', unit: 'l', at: '2026-05-02T09:00' }).success).toBe(false);
		expect(fuelEventFormSchema(0.72).parse({ kind: 'added', amount: '16,5', unit: 'l', at: '2026-05-02T09:00' }).amountL).toBe(16.5);
	});
});
