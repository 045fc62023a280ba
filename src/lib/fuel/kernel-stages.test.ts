// The staged kernel against the single-loop kernel it replaced (engine-before-stages.ts, kept
// only until this has run on main): the same flights, generated here, must give bit-identical
// results in batch and in live appends of any size. Remove both files together.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import * as before from './engine-before-stages';
import { computeFlight } from './compute';
import { KERNEL_BLOCK } from './engine';
import { createLiveComputation } from './live';
import { buildRandomFlight, firstDifference, profile, randomFlight, rng, slice, T0 } from './test-fixtures';
import type { FlightComputation, FlightInput, FuelEvent, SampleColumns } from './types';

function computeBefore(input: FlightInput): FlightComputation {
	const setup = before.prepare(input);
	const n = input.columns.t.length;
	const out = before.allocOutputs(n);
	const state = before.createState(setup);
	before.runKernel(state, input.columns, out, 0, n);
	return before.snapshot(state, out, n);
}

function live(input: FlightInput, sizes: number[]): FlightComputation {
	const { columns: cols, ...rest } = input;
	const l = createLiveComputation({ ...rest, initialCapacity: 16 });
	for (let from = 0, k = 0; from < cols.t.length; k++) {
		const to = Math.min(cols.t.length, from + sizes[k % sizes.length]);
		l.append(slice(cols, from, to));
		from = to;
	}
	return l.result();
}

function same(a: FlightComputation, b: FlightComputation): string | null {
	return firstDifference(a, b) ?? (JSON.stringify(a.warnings) === JSON.stringify(b.warnings) ? null : 'warnings differ');
}

/**
 * A long invented flight (several kernel blocks) with everything the kernel treats specially:
 * blank flow stretches (some across block ends), blank speeds, dropouts, repeated, backward and
 * absurd rows, fuel events of every kind (a "used" reset too), alarms near their thresholds.
 */
function longFlight(seed: number, n: number, options: { withAlt: boolean; baseline: boolean }): FlightInput {
	const rand = rng(seed);
	const cols: SampleColumns = { t: new Float64Array(n), flow: new Float64Array(n), gs: new Float64Array(n), dtg: new Float64Array(n), wpt: new Int32Array(n) };
	if (options.withAlt) cols.alt = new Float64Array(n);
	const events: FuelEvent[] = [];
	let t = T0;
	let blankFlowLeft = 0;
	let dtg = 30;
	let wpt = 1;
	for (let i = 0; i < n; i++) {
		const r = rand();
		t += r < 0.002 ? 40 + rand() * 300 : r < 0.004 ? 0 : r < 0.005 ? -5 : 1;
		const k = (i % 4000) / 4000;
		const climb = k > 0.1 && k < 0.2;
		const cruise = k >= 0.2 && k < 0.8;
		let flow = k < 0.1 ? 14 : climb ? 55 : cruise ? 30 + rand() * 3 : k < 0.9 ? 18 : 0;
		const gs = k < 0.1 ? (k < 0.02 ? 0 : 8) : k < 0.9 ? 75 + (cruise ? 30 : 0) + rand() * 5 : 0;
		if (blankFlowLeft > 0) {
			blankFlowLeft--;
			flow = NaN;
		} else if (rand() < 0.004) blankFlowLeft = Math.floor(rand() * (rand() < 0.2 ? 900 : 20));
		dtg -= gs / 3600;
		if (dtg < 0) {
			dtg = 20 + rand() * 40;
			wpt++;
		}
		cols.t[i] = t;
		cols.flow[i] = rand() < 0.001 ? -3 : flow;
		cols.gs[i] = rand() < 0.01 ? NaN : rand() < 0.001 ? 900 : gs;
		cols.dtg[i] = gs > 0 ? dtg : NaN;
		cols.wpt![i] = wpt;
		if (cols.alt) cols.alt[i] = rand() < 0.01 ? NaN : climb ? 500 + (k - 0.1) * 60000 : cruise ? 6500 : 500;
		if (rand() < 0.0015) {
			const kinds: FuelEvent['kind'][] = ['added', 'removed', 'toFull', 'toLower', 'resetUsed'];
			events.push({ t: t + rand() * 3, kind: kinds[Math.floor(rand() * kinds.length)], amountL: 5 + rand() * 60 });
		}
	}
	return {
		columns: cols,
		profile: profile({ meterFactor: 1.03, ...(options.baseline ? { baselineCruiseFlowLph: 31 } : {}) }),
		declaration: { kind: 'onBoard', amountL: 120 },
		events,
		thresholds: { lowFuelL: 45, lowEnduranceMin: 150 },
		reserve: { ruleId: 'faa-91.151-vfr-day' },
		recentCruiseFlowLph: seed % 2 ? 29 : undefined
	};
}

describe('staged kernel equals the single-loop kernel it replaced', () => {
	const cases = [
		{ seed: 1, n: 19 * KERNEL_BLOCK + 17, withAlt: true, baseline: false },
		{ seed: 2, n: 12_000, withAlt: false, baseline: false },
		{ seed: 3, n: 8_000, withAlt: true, baseline: true }
	];
	for (const c of cases) {
		it(`long flight ${c.seed}: ${c.n} samples, altitude ${c.withAlt}, baseline ${c.baseline}; batch and live`, () => {
			const input = longFlight(c.seed, c.n, c);
			const reference = computeBefore(input);
			// The flight exercises what it is meant to, or the comparison proves little.
			expect(reference.gaps.some((g) => g.kind === 'flow')).toBe(true);
			expect(reference.gaps.some((g) => g.kind === 'time')).toBe(true);
			expect(reference.problems.length).toBeGreaterThan(0);
			expect(reference.events.filter((e) => e.index >= 0).length).toBeGreaterThan(2);
			expect(reference.alarms.length).toBeGreaterThan(0);
			expect(same(computeFlight(input), reference)).toBeNull();
			expect(same(live(input, [10]), reference)).toBeNull();
			expect(same(live(input, [1, 333, 7, KERNEL_BLOCK + 1]), reference)).toBeNull();
		});
	}

	it('short random flights (fast-check), batch and live', () => {
		fc.assert(
			fc.property(randomFlight({ resetUsed: true }), fc.array(fc.integer({ min: 1, max: 40 }), { minLength: 1, maxLength: 6 }), (f, sizes) => {
				const input = buildRandomFlight(f);
				const reference = computeBefore(input);
				expect(same(computeFlight(input), reference)).toBeNull();
				expect(same(live(input, sizes), reference)).toBeNull();
			}),
			{ numRuns: 300 }
		);
	});
});
