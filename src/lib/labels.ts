// Words for codes shown to people, one map per list, so a code is worded the same on every page;
// each map is keyed by the list the code comes from, so a new code without words fails the type check.
import type { BaselinePhase, HighBurnCause } from '$lib/fuel';
import type { DebriefStatus, PlanImportFormat } from '$lib/wire/plan';

export const debriefStatusLabels: Record<DebriefStatus, string> = {
	draft: 'Draft — not yet shown to the student',
	published: 'Published to the student'
};

export const planImportFormatLabels: Record<PlanImportFormat, string> = {
	csv: 'CSV of legs',
	gpx: 'GPX 1.1 route'
};

export const baselinePhaseLabels: Record<BaselinePhase, string> = {
	taxi: 'Taxi',
	climb: 'Climb',
	cruise: 'Cruise',
	descent: 'Descent'
};

/** Possible causes of a high burn, as possibilities for the owner to check, never a diagnosis. */
export const highBurnCauseLabels: Record<HighBurnCause, string> = {
	sensorCalibration: 'Every phase is up by about the same factor: the flow sensor’s calibration may have drifted.',
	belowPumped: 'Computed fuel has stayed below the fuel pumped at fill-ups: the calibration, or a leak — check the aircraft.',
	mixtureNotLeaned: 'Cruise flow stayed high after the top of climb with no leaning step: the mixture may not have been leaned.',
	longClimbFullPower: 'A long climb, or one at full power for longer than usual.',
	longGroundRunning: 'The engine ran on the ground for longer than usual (taxi, run-up, waiting).'
};

export const baselineSourceLabels = {
	learned: 'learned from its flights',
	manual: 'set by hand',
	configured: 'the aircraft’s configured cruise flow (too few flights to learn from)'
} as const;

/** A leaning moment on the replay timeline. */
export const leaningTitle = 'Mixture leaned';

/** Where a calibration entry's factors came from. */
export const calibrationSourceLabels = {
	reconciliation: 'From a reconciliation with fuel pumped',
	hand: 'Set by hand',
	initial: 'Factors before dated history'
} as const;
