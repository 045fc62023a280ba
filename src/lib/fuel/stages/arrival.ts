// Stage 5 of the engine pass: the reserve amount in force (the rule's minutes at the normal-cruise
// flow of stage 3), when fuel on board first reaches it, and the figures towards the next
// waypoint: time and fuel to get there, fuel left on arrival, its margin over the reserve in
// minutes of cruise, the arrival state, and specific range.

import type { EngineState, Outputs } from '../engine';
import { PHASE_STOPPED, PHASE_TAXI } from '../phases';
import {
	ARRIVAL_EATS_INTO,
	ARRIVAL_KEEPS,
	ARRIVAL_NO_RESERVE,
	ARRIVAL_NONE,
	ARRIVAL_RUNS_OUT,
	FLAG_REJECTED,
	FLAG_WAYPOINT,
	type SampleColumns
} from '../types';
import { fuelToWaypointL, specificRangeNmPerL, timeToWaypointH } from '../waypoint';

const K_FLAG_REJECTED = FLAG_REJECTED;
const K_FLAG_WAYPOINT = FLAG_WAYPOINT;
const K_PHASE_STOPPED = PHASE_STOPPED;
const K_PHASE_TAXI = PHASE_TAXI;
const K_ARRIVAL_NONE = ARRIVAL_NONE;
const K_ARRIVAL_KEEPS = ARRIVAL_KEEPS;
const K_ARRIVAL_EATS_INTO = ARRIVAL_EATS_INTO;
const K_ARRIVAL_RUNS_OUT = ARRIVAL_RUNS_OUT;
const K_ARRIVAL_NO_RESERVE = ARRIVAL_NO_RESERVE;
const kTimeToWaypointH = timeToWaypointH;
const kFuelToWaypointL = fuelToWaypointL;
const kSpecificRangeNmPerL = specificRangeNmPerL;

/** ARRIVAL_* code from the fuel left on arrival and the reserve amount (either may be NaN). */
export function arrivalCode(arrivalL: number, reserveL: number): number {
	if (arrivalL !== arrivalL) return K_ARRIVAL_NONE;
	if (arrivalL < 0) return K_ARRIVAL_RUNS_OUT;
	if (reserveL !== reserveL) return K_ARRIVAL_NO_RESERVE;
	return arrivalL >= reserveL ? K_ARRIVAL_KEEPS : K_ARRIVAL_EATS_INTO;
}

export interface ArrivalState {
	/** The last accepted sample, whose reserve amount a skipped one carries. */
	lastIdx: number;
}

export function arrivalStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const st = s.stats;
	const o = s.setup.options;
	const minFlow = o.minFlowLph;
	const wptGs = o.waypointMinGsKt;
	const reserveMin = s.setup.reserveMinutes;
	const { t, gs, dtg } = cols;
	const oFlags = out.flags;
	const oFlow = out.flow;
	const oOnBoard = out.onBoard;
	const oPhase = out.phase;
	const oCruise = out.cruiseFlow;
	const oReserveL = out.reserveL;
	const oTime = out.timeToWpt;
	const oFuel = out.fuelToWpt;
	const oArrival = out.arrivalL;
	const oMarginMin = out.arrivalMarginMin;
	const oArrivalState = out.arrivalState;
	const oRange = out.specificRange;
	let lastIdx = s.arrival.lastIdx;

	for (let i = from; i < to; i++) {
		if (oFlags[i] & K_FLAG_REJECTED) {
			oReserveL[i] = lastIdx >= 0 ? oReserveL[lastIdx] : NaN;
			oTime[i] = NaN;
			oFuel[i] = NaN;
			oArrival[i] = NaN;
			oMarginMin[i] = NaN;
			oRange[i] = NaN;
			oArrivalState[i] = K_ARRIVAL_NONE;
			continue;
		}
		const cruise = oCruise[i];
		const ob = oOnBoard[i];
		const f = oFlow[i];
		const g = gs[i];
		const p = oPhase[i];
		// The one reserve amount every statement compares fuel against.
		const reserveL = (reserveMin / 60) * cruise;
		oReserveL[i] = reserveL;
		if (ob < reserveL && st.reserveReachedIndex < 0) {
			st.reserveReachedIndex = i;
			st.reserveReachedT = t[i];
		}
		// No waypoint figures on the ground (a taxi or take-off roll would divide by a low speed)
		// nor below the waypoint ground speed: NaN by construction, never Infinity.
		const onGround = p === K_PHASE_TAXI || p === K_PHASE_STOPPED;
		const hours = onGround ? NaN : kTimeToWaypointH(dtg[i], g, wptGs);
		const fuel = kFuelToWaypointL(f, hours);
		const arrival = ob - fuel;
		oTime[i] = hours;
		oFuel[i] = fuel;
		oArrival[i] = arrival;
		oMarginMin[i] = ((arrival - reserveL) / cruise) * 60;
		// arrivalCode() written out (one call fewer per sample); properties.test.ts checks they agree.
		oArrivalState[i] =
			arrival !== arrival
				? K_ARRIVAL_NONE
				: arrival < 0
					? K_ARRIVAL_RUNS_OUT
					: reserveL !== reserveL
						? K_ARRIVAL_NO_RESERVE
						: arrival >= reserveL
							? K_ARRIVAL_KEEPS
							: K_ARRIVAL_EATS_INTO;
		oRange[i] = kSpecificRangeNmPerL(g, f, wptGs, minFlow);
		if (arrival === arrival) oFlags[i] |= K_FLAG_WAYPOINT;
		lastIdx = i;
	}
	s.arrival.lastIdx = lastIdx;
}
