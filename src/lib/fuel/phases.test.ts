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
import { columns, crossCountry, input, profile, series } from './test-fixtures';

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

	it('without altitude or any reference flow, needs a high-flow segment standing out before it says climb', () => {
		const c = computeFlight(input(columns(crossCountry({ withAlt: false }))));
		// The climb after take-off has nothing lower before it: cruise (its flow counts towards the
		// measured cruise, which makes the reserve amount larger, never smaller).
		expect([at(c.phase, 10), at(c.phase, 50), at(c.phase, 102)]).toEqual([PHASE_CRUISE, PHASE_CRUISE, PHASE_DESCENT]);
	});

	it('uses the aircraft’s recent cruise flow as the reference when no baseline is set', () => {
		const c = computeFlight(input(columns(crossCountry({ withAlt: false })), { recentCruiseFlowLph: 30 }));
		expect([at(c.phase, 10), at(c.phase, 50), at(c.phase, 102)]).toEqual([PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT]);
	});

	it('calls a steady flight without altitude cruise, and it gets a reserve amount', () => {
		// Issue: such a flight was climb throughout, so no measured cruise and no reserve amount.
		// 5 min taxi at 12 L/h, then 60 min at 110 kt and 32 L/h, no altitude, no baseline.
		const rows = series(65 * 60, (i) => (i < 300 ? { flow: 12, gs: 8 } : { flow: 32, gs: 110 }));
		const c = computeFlight(input(columns(rows), { reserve: { ruleId: 'faa-91.151-vfr-day' } }));
		const airborne = Array.from(c.phase.subarray(330));
		expect(new Set(airborne)).toEqual(new Set([PHASE_CRUISE]));
		// 14 CFR 91.151(a)(1): 30 min at normal cruise; measured cruise 32 L/h → 16 L.
		expect(c.reserve?.basis).toBe('measured');
		expect(c.reserve?.amountL).toBeCloseTo(16, 1);
		expect(c.reserveL[c.length - 1]).toBe(c.reserve?.amountL);
	});

	it('detects a later step climb of a flight without altitude', () => {
		const rows = series(60 * 60, (i) => ({ flow: i >= 30 * 60 && i < 40 * 60 ? 60 : 30, gs: 110 }));
		const c = computeFlight(input(columns(rows)));
		expect([c.phase[20 * 60], c.phase[35 * 60], c.phase[50 * 60]]).toEqual([PHASE_CRUISE, PHASE_CLIMB, PHASE_CRUISE]);
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
