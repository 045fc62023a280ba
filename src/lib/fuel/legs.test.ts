import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { DEFAULT_OPTIONS } from './engine';
import { findLegs, LEG_STOP_MIN_S } from './legs';
import { summarize } from './summary';
import { columns, crossCountry, input, T0, type Row } from './test-fixtures';
import type { FuelEvent } from './types';

const thresholds = { minFlowLph: DEFAULT_OPTIONS.minFlowLph, minGsKt: DEFAULT_OPTIONS.minGsKt };

/** Rows every `step` s over [from, to] (seconds after T0), each with the given readings. */
function stretch(from: number, to: number, r: Omit<Row, 't'>, step = 10): Row[] {
	const rows: Row[] = [];
	for (let s = from; s <= to; s += step) rows.push({ t: T0 + s, ...r });
	return rows;
}

function run(rows: Row[], events: FuelEvent[] = []) {
	const cols = columns(rows);
	const c = computeFlight(input(cols, { events }));
	return { c, cols, ...findLegs(cols, c, thresholds), summary: summarize(c, cols) };
}

/**
 * Two legs: 0–3600 s at 36 L/h and 100 kt, the engine off and standing 3610–4800 s, then
 * 4810–6610 s at 30 L/h and 90 kt, sampled every 10 s. Fuel is the trapezoid rule between samples
 * (closed form: a constant flow F over T seconds uses F·T/3600 L; the 10 s ramp between a flow F
 * and 0 uses F/2 · 10/3600 L).
 */
const twoLegs = (): Row[] => [
	...stretch(0, 3600, { flow: 36, gs: 100 }),
	...stretch(3610, 4800, { flow: 0, gs: 0 }),
	...stretch(4810, 6610, { flow: 30, gs: 90 })
];

describe('logbook legs', () => {
	it('an engine-off stop of 20 min cuts the flight into two legs with their own figures', () => {
		const { legs, stops, c } = run(twoLegs());
		expect(stops).toHaveLength(1);
		expect(stops[0]).toMatchObject({ start: T0 + 3610, end: T0 + 4800, durationS: 1190, kind: 'engineOff' });
		expect(legs).toHaveLength(2);
		const [a, b] = legs;
		// Leg 1 ends at the first sample of the stop: 3600 s at 36 L/h, plus the 10 s ramp to 0.
		expect(a.start).toBe(T0);
		expect(a.end).toBe(T0 + 3610);
		expect(a.blockTimeS).toBe(3600);
		expect(a.blockTimeBasis).toBe('movement');
		expect(a.engineTimeS).toBe(3610);
		expect(a.fuelUsedL).toBeCloseTo(36 + (36 / 2) * (10 / 3600), 9);
		expect(a.averageFlowLph).toBeCloseTo(a.fuelUsedL / (3610 / 3600), 9);
		expect(a.distanceNm).toBeCloseTo(100 + (100 / 2) * (10 / 3600), 9);
		// Leg 2 starts at the last sample of the stop: the 10 s ramp from 0, then 1800 s at 30 L/h.
		expect(b.start).toBe(T0 + 4800);
		expect(b.blockTimeS).toBe(1800);
		expect(b.engineTimeS).toBe(1810);
		expect(b.fuelUsedL).toBeCloseTo(15 + (30 / 2) * (10 / 3600), 9);
		expect(b.averageFlowLph).toBeCloseTo(b.fuelUsedL / (1810 / 3600), 9);
		// Nothing burns in the stop, so the legs add up to the flight.
		expect(a.engineTimeS + b.engineTimeS).toBe(c.stats.engineTimeS);
		expect(a.fuelUsedL + b.fuelUsedL).toBeCloseTo(c.stats.usedTotalL, 9);
	});

	it('the summary carries the legs when given the columns, and none without them', () => {
		const { summary, legs, c } = run(twoLegs());
		expect(summary.legs).toEqual(legs);
		expect(summary.stops).toHaveLength(1);
		expect(summarize(c).legs).toEqual([]);
	});

	it('a stop shorter than the rule does not cut a leg; one at the rule does', () => {
		const short = LEG_STOP_MIN_S - 10;
		const rows = (pause: number) => [
			...stretch(0, 600, { flow: 36, gs: 100 }),
			...stretch(610, 610 + pause, { flow: 0, gs: 0 }),
			...stretch(620 + pause, 1200 + pause, { flow: 36, gs: 100 })
		];
		expect(run(rows(short)).legs).toHaveLength(1);
		expect(run(rows(LEG_STOP_MIN_S)).legs).toHaveLength(2);
	});

	it('without a stop there is one leg with the flight totals', () => {
		const { legs, summary } = run(crossCountry());
		expect(legs).toHaveLength(1);
		expect(legs[0].engineTimeS).toBe(summary.engineTimeS);
		expect(legs[0].fuelUsedL).toBeCloseTo(summary.fuelUsedL, 9);
		expect(legs[0].blockTimeS).toBe(summary.blockTimeS);
		expect(legs[0].averageFlowLph).toBeCloseTo(summary.averageFlowLph!, 9);
	});

	it('engine off before start and after shutdown is no stop between legs', () => {
		const { legs, stops } = run([
			...stretch(0, 900, { flow: 0, gs: 0 }),
			...stretch(910, 2000, { flow: 30, gs: 90 }),
			...stretch(2010, 3000, { flow: 0, gs: 0 })
		]);
		expect(stops).toEqual([]);
		expect(legs).toHaveLength(1);
		expect(legs[0].blockTimeS).toBe(1090);
	});

	it('a recorder silence on the ground is a stop; the time and fuel filled in it belong to no leg', () => {
		// Idle at 8 L/h standing, then nothing for 30 min, then idle again: the engine fills the
		// silence with the higher adjacent flow (8 L/h × 0.5 h = 4 L) and counts it as engine time.
		const { legs, stops, c } = run([
			...stretch(0, 1800, { flow: 30, gs: 90 }),
			...stretch(1810, 1900, { flow: 8, gs: 0 }),
			...stretch(3700, 3800, { flow: 8, gs: 0 }),
			...stretch(3810, 5600, { flow: 30, gs: 90 })
		]);
		expect(stops).toHaveLength(1);
		expect(stops[0]).toMatchObject({ start: T0 + 1900, end: T0 + 3700, kind: 'recorderGap' });
		expect(legs).toHaveLength(2);
		expect(c.stats.engineTimeS - (legs[0].engineTimeS + legs[1].engineTimeS)).toBe(1800);
		expect(c.stats.usedTotalL - (legs[0].fuelUsedL + legs[1].fuelUsedL)).toBeCloseTo(4, 9);
	});

	it('a recorder silence in flight does not cut a leg', () => {
		const { legs } = run([...stretch(0, 1800, { flow: 30, gs: 100 }), ...stretch(3600, 5400, { flow: 30, gs: 100 })]);
		expect(legs).toHaveLength(1);
	});

	it('a reset of fuel used in the second leg does not change its fuel', () => {
		const reset: FuelEvent = { t: T0 + 5000, kind: 'resetUsed' };
		const plain = run(twoLegs()).legs;
		const withReset = run(twoLegs(), [reset]).legs;
		expect(withReset[1].fuelUsedL).toBeCloseTo(plain[1].fuelUsedL, 9);
		expect(withReset[0].fuelUsedL).toBeCloseTo(plain[0].fuelUsedL, 9);
	});

	it('no samples: no legs', () => {
		expect(run([]).legs).toEqual([]);
	});
});
