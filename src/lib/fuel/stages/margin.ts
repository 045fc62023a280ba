// Stage 6 of the engine pass: the thinnest airborne margin over the reserve that held for the
// arrival persistence time (window.ts keeps the largest margin over that trailing time), where
// and when it was, for the summary.

import type { EngineState, Outputs } from '../engine';
import { PHASE_CLIMB } from '../phases';
import { FLAG_REJECTED, WPT_NONE, type SampleColumns } from '../types';
import { pushTrailingMax, resetTrailingMax } from '../window';

const K_FLAG_REJECTED = FLAG_REJECTED;
const K_PHASE_CLIMB = PHASE_CLIMB;
const K_WPT_NONE = WPT_NONE;
const kPushTrailingMax = pushTrailingMax;
const kResetTrailingMax = resetTrailingMax;

export function marginStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const st = s.stats;
	const win = s.marginWindow;
	const airborneGs = s.setup.options.airborneGsKt;
	const { t, gs } = cols;
	const wpt = cols.wpt;
	const oFlags = out.flags;
	const oPhase = out.phase;
	const oArrival = out.arrivalL;
	const oReserveL = out.reserveL;
	const oCruise = out.cruiseFlow;
	let thinnest = st.thinnestMarginL;
	let airborneSeen = st.airborne;

	for (let i = from; i < to; i++) {
		if (oFlags[i] & K_FLAG_REJECTED) continue;
		if (oPhase[i] >= K_PHASE_CLIMB && gs[i] >= airborneGs) {
			airborneSeen = true;
			const marginL = oArrival[i] - oReserveL[i];
			if (marginL >= thinnest) {
				// A window holding this sample cannot hold less than the thinnest so far: start the
				// next window after it (exact, and it keeps the queue empty most of the flight).
				if (win.runStart === win.runStart) kResetTrailingMax(win);
			} else if (marginL === marginL) {
				const ti = t[i];
				const kept = kPushTrailingMax(win, ti, marginL);
				if (kept < thinnest) {
					thinnest = kept;
					st.thinnestMarginMin = (kept / oCruise[i]) * 60;
					st.thinnestMarginT = ti;
					st.thinnestMarginIndex = i;
					const w = wpt !== undefined ? wpt[i] : K_WPT_NONE;
					st.thinnestMarginWpt = w === K_WPT_NONE ? null : w;
				}
			} else if (win.runStart === win.runStart) kResetTrailingMax(win);
		} else if (win.runStart === win.runStart) kResetTrailingMax(win);
	}
	st.thinnestMarginL = thinnest;
	st.airborne = airborneSeen;
}
