import { describe, expect, it } from 'vitest';
import { fromLitres, toLitresPerHour } from '../units';
import { computeFlight } from './compute';
import { summarize } from './summary';
import { columns, crossCountry, input, profile, series, T0 } from './test-fixtures';
import { ARRIVAL_KEEPS, FLAG_WAYPOINT } from './types';
import { enduranceH, minutesAtFlow, specificRangeNmPerL, timeToWaypointH } from './waypoint';

describe('FAA-H-8083-25 worked examples', () => {
	it('400 NM at 100 kt takes 4 h, and at 5 gal/h needs 20 gal', () => {
		// FAA-H-8083-25 Pilot's Handbook of Aeronautical Knowledge, Navigation chapter.
		const flow = toLitresPerHour(5, 'usgal/h');
		const c = computeFlight(input(columns([{ t: T0, flow, gs: 100, dtg: 400 }]), { declaration: { kind: 'onBoard', amountL: 120 } }));
		expect(c.timeToWpt[0]).toBe(4);
		expect(fromLitres(c.fuelToWpt[0], 'usgal')).toBeCloseTo(20, 12);
		expect(c.arrivalL[0]).toBeCloseTo(120 - toLitresPerHour(20, 'usgal/h'), 12);
		expect(c.flags[0] & FLAG_WAYPOINT).toBe(FLAG_WAYPOINT);
	});

	it('210 NM at 140 kt takes 1 h 30 min', () => {
		// FAA-H-8083-25, Navigation chapter.
		const c = computeFlight(input(columns([{ t: T0, flow: 30, gs: 140, dtg: 210 }])));
		expect(c.timeToWpt[0]).toBe(1.5);
	});

	it('1 h 45 min at 120 kt covers 210 NM', () => {
		// FAA-H-8083-25, Navigation chapter.
		const c = computeFlight(input(columns(series(105 * 60 + 1, () => ({ flow: 30, gs: 120 })))));
		expect(summarize(c).distanceNm).toBeCloseTo(210, 9);
	});

	it('270 NM in 3 h is 90 kt', () => {
		// FAA-H-8083-25, Navigation chapter: ground speed = distance ÷ time.
		const c = computeFlight(
			input(columns(series(3 * 3600 + 1, (i) => ({ flow: 30, gs: i < 3600 ? 80 : i < 7200 ? 90 : 100 }))))
		);
		const s = summarize(c);
		expect(s.distanceNm).toBeCloseTo(270, 1);
		expect(s.averageGsKt).toBeCloseTo(90, 2);
	});
});

describe('per-sample figures', () => {
	it('endurance is fuel on board ÷ flow; the arrival margin in minutes at normal-cruise flow', () => {
		const c = computeFlight(
			input(columns([{ t: T0, flow: 30, gs: 110, dtg: 55 }]), {
				declaration: { kind: 'onBoard', amountL: 90 },
				profile: profile({ baselineCruiseFlowLph: 24 }),
				reserve: { ruleId: 'faa-91.151-vfr-day' }
			})
		);
		expect(c.endurance[0]).toBe(3);
		expect(c.fuelToWpt[0]).toBeCloseTo(15, 12);
		expect(c.arrivalL[0]).toBeCloseTo(75, 12);
		// 14 CFR 91.151(a)(1): 30 min at normal cruise, here the set 24 L/h → 12 L reserve;
		// margin 75 − 12 = 63 L = 157.5 min at 24 L/h (not at the present 30 L/h).
		expect(c.reserveL[0]).toBeCloseTo(12, 12);
		expect(c.arrivalMarginMin[0]).toBeCloseTo(157.5, 12);
		expect(c.arrivalState[0]).toBe(ARRIVAL_KEEPS);
		expect(c.specificRange[0]).toBeCloseTo(110 / 30, 12);
	});

	it('gives no waypoint figures on the ground: NaN, never Infinity', () => {
		const c = computeFlight(input(columns([{ t: T0, flow: 15, gs: 0, dtg: 80 }, { t: T0 + 1, flow: 15, gs: 8, dtg: 80 }])));
		for (const a of [c.timeToWpt, c.fuelToWpt, c.arrivalL, c.arrivalMarginMin, c.specificRange]) {
			expect(Number.isNaN(a[0])).toBe(true);
			expect(Number.isNaN(a[1])).toBe(true);
		}
		expect(c.flags[0] & FLAG_WAYPOINT).toBe(0);
		expect(c.endurance[1]).toBeCloseTo((150 - 15 / 3600) / 15, 12);
	});

	it('helpers refuse to divide by nothing', () => {
		expect(timeToWaypointH(10, 0, 0)).toBeNaN();
		expect(timeToWaypointH(NaN, 100, 40)).toBeNaN();
		expect(enduranceH(50, 0, 0.5)).toBeNaN();
		expect(minutesAtFlow(10, 0.1, 0.5)).toBeNaN();
		expect(specificRangeNmPerL(100, 0, 40, 0.5)).toBeNaN();
	});
});

describe('rules of thumb', () => {
	it('endurance shown in climb is about half the cruise endurance (climb flow near twice cruise)', () => {
		// Rule of thumb (common practice): at sea-level climb the flow is close to twice cruise,
		// so the endurance shown in climb is about half the real cruise endurance.
		const c = computeFlight(input(columns(crossCountry())));
		const climbSample = 10 * 60; // mid-climb, flow 56 L/h
		const cruiseSample = 15 * 60 + 30; // first cruise minute, flow 30 L/h
		const ratio = c.endurance[climbSample] / c.endurance[cruiseSample];
		expect(ratio).toBeGreaterThan(0.45);
		expect(ratio).toBeLessThan(0.6);
	});
});
