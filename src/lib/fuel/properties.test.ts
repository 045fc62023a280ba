import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { createLiveComputation } from './live';
import { firstDifference, profile, slice, T0 } from './test-fixtures';
import type { FlightInput, FuelEvent, SampleColumns } from './types';
import { FLAG_REJECTED } from './types';
import { enduranceJudgeFlow } from './alarms';
import { arrivalCode } from './stages/arrival';
import { PHASE_CLIMB } from './phases';

// Random flights: mostly regular intervals with dropouts, repeated and backward times now and
// then, blank cells in every column, and fuel events anywhere in (or beyond) the flight.
const interval = fc.oneof(
	{ weight: 12, arbitrary: fc.double({ min: 0.2, max: 5, noNaN: true }) },
	{ weight: 2, arbitrary: fc.double({ min: 5, max: 900, noNaN: true }) },
	{ weight: 1, arbitrary: fc.constant(0) },
	{ weight: 1, arbitrary: fc.double({ min: -30, max: -0.1, noNaN: true }) }
);
const maybe = (arb: fc.Arbitrary<number>) => fc.oneof({ weight: 9, arbitrary: arb }, { weight: 1, arbitrary: fc.constant(NaN) });
const sample = fc.record({
	dt: interval,
	flow: maybe(fc.double({ min: 0, max: 150, noNaN: true })),
	gs: maybe(fc.double({ min: 0, max: 160, noNaN: true })),
	dtg: maybe(fc.double({ min: 0, max: 300, noNaN: true })),
	alt: maybe(fc.double({ min: 0, max: 12_000, noNaN: true }))
});
const event = fc.record({
	at: fc.double({ min: -0.1, max: 1.1, noNaN: true }),
	kind: fc.constantFrom<FuelEvent['kind']>('added', 'removed', 'toFull', 'toLower'),
	amountL: fc.double({ min: 0, max: 120, noNaN: true })
});
const flight = fc.record({
	samples: fc.array(sample, { maxLength: 250 }),
	events: fc.array(event, { maxLength: 5 }),
	declaredL: fc.double({ min: 0, max: 200, noNaN: true }),
	meterFactor: fc.double({ min: 0.8, max: 1.2, noNaN: true }),
	withAlt: fc.boolean()
});

type Flight = typeof flight extends fc.Arbitrary<infer T> ? T : never;

function build(f: Flight): FlightInput {
	const n = f.samples.length;
	const cols: SampleColumns = { t: new Float64Array(n), flow: new Float64Array(n), gs: new Float64Array(n), dtg: new Float64Array(n) };
	if (f.withAlt) cols.alt = new Float64Array(n);
	let t = T0;
	f.samples.forEach((s, i) => {
		t += s.dt;
		cols.t[i] = t;
		cols.flow[i] = s.flow;
		cols.gs[i] = s.gs;
		cols.dtg[i] = s.dtg;
		if (cols.alt) cols.alt[i] = s.alt;
	});
	const span = Math.max(1, t - T0);
	return {
		columns: cols,
		profile: profile({ meterFactor: f.meterFactor }),
		declaration: { kind: 'onBoard', amountL: f.declaredL },
		events: f.events.map((e) => ({ t: T0 + e.at * span, kind: e.kind, amountL: e.amountL })),
		thresholds: { lowFuelL: 30, lowEnduranceMin: 45 },
		reserve: { ruleId: 'faa-91.151-vfr-day' },
		recentCruiseFlowLph: 28
	};
}

function runLive(input: FlightInput, sizes: number[]) {
	const { columns: cols, ...rest } = input;
	const live = createLiveComputation({ ...rest, initialCapacity: 16 });
	let from = 0;
	for (let k = 0; from < cols.t.length; k++) {
		const to = Math.min(cols.t.length, from + sizes[k % sizes.length]);
		live.append(slice(cols, from, to));
		from = to;
	}
	return live.result();
}

const chunkSizes = fc.array(fc.integer({ min: 1, max: 40 }), { minLength: 1, maxLength: 10 });

describe('engine invariants (fast-check)', () => {
	it('fuel used never decreases when flow is never negative', () => {
		fc.assert(
			fc.property(flight, (f) => {
				const c = computeFlight(build(f));
				for (let i = 1; i < c.length; i++) expect(c.used[i]).toBeGreaterThanOrEqual(c.used[i - 1]);
			}),
			{ numRuns: 300 }
		);
	});

	it('on board + used − events = declared, at every sample', () => {
		fc.assert(
			fc.property(flight, (f) => {
				const c = computeFlight(build(f));
				const declared = c.declaration.onBoardL;
				let events = 0;
				let k = 0;
				const applied = c.events.filter((e) => e.index >= 0);
				for (let i = 0; i < c.length; i++) {
					while (k < applied.length && applied[k].index === i) events += applied[k++].deltaL;
					const lhs = c.onBoard[i] + c.used[i] - events;
					expect(Math.abs(lhs - declared)).toBeLessThanOrEqual(1e-9 * (1 + Math.abs(declared) + c.used[i] + Math.abs(events)));
				}
			}),
			{ numRuns: 300 }
		);
	});

	it('incremental equals batch', () => {
		fc.assert(
			fc.property(flight, chunkSizes, (f, sizes) => {
				const input = build(f);
				expect(firstDifference(runLive(input, sizes), computeFlight(input))).toBeNull();
			}),
			{ numRuns: 200 }
		);
	});

	it('the kernel’s written-out arrival state and endurance judgement are arrivalCode() and enduranceJudgeFlow()', () => {
		fc.assert(
			fc.property(flight, (f) => {
				const input = build(f);
				const c = computeFlight({ ...input, thresholds: { lowFuelL: null, lowEnduranceMin: 1e9, persistS: { endurance: 0 } } });
				for (let i = 0; i < c.length; i++) {
					if (c.flags[i] & FLAG_REJECTED) continue;
					expect(c.arrivalState[i]).toBe(arrivalCode(c.arrivalL[i], c.reserveL[i]));
				}
				// With a threshold nothing reaches, the alarm is raised at the first judged sample, with
				// the judged endurance as its value.
				const ep = c.alarms.find((a) => a.kind === 'lowEndurance');
				if (ep) {
					const i = ep.raisedIndex;
					const judged = enduranceJudgeFlow(c.flow[i], c.cruiseFlow[i], c.phase[i] === PHASE_CLIMB, 0.5);
					expect(ep.value).toBe((c.onBoard[i] / judged) * 60);
				}
			}),
			{ numRuns: 200 }
		);
	});

	it('results do not depend on how the samples are split into batches', () => {
		fc.assert(
			fc.property(flight, chunkSizes, chunkSizes, (f, a, b) => {
				const input = build(f);
				expect(firstDifference(runLive(input, a), runLive(input, b))).toBeNull();
			}),
			{ numRuns: 200 }
		);
	});
});
