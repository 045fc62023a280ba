// The live page and the replay set the same plan against the same samples with one function: fed
// in chunks as a live view receives them, the legs passed carry the figures a replay of the whole
// flight gives; while the flight is open, the waypoint being flown to is not yet "passed".
import { describe, expect, it } from 'vitest';
import { computeFlight, createLiveComputation } from '$lib/fuel';
import { columns, input, profile, series, slice } from '$lib/fuel/test-fixtures';
import { LITRES_PER_US_GALLON } from '$lib/units';
import type { FuelPlanWire } from '$lib/wire/plan';
import { planReport } from './plan-report';

const GAL = LITRES_PER_US_GALLON; // NIST Handbook 44, Appendix C
const NAMES = ['ALPHA', 'BRAVO', 'CHARLY'];
// Taxi 300 s, then three legs of 1200 s at 100 kt (33.3 NM each), flow 8 gal/h then 10 on leg 3.
const rows = series(300 + 3 * 1200, (i) => {
	if (i < 300) return { flow: 3 * GAL, gs: 8, dtg: 33.3, wpt: 0 };
	const k = Math.min(2, Math.floor((i - 300) / 1200));
	const into = (i - 300) % 1200;
	return { flow: (k === 2 ? 10 : 8) * GAL, gs: 100, dtg: Math.max(0, 33.3 - (into / 3600) * 100), wpt: k };
});
const cols = columns(rows);
const leg = (to: string) => ({ to, distanceNm: 33.3, gsKt: 100, timeMin: null, flowLph: 8 * GAL, fuelL: null, refuelToL: null });
const plan: FuelPlanWire = {
	id: 'p',
	flightId: 'f',
	startOnBoardL: 40 * GAL,
	taxiL: 0.25 * GAL,
	climbL: 0,
	reserveRule: 'faa-91.151-vfr-day',
	reserveCustomMin: null,
	reserveFlowLph: 8 * GAL,
	tolerancePercent: 10,
	legs: NAMES.map(leg),
	expectedDepartureAt: null,
	pilotId: null,
	updatedAt: new Date(0).toISOString()
};
const inputs = input(cols, { profile: profile(), declaration: { kind: 'onBoard', amountL: 40 * GAL }, reserve: { ruleId: 'faa-91.151-vfr-day' } });
const replay = planReport(plan, computeFlight(inputs), cols, NAMES);

describe('planReport on a live flight', () => {
	it('a replay of the whole flight passes every leg and marks the leg flown at 10 gal/h against 8 planned', () => {
		expect(replay.comparison.flownCount).toBe(3);
		expect(replay.comparison.legs.map((l) => l.offPlan)).toEqual([false, false, true]);
	});

	it('fed in chunks, the legs passed carry the replay’s figures; the leg being flown waits for its passage', () => {
		const { columns: _c, ...rest } = inputs;
		const live = createLiveComputation({ ...rest, initialCapacity: 64 });
		// Up to the middle of leg 3: ALPHA and BRAVO passed, CHARLY not yet.
		const stop = 300 + 2 * 1200 + 600;
		for (let from = 0; from < stop; from += 250) live.append(slice(cols, from, Math.min(stop, from + 250)));
		const now = planReport(plan, live.result(), live.columns(), NAMES, { inFlight: true });
		expect(now.comparison.flownCount).toBe(2);
		expect(now.comparison.legs[2].passage).toBeNull();
		for (const k of [0, 1]) {
			const a = now.comparison.legs[k];
			const b = replay.comparison.legs[k];
			expect(a.passage?.index).toBe(b.passage?.index);
			for (const f of ['actualTimeH', 'actualFuelL', 'actualOnBoardL', 'fuelDiffL', 'fuelDiffPercent', 'actualMarginL'] as const) expect(a[f]).toBe(b[f]);
			expect(a.offPlan).toBe(b.offPlan);
		}
		// The same samples as a closed flight: the leg in progress counts as passed at its nearest point.
		expect(planReport(plan, live.result(), live.columns(), NAMES).comparison.flownCount).toBe(3);
	});
});
