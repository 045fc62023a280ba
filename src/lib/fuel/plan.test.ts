import { describe, expect, it } from 'vitest';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { legDistanceNm, legFuelL, legTimeH, workPlan, type PlanLeg } from './plan';

const GAL = LITRES_PER_US_GALLON; // NIST Handbook 44, Appendix C: 1 US gal = 3.785411784 L
const leg = (p: Partial<PlanLeg> & Pick<PlanLeg, 'to' | 'distanceNm'>): PlanLeg => ({ gsKt: null, timeMin: null, flowLph: null, fuelL: null, refuelToL: null, ...p });

describe('leg arithmetic (FAA-H-8083-25, Navigation chapter worked examples)', () => {
	it('400 NM at 100 kt takes 4 h, and at 5 gal/h that is 20 gal', () => {
		expect(legTimeH(400, 100)).toBe(4);
		expect(legFuelL(4, 5 * GAL) / GAL).toBeCloseTo(20, 12);
	});
	it('210 NM at 140 kt takes 1 h 30 min', () => {
		expect(legTimeH(210, 140) * 60).toBeCloseTo(90, 12);
	});
	it('1 h 45 min at 120 kt covers 210 NM', () => {
		expect(legDistanceNm(1.75, 120)).toBeCloseTo(210, 12);
	});
	it('has no time for a ground speed of zero (NaN, not Infinity)', () => {
		expect(legTimeH(10, 0)).toBeNaN();
	});
});

describe('workPlan', () => {
	// FAA-H-8083-25: 400 NM at 100 kt, 5 gal/h → 4 h, 20 gal; split in two legs it must agree.
	const base = {
		startOnBoardL: 40 * GAL,
		taxiL: 1 * GAL, // about 1 US gal for taxi and run-up (common practice)
		climbL: 1.5 * GAL,
		reserve: { ruleId: 'faa-91.151-vfr-day' as const }, // 14 CFR 91.151(a)(1): 30 min by day
		reserveFlowLph: 8 * GAL
	};

	it('sums legs given by speed and flow to the handbook figures, allowances included', () => {
		const w = workPlan({ ...base, legs: [leg({ to: 'ALPHA', distanceNm: 150, gsKt: 100, flowLph: 5 * GAL }), leg({ to: 'BRAVO', distanceNm: 250, gsKt: 100, flowLph: 5 * GAL })] });
		expect(w.totalTimeH).toBeCloseTo(4, 12);
		expect(w.totalDistanceNm).toBe(400);
		// 20 gal for the legs, + 1 taxi + 1.5 climb.
		expect(w.totalFuelL / GAL).toBeCloseTo(22.5, 10);
		expect(w.legs[0].fuelL / GAL).toBeCloseTo(7.5 + 1.5, 10);
		expect(w.legs[0].onBoardAtWptL / GAL).toBeCloseTo(40 - 1 - 9, 10);
		expect(w.legs[1].from).toBe('ALPHA');
		expect(w.legs[1].onBoardAtWptL / GAL).toBeCloseTo(40 - 22.5, 10);
		// Reserve: 30 min at 8 gal/h = 4 gal; arrival 17.5 gal leaves 13.5 gal above it.
		expect(w.reserve.amountL! / GAL).toBeCloseTo(4, 10);
		expect(w.arrivalMarginL / GAL).toBeCloseTo(13.5, 10);
		expect(w.reserveKept).toBe(true);
	});

	it('takes a leg given by time and fuel: 1 h 45 min over 210 NM is 120 kt', () => {
		const w = workPlan({ ...base, climbL: 0, legs: [leg({ to: 'X', distanceNm: 210, timeMin: 105, fuelL: 14 * GAL })] });
		expect(w.legs[0].gsKt).toBeCloseTo(120, 10);
		expect(w.legs[0].flowLph / GAL).toBeCloseTo(8, 10);
	});

	it('restarts the fuel on board at a planned refuel, and flags a reserve not kept', () => {
		const w = workPlan({
			...base,
			startOnBoardL: 12 * GAL,
			legs: [leg({ to: 'A', distanceNm: 100, gsKt: 100, flowLph: 5 * GAL }), leg({ to: 'B', distanceNm: 100, gsKt: 100, flowLph: 5 * GAL, refuelToL: 9 * GAL })]
		});
		expect(w.legs[1].onBoardStartL / GAL).toBeCloseTo(9, 10);
		expect(w.onBoardAtArrivalL / GAL).toBeCloseTo(4 - 0, 10);
		// 4 gal on arrival against a 4 gal reserve: kept, margin 0.
		expect(w.arrivalMarginL / GAL).toBeCloseTo(0, 10);
		const thin = workPlan({ ...base, startOnBoardL: 10 * GAL, legs: [leg({ to: 'A', distanceNm: 100, gsKt: 100, flowLph: 5 * GAL })] });
		expect(thin.reserveKept).toBe(false);
	});

	it('answers NaN for a leg without speed or time, and an unknown reserve without a flow', () => {
		const w = workPlan({ ...base, reserveFlowLph: null, legs: [leg({ to: 'A', distanceNm: 100 })] });
		expect(w.legs[0].timeH).toBeNaN();
		expect(w.reserveKept).toBeNull();
	});
});
