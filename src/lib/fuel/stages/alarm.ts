// Stage 7 of the engine pass: the values the alarms judge at each sample — fuel on board,
// endurance at the judged flow, the airborne arrival margin — fed to alarms.ts, which raises and
// clears the episodes; the bits of the alarms raised go into out.alarmState.

import type { EngineState, Outputs } from '../engine';
import { updateAlarm } from '../alarms';
import { PHASE_CLIMB } from '../phases';
import { FLAG_REJECTED, type SampleColumns } from '../types';

const K_FLAG_REJECTED = FLAG_REJECTED;
const K_PHASE_CLIMB = PHASE_CLIMB;
const kUpdateAlarm = updateAlarm;

export function alarmStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const [alarmFuel, alarmEndurance, alarmArrival] = s.alarmTracks;
	const episodes = s.alarms;
	// NaN (alarm off) never compares below, so an off alarm costs nothing here.
	const fuelThreshold = alarmFuel.threshold;
	const enduranceThreshold = alarmEndurance.threshold;
	const arrivalThreshold = alarmArrival.threshold;
	const minFlow = s.setup.options.minFlowLph;
	const airborneGs = s.setup.options.airborneGsKt;
	const { t, gs } = cols;
	const oFlags = out.flags;
	const oFlow = out.flow;
	const oOnBoard = out.onBoard;
	const oCruise = out.cruiseFlow;
	const oPhase = out.phase;
	const oArrival = out.arrivalL;
	const oReserveL = out.reserveL;
	const oAlarm = out.alarmState;
	let alarmBits = s.alarmBits;
	// Whether an alarm not yet raised has a value below its threshold (counting its persistence).
	let pendingBelow =
		alarmFuel.belowSince === alarmFuel.belowSince ||
		alarmEndurance.belowSince === alarmEndurance.belowSince ||
		alarmArrival.belowSince === alarmArrival.belowSince;

	for (let i = from; i < to; i++) {
		if (oFlags[i] & K_FLAG_REJECTED) {
			oAlarm[i] = alarmBits;
			continue;
		}
		const f = oFlow[i];
		const cruise = oCruise[i];
		const p = oPhase[i];
		const ob = oOnBoard[i];
		// Endurance at the flow of alarms.ts enduranceJudgeFlow(), written out (one call fewer per
		// sample; properties.test.ts checks they agree); the arrival margin against the reserve
		// (against empty tanks when there is no reserve), airborne only.
		const judgeFlow = !(f > minFlow) ? NaN : cruise !== cruise ? (p === K_PHASE_CLIMB ? NaN : f) : p === K_PHASE_CLIMB || cruise > f ? cruise : f;
		const enduranceMin = (ob / judgeFlow) * 60;
		const reserveL = oReserveL[i];
		const arrival = oArrival[i];
		const arrivalValue = p >= K_PHASE_CLIMB && gs[i] >= airborneGs ? (reserveL === reserveL ? arrival - reserveL : arrival) : NaN;
		// Most samples are nowhere near an alarm: one compare each before the full update.
		if (alarmBits !== 0 || pendingBelow || ob < fuelThreshold || enduranceMin < enduranceThreshold || arrivalValue < arrivalThreshold) {
			const ti = t[i];
			alarmBits =
				kUpdateAlarm(alarmFuel, ob, ti, i, episodes) |
				kUpdateAlarm(alarmEndurance, enduranceMin, ti, i, episodes) |
				kUpdateAlarm(alarmArrival, arrivalValue, ti, i, episodes);
			pendingBelow =
				alarmFuel.belowSince === alarmFuel.belowSince ||
				alarmEndurance.belowSince === alarmEndurance.belowSince ||
				alarmArrival.belowSince === alarmArrival.belowSince;
		}
		oAlarm[i] = alarmBits;
	}
	s.alarmBits = alarmBits;
}
