import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { createLiveComputation } from './live';
import { buildRandomFlight, firstDifference, randomFlight, slice } from './test-fixtures';
import type { FlightInput } from './types';
import { FLAG_REJECTED } from './types';
import { enduranceJudgeFlow } from './alarms';
import { arrivalCode } from './stages/arrival';
import { PHASE_CLIMB } from './phases';

const flight = randomFlight();
const build = buildRandomFlight;

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
