// The flight summary for the debrief: fuel used and left, times, flows, phases, cruise specific
// range, and the verdict: fuel on board at shutdown against the reserve amount, the thinnest
// airborne arrival margin that held, and when (within the flight) fuel went below the reserve.
// Built from the running totals; no second pass over the samples.

import { PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT, PHASE_STOPPED, PHASE_TAXI, phaseNames, type PhaseName } from './phases';
import { DEFAULT_OPTIONS } from './engine';
import { findLegs, type EngineStop, type FlightLeg } from './legs';
import type { ReserveAmount } from './reserve';
import type { EngineOptions, FlightComputation, SampleColumns } from './types';

export interface PhaseSummary {
	phase: number;
	name: PhaseName;
	timeS: number;
	fuelL: number;
	distanceNm: number;
	/** L/h; null when the phase took no time. */
	averageFlowLph: number | null;
}

export interface FlightSummary {
	sampleCount: number;
	rejectedCount: number;
	/** First and last accepted sample, epoch s; null without samples. */
	start: number | null;
	end: number | null;
	fuelUsedL: number;
	onBoardAtShutdownL: number | null;
	/**
	 * From first movement to coming to rest; from engine start to stop when there is no ground
	 * speed; 0 when neither happened.
	 */
	blockTimeS: number;
	blockTimeBasis: 'movement' | 'engine' | 'none';
	engineTimeS: number;
	timeMovingS: number;
	distanceNm: number;
	/** Distance ÷ time moving, kt; null without movement. */
	averageGsKt: number | null;
	/** Fuel used ÷ engine time, L/h; null when the engine never ran. */
	averageFlowLph: number | null;
	maxFlowLph: number | null;
	/** Taxi, climb, cruise and descent in that order, then stopped and unknown when they occur. */
	phases: PhaseSummary[];
	/** NM per litre over the cruise phase: cruise distance ÷ cruise fuel. */
	cruiseSpecificRangeNmPerL: number | null;
	cruiseFlowLph: number | null;
	/**
	 * The thinnest arrival margin at a waypoint (fuel left on arrival − reserve amount) that held
	 * for the alarm persistence while airborne, in litres and in minutes at normal-cruise flow;
	 * null when the flight never had one (no waypoint figures, or no reserve amount).
	 */
	thinnestMargin: {
		marginL: number;
		minutes: number | null;
		t: number;
		index: number;
		wpt: number | null;
	} | null;
	/** The reserve amount in force at the end of the flight (the engine's). */
	reserve: ReserveAmount | null;
	/** The first sample, within the flight, where fuel on board was below the reserve amount. */
	reserveReachedAt: { t: number; index: number } | null;
	/** Fuel on board at shutdown against the reserve amount; null without samples. */
	verdict: FlightVerdict | null;
	gapCount: number;
	gapTimeS: number;
	alarmCount: number;
	/**
	 * Logbook legs, cut at engine-off stops (legs.ts); empty when summarize was not given the
	 * columns. One leg for a flight without a stop.
	 */
	legs: FlightLeg[];
	/** The engine-off stops between the legs, in order (one fewer than the legs). */
	stops: EngineStop[];
}

/**
 * 'kept': landed with at least the reserve amount; 'notKept': with less; 'noReserve': no reserve
 * amount to judge against (no rule minutes or no normal-cruise flow).
 */
export type VerdictState = 'kept' | 'notKept' | 'noReserve';
export const verdictStates: readonly VerdictState[] = ['kept', 'notKept', 'noReserve'];

export interface FlightVerdict {
	state: VerdictState;
	landedL: number;
	reserveL: number | null;
	/** landedL − reserveL; negative when the reserve was not kept. */
	marginL: number | null;
	/** The margin in minutes at the normal-cruise flow the reserve rests on. */
	marginMin: number | null;
	/** Whether the aircraft was airborne at all (a ground run gets a verdict on its fuel too). */
	airborne: boolean;
}

const ORDER = [PHASE_TAXI, PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT, PHASE_STOPPED, 0];

const orNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * The summary of a computation. With the columns it was computed from (and the engine options, if
 * any were given) it also lists the legs.
 */
export function summarize(c: FlightComputation, columns?: SampleColumns, options?: EngineOptions): FlightSummary {
	const st = c.stats;
	const has = st.acceptedCount > 0;

	const phases: PhaseSummary[] = [];
	for (const p of ORDER) {
		const timeS = st.phaseTimeS[p];
		const fuelL = st.phaseFuelL[p];
		// Always list the four flight phases; stopped and unknown only when they happened.
		if (p === PHASE_STOPPED || p === 0) {
			if (timeS <= 0) continue;
		}
		phases.push({
			phase: p,
			name: phaseNames[p],
			timeS,
			fuelL,
			distanceNm: st.phaseDistanceNm[p],
			averageFlowLph: timeS > 0 ? fuelL / (timeS / 3600) : null
		});
	}

	const cruiseTime = st.phaseTimeS[PHASE_CRUISE];
	const cruiseFuel = st.phaseFuelL[PHASE_CRUISE];
	const cruiseFlowLph = cruiseTime > 0 ? cruiseFuel / (cruiseTime / 3600) : null;
	const cruiseSpecificRangeNmPerL = cruiseFuel > 0 ? st.phaseDistanceNm[PHASE_CRUISE] / cruiseFuel : null;

	let blockTimeS = 0;
	let blockTimeBasis: FlightSummary['blockTimeBasis'] = 'none';
	if (Number.isFinite(st.firstMoveT)) {
		blockTimeS = st.lastMoveT - st.firstMoveT;
		blockTimeBasis = 'movement';
	} else if (Number.isFinite(st.firstRunT)) {
		blockTimeS = st.lastRunT - st.firstRunT;
		blockTimeBasis = 'engine';
	}

	const reserve = c.reserve;
	const onBoardAtShutdownL = has ? c.onBoard[st.lastIndex] : null;
	let verdict: FlightVerdict | null = null;
	if (onBoardAtShutdownL !== null) {
		const amount = reserve?.amountL ?? null;
		const flow = reserve?.flowLph ?? null;
		const marginL = amount === null ? null : onBoardAtShutdownL - amount;
		verdict = {
			state: marginL === null ? 'noReserve' : marginL >= 0 ? 'kept' : 'notKept',
			landedL: onBoardAtShutdownL,
			reserveL: amount,
			marginL,
			marginMin: marginL !== null && flow !== null && flow > 0 ? (marginL / flow) * 60 : null,
			airborne: st.airborne
		};
	}

	const cut = columns
		? findLegs(columns, c, {
				minFlowLph: options?.minFlowLph ?? DEFAULT_OPTIONS.minFlowLph,
				minGsKt: options?.minGsKt ?? DEFAULT_OPTIONS.minGsKt
			})
		: { legs: [], stops: [] };

	let gapTimeS = 0;
	for (const g of c.gaps) gapTimeS += g.end - g.start;

	return {
		sampleCount: c.length,
		rejectedCount: c.problems.length,
		start: has ? st.firstT : null,
		end: has ? st.lastT : null,
		fuelUsedL: st.usedTotalL,
		onBoardAtShutdownL,
		blockTimeS,
		blockTimeBasis,
		engineTimeS: st.engineTimeS,
		timeMovingS: st.movingTimeS,
		distanceNm: st.distanceNm,
		averageGsKt: st.movingTimeS > 0 ? st.distanceNm / (st.movingTimeS / 3600) : null,
		averageFlowLph: st.engineTimeS > 0 ? st.usedTotalL / (st.engineTimeS / 3600) : null,
		maxFlowLph: st.lastRunIndex >= 0 ? st.maxFlowLph : null,
		phases,
		cruiseSpecificRangeNmPerL,
		cruiseFlowLph,
		thinnestMargin:
			st.thinnestMarginIndex >= 0
				? {
						marginL: st.thinnestMarginL,
						minutes: orNull(st.thinnestMarginMin),
						t: st.thinnestMarginT,
						index: st.thinnestMarginIndex,
						wpt: st.thinnestMarginWpt
					}
				: null,
		reserve,
		reserveReachedAt: st.reserveReachedIndex >= 0 ? { t: st.reserveReachedT, index: st.reserveReachedIndex } : null,
		verdict,
		gapCount: c.gaps.length,
		gapTimeS,
		alarmCount: c.alarms.length,
		legs: cut.legs,
		stops: cut.stops
	};
}
