import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { summarize } from './summary';
import { columns, crossCountry, input, profile, T0 } from './test-fixtures';

describe('summarize', () => {
	// The fixture flight: 5 min taxi at 15 L/h (standing the first minute), 10 min climb at 56,
	// 80 min cruise at 30, 15 min descent at 18, 5 min taxi at 14, 1 min stopped.
	const rows = crossCountry();
	const c = computeFlight(input(columns(rows), { declaration: { kind: 'onBoard', amountL: 120 } }));
	const s = summarize(c, { reserve: { ruleId: 'faa-91.151-vfr-day' } });
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

	it('finds the lowest reserve at a waypoint and when', () => {
		let min = Infinity;
		let at = -1;
		c.reserveAtWpt.forEach((v, i) => {
			if (v < min) {
				min = v;
				at = i;
			}
		});
		expect(s.lowestReserveAtWpt).toMatchObject({ reserveL: min, index: at, t: rows[at].t, wpt: null });
	});

	it('projects when on board reaches the reserve at the last flow', () => {
		// No baseline: 30 min at the measured cruise flow.
		expect(s.reserve?.basis).toBe('measured');
		expect(s.reserve?.amountL).toBeCloseTo(15, 0);
		const r = s.reserveReached!;
		expect(r.flowLph).toBe(14);
		const lastRun = c.stats.lastRunIndex;
		expect(r.t).toBeCloseTo(rows[lastRun].t + ((c.onBoard[lastRun] - s.reserve!.amountL!) / 14) * 3600, 3);
		expect(r.alreadyBelow).toBe(false);
		const baseline = summarize(computeFlight(input(columns(rows), { profile: profile({ baselineCruiseFlowLph: 34 }) })), {
			reserve: { ruleId: 'faa-91.151-vfr-night' }
		});
		expect(baseline.reserve).toMatchObject({ basis: 'baseline', amountL: 25.5 });
	});
});
