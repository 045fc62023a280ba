import { describe, expect, it } from 'vitest';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { comparePlan, DEFAULT_TOLERANCE_PERCENT } from './plan-actual';
import { workPlan, type PlanLeg } from './plan';
import type { WaypointPassage } from './passage';

const GAL = LITRES_PER_US_GALLON; // NIST Handbook 44, Appendix C
const leg = (to: string, distanceNm: number): PlanLeg => ({ to, distanceNm, gsKt: 100, timeMin: null, flowLph: 6 * GAL, fuelL: null, refuelToL: null });

// A flight on a one-minute clock: taxi 0–9 min (slow), airborne from minute 10 on.
function actual(minutes: number, flowGph: (m: number) => number) {
	const t: number[] = [], gs: number[] = [], used: number[] = [], onBoard: number[] = [];
	let u = 0;
	for (let m = 0; m <= minutes; m++) {
		if (m > 0) u += (flowGph(m) * GAL) / 60;
		t.push(1_780_000_000 + m * 60);
		gs.push(m < 10 ? 8 : 100);
		used.push(u);
		onBoard.push(30 * GAL - u);
	}
	return { t, gs, used, onBoard, airborneGsKt: 40 };
}
const passage = (wpt: string, index: number, t: number): WaypointPassage => ({ wpt, index, t, by: 'minimum', runStart: 0, runEnd: index });

describe('comparePlan', () => {
	// Plan (FAA-H-8083-25 arithmetic): 50 NM at 100 kt = 30 min; at 6 gal/h = 3 gal, per leg.
	const plan = workPlan({ startOnBoardL: 30 * GAL, taxiL: 1 * GAL, climbL: 0, reserve: { ruleId: 'faa-91.151-vfr-day' }, reserveFlowLph: 6 * GAL, legs: [leg('ALPHA', 50), leg('BRAVO', 50)] });

	it('measures each leg from take-off or the previous passage, and marks a leg beyond the tolerance', () => {
		// Taxi at 6 gal/h for 10 min (1 gal), leg 1 at 6 gal/h (on plan), leg 2 at 7.2 gal/h (+20 %).
		const a = actual(70, (m) => (m <= 40 ? 6 : 7.2));
		const c = comparePlan(plan, [passage('ALPHA', 40, a.t[40]), passage('BRAVO', 70, a.t[70])], a);
		const [l1, l2] = c.legs;
		expect(l1.actualTimeH).toBeCloseTo(0.5, 10); // minute 10 to 40
		expect(l1.actualFuelL / GAL).toBeCloseTo(4, 10); // 1 gal taxi + 3 gal leg, as planned
		expect(l1.fuelDiffPercent).toBeCloseTo(0, 10);
		expect(l1.offPlan).toBe(false);
		expect(l2.actualFuelL / GAL).toBeCloseTo(3.6, 10);
		expect(l2.fuelDiffL / GAL).toBeCloseTo(0.6, 10);
		expect(l2.fuelDiffPercent).toBeCloseTo(20, 10);
		expect(l2.offPlan).toBe(true);
		expect(l2.onBoardDiffL / GAL).toBeCloseTo(-0.6, 10);
		// Reserve 30 min at 6 gal/h = 3 gal (14 CFR 91.151(a)(1)); 30 − 7.6 − 3 = 19.4 gal margin.
		expect(l2.actualMarginL / GAL).toBeCloseTo(19.4, 10);
		expect(c.offPlanCount).toBe(1);
		expect(c.tolerancePercent).toBe(DEFAULT_TOLERANCE_PERCENT);
		expect(c.plannedLine.t).toEqual([a.t[0], a.t[10], a.t[40], a.t[40], a.t[70]]);
		expect(c.plannedLine.onBoardL.map((x) => +(x / GAL).toFixed(6))).toEqual([30, 29, 26, 26, 23]);
	});

	it('a wider tolerance marks nothing; a waypoint never reported leaves the leg unflown', () => {
		const a = actual(70, (m) => (m <= 40 ? 6 : 7.2));
		expect(comparePlan(plan, [passage('ALPHA', 40, a.t[40]), passage('BRAVO', 70, a.t[70])], a, 25).offPlanCount).toBe(0);
		const c = comparePlan(plan, [passage('ALPHA', 40, a.t[40])], a);
		expect(c.flownCount).toBe(1);
		expect(c.legs[1].passage).toBeNull();
		expect(c.legs[1].actualFuelL).toBeNaN();
		expect(c.legs[1].offPlan).toBe(false);
	});

	it('starts a leg after a stop at the last take-off, not at the passage before landing', () => {
		const a = actual(70, () => 6);
		for (let m = 42; m < 50; m++) a.gs[m] = 0; // landed at ALPHA, took off again at minute 50
		const c = comparePlan(plan, [passage('ALPHA', 40, a.t[40]), passage('BRAVO', 70, a.t[70])], a);
		expect(c.legs[1].actualTimeH).toBeCloseTo(20 / 60, 10);
	});
});
