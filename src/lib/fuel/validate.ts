// Row checks: time must move forward, and values must be physically possible. A failing row is
// skipped by the engine and reported with its index, field and reason for the parser to reject.

import type { DataProblem, ProblemField, ProblemReason } from './types';

/** Limits for absurd values (our choice: well beyond any light aircraft, well short of nonsense). */
export const DEFAULT_LIMITS = {
	maxFlowLph: 500,
	maxGsKt: 400,
	/** Half the Earth's circumference is about 10,800 NM; no next waypoint is further. */
	maxDtgNm: 10_800,
	minAltFt: -2_000,
	maxAltFt: 60_000
} as const;

export interface RowLimits {
	maxFlowLph: number;
	maxGsKt: number;
	maxDtgNm: number;
	minAltFt: number;
	maxAltFt: number;
}

// Problem codes pack field and reason into one small integer so the check allocates nothing.
const FIELDS: ProblemField[] = ['t', 'flow', 'gs', 'dtg', 'alt'];
const REASONS: ProblemReason[] = ['missingTime', 'repeatedTime', 'backwardTime', 'negative', 'absurd'];
const code = (field: number, reason: number): number => field * 8 + reason + 1;

export const ROW_OK = 0;

/** 0 when the row is usable, else a code for describeProblem. NaN in a value column is fine (blank). */
export function rowProblem(
	t: number,
	lastT: number,
	flow: number,
	gs: number,
	dtg: number,
	alt: number,
	lim: RowLimits
): number {
	if (t !== t) return code(0, 0);
	if (t === Infinity || t === -Infinity) return code(0, 4);
	if (t === lastT) return code(0, 1);
	if (t < lastT) return code(0, 2);
	if (flow < 0) return code(1, 3);
	if (flow > lim.maxFlowLph) return code(1, 4);
	if (gs < 0) return code(2, 3);
	if (gs > lim.maxGsKt) return code(2, 4);
	if (dtg < 0) return code(3, 3);
	if (dtg > lim.maxDtgNm) return code(3, 4);
	if (alt < lim.minAltFt || alt > lim.maxAltFt) return code(4, 4);
	return ROW_OK;
}

const UNITS: Record<ProblemField, string> = { t: 's', flow: 'L/h', gs: 'kt', dtg: 'NM', alt: 'ft' };

export function describeProblem(problemCode: number, index: number, value: number, lastT: number): DataProblem {
	const c = problemCode - 1;
	const field = FIELDS[c >> 3];
	const reason = REASONS[c & 7];
	let message: string;
	switch (reason) {
		case 'missingTime':
			message = 'the time is missing';
			break;
		case 'repeatedTime':
			message = `the time ${value} repeats the previous row's`;
			break;
		case 'backwardTime':
			message = `the time ${value} is ${lastT - value} s earlier than the previous row's`;
			break;
		case 'negative':
			message = `${field} is negative (${value} ${UNITS[field]})`;
			break;
		default:
			message = `${field} is not a plausible value (${value} ${UNITS[field]})`;
	}
	return { index, field, reason, value, message: `Sample ${index}: ${message}; sample skipped.` };
}

/** The value of the field a problem code names, for the report. */
export function problemField(problemCode: number): ProblemField {
	return FIELDS[(problemCode - 1) >> 3];
}
