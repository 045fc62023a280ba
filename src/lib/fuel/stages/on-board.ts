// Stage 4 of the engine pass: fuel events on the timeline (added, removed, filled, "used"
// reset), fuel on board and fuel used at each sample, endurance at the present flow, and the
// figures of the engine running (highest flow, first and last running sample).

import type { EngineState, Outputs } from '../engine';
import { eventDelta } from '../events';
import { FLAG_ENDURANCE, FLAG_EVENT, FLAG_REJECTED, type SampleColumns } from '../types';
import { enduranceH } from '../waypoint';

const K_FLAG_REJECTED = FLAG_REJECTED;
const K_FLAG_ENDURANCE = FLAG_ENDURANCE;
const kEnduranceH = enduranceH;

export interface OnBoardState {
	/**
	 * Fuel on board is anchored at the last event: anchorOnBoard − (usedTotal − anchorUsed). At
	 * the event itself that is the anchor exactly, so "filled to full" reads the capacity, not
	 * the capacity give or take a rounding error.
	 */
	anchorOnBoard: number;
	anchorUsed: number;
	/** Fuel used at the last "used" reset. */
	usedOffset: number;
	/** The next event not yet applied (events are sorted by time). */
	eventIdx: number;
	belowZeroWarned: boolean;
}

export function createOnBoardState(declaredL: number): OnBoardState {
	return { anchorOnBoard: declaredL, anchorUsed: 0, usedOffset: 0, eventIdx: 0, belowZeroWarned: false };
}

/** The events at or before sample i (time ti), applied in order. Out of the loop: rare. */
function applyEvents(s: EngineState, out: Outputs, i: number, ti: number, usedTotal: number): void {
	const fb = s.fuel;
	const events = s.setup.events;
	const profile = s.setup.profile;
	while (fb.eventIdx < events.length && ti >= events[fb.eventIdx].t) {
		const ev = events[fb.eventIdx++];
		const before = fb.anchorOnBoard - (usedTotal - fb.anchorUsed);
		out.flags[i] |= FLAG_EVENT;
		if (ev.kind === 'resetUsed') {
			s.resolvedEvents.push({ event: ev, index: i, deltaL: 0, onBoardBeforeL: before, onBoardAfterL: before, usedBeforeL: usedTotal - fb.usedOffset });
			fb.usedOffset = usedTotal;
		} else {
			const r = eventDelta(ev, before, profile, s.setup.options.formatFuel);
			if (r.warning) s.warnings.push({ ...r.warning, index: i });
			fb.anchorOnBoard = r.afterL;
			fb.anchorUsed = usedTotal;
			s.resolvedEvents.push({
				event: ev,
				index: i,
				deltaL: r.deltaL,
				onBoardBeforeL: before,
				onBoardAfterL: r.afterL,
				usedBeforeL: usedTotal - fb.usedOffset
			});
		}
	}
}

function warnBelowZero(s: EngineState, i: number, ti: number): void {
	s.warnings.push({
		code: 'onBoardBelowZero',
		message: 'Computed fuel on board went below zero: the declared starting fuel or the meter factor is probably wrong.',
		index: i,
		t: ti
	});
}

export function onBoardStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const fb = s.fuel;
	const st = s.stats;
	const minFlow = s.setup.options.minFlowLph;
	const t = cols.t;
	const oFlags = out.flags;
	const oFlow = out.flow;
	const oUsed = out.used;
	const oOnBoard = out.onBoard;
	const oEndurance = out.endurance;
	const events = s.setup.events;
	// Events are sorted: one compare per sample against the next one's time.
	let nextEventT = fb.eventIdx < events.length ? events[fb.eventIdx].t : Infinity;
	let anchorOnBoard = fb.anchorOnBoard;
	let anchorUsed = fb.anchorUsed;
	let usedOffset = fb.usedOffset;
	let maxFlow = st.maxFlowLph;
	let firstRunT = st.firstRunT;
	let lastRunT = st.lastRunT;
	let lastRunIdx = st.lastRunIndex;
	let lastRunOnBoard = st.lastRunOnBoardL;
	let lastRunFlow = st.lastRunFlowLph;

	for (let i = from; i < to; i++) {
		// Stage 3 left the running fuel used, before any reset, in out.used.
		const usedTotal = oUsed[i];
		if (oFlags[i] & K_FLAG_REJECTED) {
			oUsed[i] = usedTotal - usedOffset;
			oOnBoard[i] = anchorOnBoard - (usedTotal - anchorUsed);
			oEndurance[i] = NaN;
			continue;
		}
		const ti = t[i];
		if (ti >= nextEventT) {
			applyEvents(s, out, i, ti, usedTotal);
			anchorOnBoard = fb.anchorOnBoard;
			anchorUsed = fb.anchorUsed;
			usedOffset = fb.usedOffset;
			nextEventT = fb.eventIdx < events.length ? events[fb.eventIdx].t : Infinity;
		}
		const ob = anchorOnBoard - (usedTotal - anchorUsed);
		oUsed[i] = usedTotal - usedOffset;
		oOnBoard[i] = ob;
		if (ob < 0 && !fb.belowZeroWarned) {
			fb.belowZeroWarned = true;
			warnBelowZero(s, i, ti);
		}
		const f = oFlow[i];
		oEndurance[i] = kEnduranceH(ob, f, minFlow);
		if (f > minFlow) {
			oFlags[i] |= K_FLAG_ENDURANCE;
			if (f > maxFlow) maxFlow = f;
			if (firstRunT !== firstRunT) firstRunT = ti;
			lastRunT = ti;
			lastRunIdx = i;
			lastRunOnBoard = ob;
			lastRunFlow = f;
		}
	}

	st.maxFlowLph = maxFlow;
	st.firstRunT = firstRunT;
	st.lastRunT = lastRunT;
	st.lastRunIndex = lastRunIdx;
	st.lastRunOnBoardL = lastRunOnBoard;
	st.lastRunFlowLph = lastRunFlow;
}
