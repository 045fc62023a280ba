import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { findLeaningMoments } from './leaning';
import { summarize } from './summary';
import { T0, columns, crossCountry, input } from './test-fixtures';

function run(rows: ReturnType<typeof crossCountry>) {
	const cols = columns(rows);
	const c = computeFlight(input(cols));
	return { cols, c, moments: findLeaningMoments({ t: cols.t, flow: c.flow, gs: cols.gs, alt: cols.alt, phase: c.phase }) };
}

describe('findLeaningMoments', () => {
	it('finds the step down from 33 to 30 L/h twenty minutes into a level cruise', () => {
		// Cruise runs from minute 15 to 95; the pilot leans at minute 35.
		const rows = crossCountry().map((r) => {
			const m = (r.t - T0) / 60;
			return m >= 15 && m < 35 ? { ...r, flow: 33 } : r;
		});
		const { moments } = run(rows);
		expect(moments).toHaveLength(1);
		expect(Math.abs(moments[0].t - (T0 + 35 * 60))).toBeLessThanOrEqual(2);
		expect(moments[0].fromLph).toBeCloseTo(33, 1);
		expect(moments[0].toLph).toBeCloseTo(30, 1);
	});

	it('does not take the power reduction at the top of climb, or a descent, for leaning', () => {
		expect(run(crossCountry()).moments).toEqual([]);
	});

	it('per-phase average flow is the integral over the phase divided by its time', () => {
		// Constant flows: the cruise integral is 30 L/h × its time, so the average is 30 L/h exactly
		// (closed form), apart from the samples where the phase detector changes phase.
		const { c } = run(crossCountry());
		const cruise = summarize(c).phases.find((p) => p.name === 'cruise')!;
		expect(cruise.averageFlowLph).toBeCloseTo(cruise.fuelL / (cruise.timeS / 3600), 12);
		expect(Math.abs(cruise.averageFlowLph! - 30)).toBeLessThan(0.3);
	});
});
