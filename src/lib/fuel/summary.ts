// The flight summary for the debrief: fuel used and left, times, flows, phases, cruise specific
// range, the thinnest reserve at a waypoint, and when the fuel on board would reach the legal
// reserve at the flow last shown. Built from the running totals; no second pass over the samples.

import { PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT, PHASE_STOPPED, PHASE_TAXI, phaseNames, type PhaseName } from './phases';
import { reserveAmount, type ReserveAmount, type ReserveSetting } from './reserve';
import type { FlightComputation } from './types';

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
	lowestReserveAtWpt: {
		reserveL: number;
		minutes: number | null;
		t: number;
		index: number;
		wpt: number | null;
	} | null;
	reserve: ReserveAmount | null;
	/**
	 * When fuel on board reaches the reserve amount at the flow of the last sample with the engine
	 * running (the current flow in a live flight). alreadyBelow when it had reached it by then.
	 */
	reserveReached: {
		t: number;
		fromIndex: number;
		flowLph: number;
		hoursFromSample: number;
		alreadyBelow: boolean;
	} | null;
	gapCount: number;
	gapTimeS: number;
	alarmCount: number;
}

const ORDER = [PHASE_TAXI, PHASE_CLIMB, PHASE_CRUISE, PHASE_DESCENT, PHASE_STOPPED, 0];

const orNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

export function summarize(c: FlightComputation, options: { reserve?: ReserveSetting } = {}): FlightSummary {
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

	const reserve = options.reserve
		? reserveAmount(options.reserve, c.profile.baselineCruiseFlowLph, cruiseFlowLph)
		: null;

	let reserveReached: FlightSummary['reserveReached'] = null;
	if (reserve && reserve.amountL !== null && st.lastRunIndex >= 0) {
		const hours = (st.lastRunOnBoardL - reserve.amountL) / st.lastRunFlowLph;
		reserveReached = {
			t: st.lastRunT + hours * 3600,
			fromIndex: st.lastRunIndex,
			flowLph: st.lastRunFlowLph,
			hoursFromSample: hours,
			alreadyBelow: hours < 0
		};
	}

	let gapTimeS = 0;
	for (const g of c.gaps) gapTimeS += g.end - g.start;

	return {
		sampleCount: c.length,
		rejectedCount: c.problems.length,
		start: has ? st.firstT : null,
		end: has ? st.lastT : null,
		fuelUsedL: st.usedTotalL,
		onBoardAtShutdownL: has ? c.onBoard[st.lastIndex] : null,
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
		lowestReserveAtWpt:
			st.lowestReserveIndex >= 0
				? {
						reserveL: st.lowestReserveL,
						minutes: orNull(st.lowestReserveMin),
						t: st.lowestReserveT,
						index: st.lowestReserveIndex,
						wpt: st.lowestReserveWpt
					}
				: null,
		reserve,
		reserveReached,
		gapCount: c.gaps.length,
		gapTimeS,
		alarmCount: c.alarms.length
	};
}
