import { describe, expect, it } from 'vitest';
import {
	age,
	count,
	dateTimeText,
	distance,
	elapsed,
	fileSize,
	flowRate,
	formatDuration,
	formatSeconds,
	fuel,
	fuelAmount,
	fuelFlow,
	fuelMargin,
	isoDate,
	isTimeZone,
	kFactor,
	landedMargin,
	localSuffix,
	localTime,
	meterFactor,
	num,
	percent,
	signedNum,
	signedPercent,
	speed,
	specificRange,
	timeText,
	utcClock,
	utcDateTime,
	zoneName
} from '.';
import { LITRES_PER_US_GALLON } from '$lib/units';

// 2026-01-15 14:05:09 UTC (winter in the northern hemisphere) and 2026-07-15 14:05:09 UTC (summer).
const WINTER = Date.UTC(2026, 0, 15, 14, 5, 9) / 1000;
const SUMMER = Date.UTC(2026, 6, 15, 14, 5, 9) / 1000;

describe('numbers: one precision per quantity and unit', () => {
	it('writes fuel volumes with a tenth and masses whole, whatever the size', () => {
		expect(fuelAmount(120, 'l')).toBe('120.0 L');
		expect(fuelAmount(108.84, 'l')).toBe('108.8 L');
		expect(fuelAmount(31.75, 'usgal')).toBe('31.8 US gal');
		expect(fuelAmount(8.18, 'impgal')).toBe('8.2 imp gal');
		expect(fuelAmount(86.4, 'kg')).toBe('86 kg');
		expect(fuelAmount(190.6, 'lb')).toBe('191 lb');
	});

	it('writes a flow like its fuel unit', () => {
		expect(flowRate(8.18, 'usgal/h')).toBe('8.2 US gal/h');
		expect(flowRate(31.8, 'l/h')).toBe('31.8 L/h');
		expect(flowRate(49.6, 'lb/h')).toBe('50 lb/h');
		// 8.5 US gal/h is 32.176… L/h (NIST HB44 Appendix C: 1 US gal = 3.785411784 L).
		expect(fuelFlow(8.5 * LITRES_PER_US_GALLON, 'l', 0.72)).toBe('32.2 L/h');
		expect(fuelFlow(8.5 * LITRES_PER_US_GALLON, 'usgal', 0.72)).toBe('8.5 US gal/h');
	});

	it('writes distance with a tenth, speed whole, specific range with two decimals', () => {
		expect(distance(120, 'nm')).toBe('120.0 NM');
		expect(distance(36.24, 'km')).toBe('36.2 km');
		expect(speed(104.6, 'kt')).toBe('105 kt');
		expect(specificRange(2.4149, 'NM/US gal')).toBe('2.41 NM/US gal');
	});

	it('writes percentages with a tenth, meter factors with four decimals and K-factors with one', () => {
		expect(percent(2.345)).toBe('2.3 %');
		expect(signedPercent(2.35)).toBe('+2.4 %');
		expect(signedPercent(-0.04)).toBe('0.0 %');
		expect(meterFactor(1.023)).toBe('1.0230');
		expect(kFactor(68000)).toBe('68,000.0');
	});

	it('groups thousands only from five digits, with a point for decimals', () => {
		expect(count(4500)).toBe('4500');
		expect(count(12345)).toBe('12,345');
		expect(num(1234567.891, 1)).toBe('1,234,567.9');
	});

	it('rounds margins down and writes a true minus sign', () => {
		expect(fuelMargin(3.29, 'usgal')).toBe('+3.2 US gal');
		expect(fuelMargin(-3.21, 'usgal')).toBe('−3.3 US gal');
		expect(signedNum(-0.4, 1)).toBe('−0.4');
		expect(signedNum(0, 1)).toBe('0.0');
		expect(landedMargin(10 * LITRES_PER_US_GALLON + 0.19, 'usgal', 0.72)).toBe('+10.0 US gal');
	});

	it('converts litres for display at the unit’s precision', () => {
		// NIST HB44 Appendix C: 1 US gal = 3.785411784 L, so 30 US gal is 113.56… L.
		expect(fuel(30 * LITRES_PER_US_GALLON, 'usgal', 0.72)).toBe('30.0 US gal');
		expect(fuel(30 * LITRES_PER_US_GALLON, 'l', 0.72)).toBe('113.6 L');
		expect(fuel(30 * LITRES_PER_US_GALLON, 'usgal', 0.72, 'down')).toBe('30.0 US gal');
	});

	it('marks missing figures with a dash and never writes "NaN"', () => {
		expect(fuelAmount(NaN, 'l')).toBe('—');
		expect(speed(null, 'kt')).toBe('—');
		expect(percent(Infinity)).toBe('—');
		expect(fuel(undefined, 'l', 0.72)).toBe('—');
	});

	it('writes file sizes in KB below a megabyte and MB above', () => {
		expect(fileSize(10)).toBe('1 KB');
		expect(fileSize(850 * 1024)).toBe('850 KB');
		expect(fileSize(12.4 * 1024 * 1024)).toBe('12.4 MB');
	});
});

describe('dates and times: UTC first, ISO dates, a 24-hour clock', () => {
	it('writes the UTC date as ISO yyyy-mm-dd and the time on a 24-hour clock', () => {
		expect(isoDate(WINTER)).toBe('2026-01-15');
		expect(utcClock(WINTER)).toBe('14:05');
		expect(utcClock(WINTER, true)).toBe('14:05:09');
		expect(utcDateTime(new Date(WINTER * 1000))).toBe('2026-01-15 14:05');
		expect(utcClock(Date.UTC(2026, 0, 15, 0, 30) / 1000)).toBe('00:30');
	});

	it('adds the local time of the zone, with its short name', () => {
		expect(timeText(WINTER, 'Europe/Paris')).toBe('14:05 UTC (15:05 CET)');
		expect(timeText(SUMMER, 'Europe/Paris')).toBe('14:05 UTC (16:05 CEST)');
		expect(timeText(SUMMER, 'Europe/London')).toBe('14:05 UTC (15:05 BST)');
		expect(timeText(WINTER, 'America/New_York', true)).toBe('14:05:09 UTC (09:05:09 EST)');
		expect(dateTimeText(WINTER, 'Europe/Paris')).toBe('2026-01-15 14:05 UTC (15:05 CET)');
	});

	it('falls back to the offset where the zone has no abbreviation', () => {
		expect(zoneName(WINTER, 'Asia/Tokyo')).toBe('GMT+9');
		expect(timeText(WINTER, 'Asia/Tokyo')).toBe('14:05 UTC (23:05 GMT+9)');
	});

	it('writes the local date when the local day is another day', () => {
		const late = Date.UTC(2026, 0, 15, 23, 30) / 1000;
		expect(dateTimeText(late, 'Europe/Paris')).toBe('2026-01-15 23:30 UTC (2026-01-16 00:30 CET)');
		expect(localTime(late, 'America/Los_Angeles', { withDate: true })).toBe('2026-01-15 15:30 PST');
	});

	it('shows UTC alone when no zone is known yet or the zone is UTC', () => {
		expect(timeText(WINTER, null)).toBe('14:05 UTC');
		expect(timeText(WINTER, 'UTC')).toBe('14:05 UTC');
		expect(timeText(WINTER, 'Etc/UTC')).toBe('14:05 UTC');
		expect(localSuffix(WINTER, null)).toBe('');
		expect(localSuffix(WINTER, 'Europe/Paris')).toBe(' (15:05 CET)');
	});

	it('marks a missing time with a dash', () => {
		expect(timeText(NaN, 'Europe/Paris')).toBe('—');
		expect(isoDate(null)).toBe('—');
		expect(dateTimeText(new Date(NaN), null)).toBe('—');
	});

	it('knows the IANA zones of the platform and refuses others', () => {
		expect(isTimeZone('Europe/Paris')).toBe(true);
		expect(isTimeZone('UTC')).toBe(true);
		expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
		expect(isTimeZone('')).toBe(false);
		expect(isTimeZone('europe/paris ')).toBe(false);
	});
});

describe('durations', () => {
	it('shows hours as h:mm', () => {
		// FAA-H-8083-25, Navigation chapter: 210 NM at 140 kt takes 1 h 30 min.
		expect(formatDuration(210 / 140)).toBe('1:30');
		expect(formatDuration(4)).toBe('4:00');
		expect(formatDuration(0.05)).toBe('0:03');
		expect(formatDuration(12.25)).toBe('12:15');
	});

	it('rounds to the nearest minute, or down for what is left', () => {
		expect(formatDuration(1 + 59.6 / 60)).toBe('2:00');
		expect(formatDuration(1 + 59.6 / 60, { round: 'down' })).toBe('1:59');
		expect(formatDuration(1.5, { round: 'down' })).toBe('1:30');
	});

	it('keeps the sign and marks missing values', () => {
		expect(formatDuration(-0.5)).toBe('−0:30');
		expect(formatDuration(-0.001)).toBe('0:00');
		expect(formatDuration(NaN)).toBe('–:––');
		expect(formatDuration(Infinity, { missing: '—' })).toBe('—');
		expect(formatSeconds(5400)).toBe('1:30');
	});

	it('writes elapsed time as h:mm:ss and ages in s, min or h', () => {
		expect(elapsed(3723)).toBe('1:02:03');
		expect(elapsed(-4)).toBe('0:00:00');
		expect(age(42)).toBe('42 s');
		expect(age(185)).toBe('3 min 5 s');
		expect(age(7200)).toBe('2 h');
	});
});
