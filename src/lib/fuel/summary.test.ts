import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { summarize } from './summary';
import { columns, crossCountry, input, profile, T0 } from './test-fixtures';

describe('summarize', () => {
	// The fixture flight: 5 min taxi at 15 L/h (standing the first minute), 10 min climb at 56,
	// 80 min cruise at 30, 15 min descent at 18, 5 min taxi at 14, 1 min stopped.
	const rows = crossCountry();
	const c = computeFlight(input(columns(rows), { declaration: { kind: 'onBoard', amountL: 120 }, reserve: { ruleId: 'faa-91.151-vfr-day' } }));
	const s = summarize(c);
	// Trapezoid steps at each change of flow: 14 L/h → 0 at shutdown etc. Closed form by stretch:
	const expectedUsed = (5 * 15 + 10 * 56 + 80 * 30 + 15 * 18 + 5 * 14) / 60;

	it('adds up fuel used and what is left at shutdown', () => {
		// Each flow step adds half a second at the difference; a few hundredths of a litre.
		expect(s.fuelUsedL).toBeCloseTo(expectedUsed, 1);
		expect(s.onBoardAtShutdownL).toBeCloseTo(120 - s.fuelUsedL, 9);
		expect(s.sampleCount).toBe(rows.length);
		expect(s.start).toBe(T0);
		expect(s.end).toBe(rows[rows.length - 1].t);
	});

	it('times the block from first movement to rest, and the engine from start to stop', () => {
		// Moving from minute 1 to the last taxi sample before minute 115.
		expect(s.blockTimeBasis).toBe('movement');
		expect(s.blockTimeS).toBe(115 * 60 - 1 - 60);
		// Half of the first and last moving intervals count (the trapezoid on "is moving").
		expect(s.timeMovingS).toBeCloseTo(115 * 60 - 1 - 60 + 1, 9);
		expect(s.engineTimeS).toBe(115 * 60);
		expect(s.maxFlowLph).toBe(56);
		expect(s.averageFlowLph).toBeCloseTo(s.fuelUsedL / (115 / 60), 9);
	});

	it('gives time, fuel and average flow per phase', () => {
		const byName = Object.fromEntries(s.phases.map((p) => [p.name, p]));
		// Phase changes show some 20 s late (smoothing and hold), so each phase takes in a little
		// of the next one's flow: within 4 %.
		expect(Math.abs(byName.climb.averageFlowLph! - 56)).toBeLessThan(56 * 0.04);
		expect(Math.abs(byName.cruise.averageFlowLph! - 30)).toBeLessThan(30 * 0.04);
		expect(Math.abs(byName.descent.averageFlowLph! - 18)).toBeLessThan(18 * 0.04);
		// Phase changes wait for the detector's hold and smoothing: within a minute or so.
		expect(byName.climb.timeS).toBeGreaterThan(9 * 60);
		expect(byName.climb.timeS).toBeLessThan(11 * 60);
		expect(byName.cruise.timeS).toBeGreaterThan(79 * 60);
		expect(byName.cruise.timeS).toBeLessThan(81 * 60);
		const total = s.phases.reduce((a, p) => a + p.fuelL, 0);
		expect(total).toBeCloseTo(s.fuelUsedL, 9);
		expect(s.phases.slice(0, 4).map((p) => p.name)).toEqual(['taxi', 'climb', 'cruise', 'descent']);
	});

	it('gives cruise specific range as cruise distance over cruise fuel', () => {
		expect(s.cruiseSpecificRangeNmPerL).toBeCloseTo(110 / 30, 1);
		expect(s.cruiseFlowLph).toBeCloseTo(30, 0);
	});

	it('finds the thinnest airborne arrival margin that held for a minute, and when', () => {
		// The margin held over the trailing 60 s (the alarm persistence) at each airborne sample;
		// its minimum over the flight.
		let min = Infinity;
		let at = -1;
		for (let i = 0; i < c.length; i++) {
			if (!(c.phase[i] >= 3 && rows[i].gs! >= 40) || !Number.isFinite(c.arrivalL[i])) continue;
			let held = -Infinity;
			let covered = true;
			for (let j = i - 60; j <= i; j++) {
				if (j < 0 || !(c.phase[j] >= 3 && rows[j].gs! >= 40) || !Number.isFinite(c.arrivalL[j])) covered = false;
				else held = Math.max(held, c.arrivalL[j] - c.reserveL[j]);
			}
			if (covered && held < min) {
				min = held;
				at = i;
			}
		}
		expect(s.thinnestMargin).toMatchObject({ index: at, t: rows[at].t, wpt: null });
		expect(s.thinnestMargin!.marginL).toBeCloseTo(min, 12);
		expect(s.thinnestMargin!.minutes).toBeCloseTo((min / c.cruiseFlow[at]) * 60, 9);
	});

	it('gives the verdict: fuel on board at shutdown against the reserve amount', () => {
		// No baseline: 30 min (14 CFR 91.151(a)(1)) at the measured cruise flow, about 30 L/h → 15 L.
		expect(s.reserve?.basis).toBe('measured');
		expect(s.reserve?.amountL).toBeCloseTo(15, 0);
		const v = s.verdict!;
		expect(v.state).toBe('kept');
		expect(v.landedL).toBe(s.onBoardAtShutdownL);
		expect(v.marginL).toBeCloseTo(s.onBoardAtShutdownL! - s.reserve!.amountL!, 12);
		expect(v.marginMin).toBeCloseTo((v.marginL! / s.reserve!.flowLph!) * 60, 12);
		expect(v.airborne).toBe(true);
		// Never below the reserve in the flight: no "reserve reached" time at all (not hours after landing).
		expect(s.reserveReachedAt).toBeNull();
		const night = summarize(computeFlight(input(columns(rows), { profile: profile({ baselineCruiseFlowLph: 34 }), reserve: { ruleId: 'faa-91.151-vfr-night' } })));
		// 14 CFR 91.151(a)(2): 45 min × 34 L/h = 25.5 L.
		expect(night.reserve).toMatchObject({ basis: 'baseline', amountL: 25.5 });
	});

	it('says when fuel went below the reserve within the flight, and the verdict says not kept', () => {
		// About 56.3 L used (expectedUsed above). Declare 65 L.
		const low = summarize(computeFlight(input(columns(rows), { declaration: { kind: 'onBoard', amountL: 65 }, profile: profile({ baselineCruiseFlowLph: 30 }), reserve: { ruleId: 'faa-91.151-vfr-day' } })));
		const landed = 65 - low.fuelUsedL;
		expect(landed).toBeCloseTo(65 - expectedUsed, 1);
		expect(low.verdict).toMatchObject({ state: 'notKept' });
		// Worked by hand: landed ≈ 65 − 56.25 = 8.75 L against 15 L (30 min × 30 L/h): −6.25 L,
		// −12.5 min at normal cruise.
		expect(low.verdict!.marginMin).toBeCloseTo(-12.5, 0);
		expect(low.verdict!.landedL).toBeCloseTo(landed, 12);
		expect(low.verdict!.marginL).toBeCloseTo(landed - 15, 12);
		expect(low.verdict!.marginMin).toBeCloseTo(((landed - 15) / 30) * 60, 12);
		expect(low.reserveReachedAt).not.toBeNull();
		expect(low.reserveReachedAt!.t).toBeLessThanOrEqual(low.end!);
		expect(low.reserveReachedAt!.t).toBeGreaterThanOrEqual(low.start!);
	});
});
