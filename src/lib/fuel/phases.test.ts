import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import {
	PHASE_CLIMB,
	PHASE_CRUISE,
	PHASE_DESCENT,
	PHASE_STOPPED,
	PHASE_TAXI,
	PHASE_UNKNOWN,
	createPhaseTracker,
	trackPhase
} from './phases';
import { columns, crossCountry, input, profile } from './test-fixtures';

/** Phase at the middle of each stretch of the fixture flight (minutes 0–5 taxi, 5–15 climb, 15–95 cruise, 95–110 descent, 110–115 taxi, 115–116 stopped). */
const at = (phase: Uint8Array, minute: number): number => phase[Math.round(minute * 60)];

describe('flight phases', () => {
	it('follows vertical speed when altitude is recorded', () => {
		const c = computeFlight(input(columns(crossCountry())));
		expect([at(c.phase, 3), at(c.phase, 10), at(c.phase, 50), at(c.phase, 102), at(c.phase, 112), at(c.phase, 115.9)]).toEqual([
			PHASE_TAXI,
			PHASE_CLIMB,
			PHASE_CRUISE,
			PHASE_DESCENT,
			PHASE_TAXI,
			PHASE_STOPPED
		]);
	});

	it('falls back to flow against the highest flow so far without altitude', () => {
		const c = computeFlight(input(columns(crossCountry({ withAlt: false }))));
		expect([at(c.phase, 10), at(c.phase, 50), at(c.phase, 102)]).toEqual([PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT]);
	});

	it('uses the baseline cruise flow when the aircraft has one', () => {
		const c = computeFlight(input(columns(crossCountry({ withAlt: false })), { profile: profile({ baselineCruiseFlowLph: 30 }) }));
		expect([at(c.phase, 10), at(c.phase, 50), at(c.phase, 102)]).toEqual([PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT]);
	});

	it('does not flip on a short blip', () => {
		const p = createPhaseTracker({ minFlowLph: 0.5, minGsKt: 3, airborneGsKt: 40, holdS: 10, baselineLph: 30 });
		const phases: number[] = [];
		for (let s = 0; s < 40; s++) {
			// Cruise at 30 L/h with a 5-second burst to 60 L/h.
			const flow = s >= 20 && s < 25 ? 60 : 30;
			phases.push(trackPhase(p, s, flow, 110, NaN));
		}
		expect(new Set(phases)).toEqual(new Set([PHASE_CRUISE]));
	});

	it('is unknown without ground speed unless the engine is off', () => {
		const p = createPhaseTracker({ minFlowLph: 0.5, minGsKt: 3, airborneGsKt: 40, holdS: 0, baselineLph: null });
		expect(trackPhase(p, 0, 30, NaN, NaN)).toBe(PHASE_UNKNOWN);
		expect(trackPhase(p, 1, 0, NaN, NaN)).toBe(PHASE_STOPPED);
	});
});
