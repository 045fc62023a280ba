// Stage 3 of the engine pass: fuel used between samples (trapezoid, the higher flow across a
// dropout), dropouts and the end of blank-flow stretches, time, fuel and distance per phase,
// moving and engine time, and the normal-cruise flow in force at each sample. Writes the running
// fuel used before any "used" reset into out.used; stage 4 takes the reset off.

import type { EngineState, Outputs } from '../engine';
import { gapThresholdFor } from '../gaps';
import { gapFillFlow, segmentLitres } from '../integrate';
import { PHASE_CRUISE, PHASE_STOPPED } from '../phases';
import { BASIS_BASELINE, BASIS_MEASURED, BASIS_NONE, BASIS_RECENT, MIN_MEASURED_CRUISE_S } from '../reserve';
import { FLAG_GAP_FILLED, FLAG_REJECTED, type SampleColumns } from '../types';

const K_FLAG_REJECTED = FLAG_REJECTED;
const K_FLAG_GAP_FILLED = FLAG_GAP_FILLED;
const K_PHASE_STOPPED = PHASE_STOPPED;
const K_PHASE_CRUISE = PHASE_CRUISE;
const K_BASIS_NONE = BASIS_NONE;
const K_BASIS_BASELINE = BASIS_BASELINE;
const K_BASIS_MEASURED = BASIS_MEASURED;
const K_BASIS_RECENT = BASIS_RECENT;
const K_MIN_MEASURED_CRUISE_S = MIN_MEASURED_CRUISE_S;
const kGapThresholdFor = gapThresholdFor;
const kSegmentLitres = segmentLitres;

/** A stretch of blank flow cells that ended: stage 8 rewrites samples (fromIdx, toIdx) at fillLph. */
export interface BlankStretch {
	fromIdx: number;
	fromT: number;
	toIdx: number;
	fillLph: number;
	/** fillLph − the held reading. */
	extraLph: number;
}

export interface BurnState {
	lastT: number;
	lastIdx: number;
	/** Flow at the last accepted sample (blanks held). */
	lastFlow: number;
	lastGs: number;
	lastPhase: number;
	/** The last real flow reading (time, index, value) and whether a blank one followed it. */
	lastRealFlowT: number;
	lastRealFlowIdx: number;
	lastRealFlow: number;
	flowHeld: boolean;
	/** The last real ground speed and its time, to bridge distance across blank cells. */
	lastRealGs: number;
	lastRealGsT: number;
	usedTotal: number;
}

export function createBurnState(): BurnState {
	return {
		lastT: NaN,
		lastIdx: -1,
		lastFlow: NaN,
		lastGs: NaN,
		lastPhase: 0,
		lastRealFlowT: NaN,
		lastRealFlowIdx: -1,
		lastRealFlow: NaN,
		flowHeld: false,
		lastRealGs: NaN,
		lastRealGsT: NaN,
		usedTotal: 0
	};
}

/**
 * End of a stretch of blank flow cells: the same rule as missing rows, the higher adjacent real
 * reading over the whole stretch. Fuel used so far counted the held reading; the returned segment
 * takes the difference. The phases get the extra fuel of the samples inside now (the cruise flow
 * of this sample counts it); their figures are rewritten by stage 8. Out of the loop: rare.
 */
function endBlankStretch(s: EngineState, t: Float64Array, out: Outputs, i: number, f: number, threshold: number): number {
	const b = s.burn;
	const lastRealT = b.lastRealFlowT;
	const lastRealIdx = b.lastRealFlowIdx;
	const held = b.lastRealFlow;
	const ti = t[i];
	const fill = f > held ? f : held;
	const inc = (fill * (ti - lastRealT) - held * (b.lastT - lastRealT)) / 3600;
	const extraLph = fill - held;
	if (extraLph > 0) {
		const phaseFuel = s.stats.phaseFuelL;
		const oFlags = out.flags;
		const oPhase = out.phase;
		for (let j = lastRealIdx + 1; j < i; j++) {
			if (oFlags[j] & K_FLAG_REJECTED) continue;
			phaseFuel[oPhase[j]] += (extraLph * (t[j] - t[j - 1])) / 3600;
		}
	}
	if (ti - lastRealT > threshold)
		s.gaps.push({ kind: 'flow', start: lastRealT, end: ti, startIndex: lastRealIdx, endIndex: i, filledFlowLph: fill });
	s.blankStretches.push({ fromIdx: lastRealIdx, fromT: lastRealT, toIdx: i, fillLph: fill, extraLph });
	return inc;
}

function pushTimeGap(s: EngineState, lastT: number, ti: number, lastIdx: number, i: number, lastFlow: number, f: number): void {
	s.gaps.push({ kind: 'time', start: lastT, end: ti, startIndex: lastIdx, endIndex: i, filledFlowLph: gapFillFlow(lastFlow, f) });
}

export function burnStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const b = s.burn;
	const setup = s.setup;
	const minFlow = setup.options.minFlowLph;
	const minGs = setup.options.minGsKt;
	const baselineRaw = setup.profile.baselineCruiseFlowLph;
	const baseline = baselineRaw !== null && baselineRaw > 0 ? baselineRaw : NaN;
	const recent = setup.recentCruiseLph;
	const gap = s.gap;
	const st = s.stats;
	const phaseTime = st.phaseTimeS;
	const phaseFuel = st.phaseFuelL;
	const phaseDist = st.phaseDistanceNm;
	const { t, flow, gs } = cols;
	const oFlow = out.flow;
	const oFlags = out.flags;
	const oPhase = out.phase;
	const oUsed = out.used;
	const oCruise = out.cruiseFlow;
	const oBasis = out.reserveBasis;

	let lastT = b.lastT;
	let lastIdx = b.lastIdx;
	let lastFlow = b.lastFlow;
	let lastGs = b.lastGs;
	let lastPhase = b.lastPhase;
	let lastRealT = b.lastRealFlowT;
	let lastRealIdx = b.lastRealFlowIdx;
	let lastRealFlow = b.lastRealFlow;
	let held = b.flowHeld;
	let lastRealGs = b.lastRealGs;
	let lastRealGsT = b.lastRealGsT;
	let usedTotal = b.usedTotal;
	let engineTime = st.engineTimeS;
	let moving = st.movingTimeS;
	let distance = st.distanceNm;
	let firstMoveT = st.firstMoveT;
	let lastMoveT = st.lastMoveT;

	for (let i = from; i < to; i++) {
		if (oFlags[i] & K_FLAG_REJECTED) {
			// A skipped sample carries the running figures so the arrays stay aligned with the input.
			oUsed[i] = usedTotal;
			oCruise[i] = lastIdx >= 0 ? oCruise[lastIdx] : NaN;
			oBasis[i] = lastIdx >= 0 ? oBasis[lastIdx] : K_BASIS_NONE;
			continue;
		}
		const ti = t[i];
		const f = oFlow[i];
		const g = gs[i];
		const p = oPhase[i];
		const real = flow[i] === flow[i];

		if (lastIdx >= 0) {
			const dt = ti - lastT;
			const threshold = kGapThresholdFor(gap, dt);
			const isGap = dt > threshold;
			let inc = kSegmentLitres(lastFlow, f, dt, isGap);
			if (isGap) {
				oFlags[i] |= K_FLAG_GAP_FILLED;
				pushTimeGap(s, lastT, ti, lastIdx, i, lastFlow, f);
			}
			if (real && held && lastRealIdx >= 0 && lastRealFlow === lastRealFlow) {
				b.lastT = lastT;
				b.lastRealFlowT = lastRealT;
				b.lastRealFlowIdx = lastRealIdx;
				b.lastRealFlow = lastRealFlow;
				inc = endBlankStretch(s, t, out, i, f, threshold);
			}
			usedTotal += inc;
			// The segment belongs to the sample's phase, except the last stretch before the engine
			// stops, which belongs to the phase it ended.
			const seg = p <= K_PHASE_STOPPED && lastPhase > p ? lastPhase : p;
			phaseTime[seg] += dt;
			phaseFuel[seg] += inc;
			// Distance bridges blank ground-speed cells and missing rows alike: the trapezoid
			// between the adjacent real readings.
			if (g === g && lastRealGs === lastRealGs) {
				const dd = ((g + lastRealGs) * (ti - lastRealGsT)) / 7200;
				distance += dd;
				phaseDist[seg] += dd;
			}
			moving += ((lastGs >= minGs ? 0.5 : 0) + (g >= minGs ? 0.5 : 0)) * dt;
			if (lastFlow > minFlow || f > minFlow) engineTime += dt;
		} else {
			st.firstT = ti;
		}
		oUsed[i] = usedTotal;
		if (g >= minGs) {
			if (firstMoveT !== firstMoveT) firstMoveT = ti;
			lastMoveT = ti;
		}

		// The normal-cruise flow in force, with the precedence of reserve.ts normalCruiseFlow():
		// set baseline, else this flight's cruise so far (once long enough), else recent flights.
		const cruiseTime = phaseTime[K_PHASE_CRUISE];
		if (baseline === baseline) {
			oCruise[i] = baseline;
			oBasis[i] = K_BASIS_BASELINE;
		} else if (cruiseTime >= K_MIN_MEASURED_CRUISE_S && phaseFuel[K_PHASE_CRUISE] > 0) {
			oCruise[i] = (phaseFuel[K_PHASE_CRUISE] / cruiseTime) * 3600;
			oBasis[i] = K_BASIS_MEASURED;
		} else if (recent === recent) {
			oCruise[i] = recent;
			oBasis[i] = K_BASIS_RECENT;
		} else {
			oCruise[i] = NaN;
			oBasis[i] = K_BASIS_NONE;
		}

		lastT = ti;
		lastIdx = i;
		lastFlow = f;
		lastGs = g;
		lastPhase = p;
		if (g === g) {
			lastRealGs = g;
			lastRealGsT = ti;
		}
		if (real) {
			lastRealT = ti;
			lastRealIdx = i;
			lastRealFlow = f;
			held = false;
		} else held = true;
	}

	b.lastT = lastT;
	b.lastIdx = lastIdx;
	b.lastFlow = lastFlow;
	b.lastGs = lastGs;
	b.lastPhase = lastPhase;
	b.lastRealFlowT = lastRealT;
	b.lastRealFlowIdx = lastRealIdx;
	b.lastRealFlow = lastRealFlow;
	b.flowHeld = held;
	b.lastRealGs = lastRealGs;
	b.lastRealGsT = lastRealGsT;
	b.usedTotal = usedTotal;
	st.usedTotalL = usedTotal;
	st.engineTimeS = engineTime;
	st.movingTimeS = moving;
	st.distanceNm = distance;
	st.firstMoveT = firstMoveT;
	st.lastMoveT = lastMoveT;
}
