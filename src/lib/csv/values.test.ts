import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { explainIsoTime, formatTimeMs, parseClock, parseDate, parseIsoTime, parseNumber } from './values';

describe('parseNumber', () => {
	it('reads plain decimals, signs and exponents', () => {
		expect(parseNumber('35.2', false)).toBe(35.2);
		expect(parseNumber('-0.5', false)).toBe(-0.5);
		expect(parseNumber('+12', false)).toBe(12);
		expect(parseNumber('.5', false)).toBe(0.5);
		expect(parseNumber('1e3', false)).toBe(1000);
		expect(parseNumber(' 42 ', false)).toBe(42);
		expect(parseNumber('0', false)).toBe(0);
	});

	it('refuses what Number() would quietly accept', () => {
		for (const s of ['0x10', ' 0x10', '0b101', '0o17', 'Infinity', '-Infinity', '', '   ', '12 kt', '1,5', 'NaN', '.', '--1'])
			expect(parseNumber(s, false), s).toBeNaN();
	});

	it('reads a decimal comma only when asked, and then refuses a point', () => {
		expect(parseNumber('31,4', true)).toBe(31.4);
		expect(parseNumber('-2,75', true)).toBe(-2.75);
		expect(parseNumber('7', true)).toBe(7);
		expect(parseNumber('1.234,5', true)).toBeNaN();
		expect(parseNumber('31.4', true)).toBeNaN();
	});

	it('agrees with Number() on every decimal number JavaScript prints', () => {
		fc.assert(
			fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
				expect(parseNumber(String(x), false)).toBe(Number(String(x)));
			})
		);
	});
});

describe('parseIsoTime', () => {
	it('reads UTC and offsets in every spelling ISO 8601 allows', () => {
		const utc = Date.UTC(2026, 4, 2, 9, 14, 5);
		expect(parseIsoTime('2026-05-02T09:14:05Z')).toBe(utc);
		expect(parseIsoTime('2026-05-02t09:14:05z')).toBe(utc);
		expect(parseIsoTime('2026-05-02 09:14:05Z')).toBe(utc);
		expect(parseIsoTime('2026-05-02T11:14:05+02:00')).toBe(utc);
		expect(parseIsoTime('2026-05-02T11:14:05+0200')).toBe(utc);
		expect(parseIsoTime('2026-05-02T11:14:05+02')).toBe(utc);
		expect(parseIsoTime('2026-05-02T04:44:05-04:30')).toBe(utc);
		expect(parseIsoTime('2026-05-02T09:14Z')).toBe(Date.UTC(2026, 4, 2, 9, 14));
		expect(parseIsoTime('2026-05-02T09:14:05.250Z')).toBe(utc + 250);
		expect(parseIsoTime('2026-05-02T09:14:05.5Z')).toBe(utc + 500);
	});

	it('matches Date.parse on the canonical form, for any instant', () => {
		fc.assert(
			fc.property(fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2099, 11, 31) }), (ms) => {
				const iso = new Date(ms).toISOString();
				expect(parseIsoTime(iso)).toBe(Date.parse(iso));
			})
		);
	});

	it('refuses a time without a zone, impossible dates and junk', () => {
		for (const s of ['2026-05-02T09:14:05', '2026-02-30T10:00:00Z', '2026-13-01T10:00:00Z', '2026-05-02T24:00:00Z', '2026-05-02T09:60:00Z', '2026-05-02T09:14:61Z', '2026-05-02', '1714641245', 'yesterday', '2026-05-02T09:14:05+2:00', '2026-05-02T09:14:05Zjunk'])
			expect(parseIsoTime(s), s).toBeNaN();
		// 2028 is a leap year, 2100 is not (Gregorian rule).
		expect(parseIsoTime('2028-02-29T00:00:00Z')).toBe(Date.UTC(2028, 1, 29));
		expect(parseIsoTime('2100-02-29T00:00:00Z')).toBeNaN();
	});

	it('says why a time was refused', () => {
		expect(explainIsoTime('2026-05-02T09:14:05')).toMatch(/no zone/);
		expect(explainIsoTime('1714641245')).toMatch(/epoch/);
		expect(explainIsoTime('2026-02-30T10:00:00Z')).toMatch(/not a real date-time/);
	});
});

describe('clock times and dates', () => {
	it('reads hh:mm:ss with fractions and hh:mm', () => {
		expect(parseClock('09:14:05')).toBe(9 * 3600 + 14 * 60 + 5);
		expect(parseClock('9:14:05')).toBe(9 * 3600 + 14 * 60 + 5);
		expect(parseClock('23:59:59.5')).toBeCloseTo(86399.5, 9);
		expect(parseClock('07:30')).toBe(7.5 * 3600);
		for (const s of ['24:00:00', '12:60:00', '12:00:60', '12', '12:0', 'noon']) expect(parseClock(s), s).toBeNaN();
	});

	it('reads real dates only', () => {
		expect(parseDate('2026-05-02')).toBe(Date.UTC(2026, 4, 2));
		expect(parseDate('2026-04-31')).toBeNaN();
		expect(parseDate('02.05.2026')).toBeNaN();
	});

	it('formats times for messages', () => {
		expect(formatTimeMs(Date.UTC(2026, 4, 2, 9, 14, 5))).toBe('2026-05-02 09:14:05Z');
		expect(formatTimeMs(Date.UTC(2026, 4, 2, 9, 14, 5, 120))).toBe('2026-05-02 09:14:05.120Z');
	});

	it('shows a time outside the ECMAScript range as the number, never throwing', () => {
		// Found by the live batch property test: epoch seconds 8640000000000.001 reached toISOString.
		expect(formatTimeMs(8640000000000001)).toBe('8640000000000001');
		expect(formatTimeMs(-8.64e15 - 1)).toBe(String(-8.64e15 - 1));
	});
});
