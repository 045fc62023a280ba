// Stage 1 of the engine pass: row checks and the flow reading. A row that fails a check is
// reported once (problems), flagged FLAG_REJECTED and skipped by every later stage; an accepted
// row's flow is the reading × the meter factor, or for a blank cell the last reading held
// (FLAG_FLOW_HELD) until the next one comes (stage 3 then fills the stretch, stage 8 rewrites it).

import type { EngineState, Outputs } from '../engine';
import { FLAG_FLOW_HELD, FLAG_REJECTED, type SampleColumns } from '../types';
import { describeProblem, problemField, rowProblem } from '../validate';

// Module-level copies (see engine.ts: an imported binding can compile to a getter call).
const K_FLAG_REJECTED = FLAG_REJECTED;
const K_FLAG_FLOW_HELD = FLAG_FLOW_HELD;
const kRowProblem = rowProblem;

export interface AcceptState {
	/** Time and index of the last accepted sample. */
	lastT: number;
	lastIdx: number;
	/** The last real (not blank) flow reading, after the meter factor. */
	lastRealFlow: number;
	accepted: number;
}

export function createAcceptState(): AcceptState {
	return { lastT: NaN, lastIdx: -1, lastRealFlow: NaN, accepted: 0 };
}

function problemValue(code: number, t: number, flow: number, gs: number, dtg: number, alt: number): number {
	switch (problemField(code)) {
		case 't':
			return t;
		case 'flow':
			return flow;
		case 'gs':
			return gs;
		case 'dtg':
			return dtg;
		default:
			return alt;
	}
}

/** Out of the loop: rare, and its number arguments may be boxed. */
function reject(s: EngineState, code: number, i: number, t: number, flow: number, gs: number, dtg: number, alt: number, lastT: number): void {
	s.problems.push(describeProblem(code, i, problemValue(code, t, flow, gs, dtg, alt), lastT));
}

export function acceptStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const a = s.accept;
	const { t, flow, gs, dtg } = cols;
	const alt = cols.alt;
	const lim = s.setup.options.limits;
	const maxFlowLim = lim.maxFlowLph;
	const maxGsLim = lim.maxGsKt;
	const maxDtgLim = lim.maxDtgNm;
	const minAltLim = lim.minAltFt;
	const maxAltLim = lim.maxAltFt;
	const mf = s.setup.profile.meterFactor;
	const oFlow = out.flow;
	const oFlags = out.flags;
	let lastT = a.lastT;
	let lastIdx = a.lastIdx;
	let lastRealFlow = a.lastRealFlow;
	let accepted = a.accepted;

	for (let i = from; i < to; i++) {
		const ti = t[i];
		const rawFlow = flow[i];
		const g = gs[i];
		const d = dtg[i];
		const h = alt !== undefined ? alt[i] : NaN;
		// Fast path for a good row; rowProblem says exactly what is wrong with the others.
		if (
			!(ti > lastT && ti < Infinity) ||
			rawFlow < 0 ||
			rawFlow > maxFlowLim ||
			g < 0 ||
			g > maxGsLim ||
			d < 0 ||
			d > maxDtgLim ||
			h < minAltLim ||
			h > maxAltLim
		) {
			const code = kRowProblem(ti, lastT, rawFlow, g, d, h, lim);
			if (code !== 0) {
				reject(s, code, i, ti, rawFlow, g, d, h, lastT);
				oFlow[i] = NaN;
				oFlags[i] = K_FLAG_REJECTED;
				continue;
			}
		}
		if (rawFlow === rawFlow) {
			const f = rawFlow * mf;
			oFlow[i] = f;
			oFlags[i] = 0;
			lastRealFlow = f;
		} else {
			// A live flight cannot see the next reading: the last one is held for now.
			oFlow[i] = lastRealFlow;
			oFlags[i] = lastRealFlow === lastRealFlow ? K_FLAG_FLOW_HELD : 0;
		}
		accepted++;
		lastT = ti;
		lastIdx = i;
	}

	a.lastT = lastT;
	a.lastIdx = lastIdx;
	a.lastRealFlow = lastRealFlow;
	a.accepted = accepted;
	const st = s.stats;
	st.acceptedCount = accepted;
	st.lastT = lastT;
	st.lastIndex = lastIdx;
}
