// Stage 8 of the engine pass: the samples inside each stretch of blank flow cells that ended
// (stage 3 found the end and counted the fuel) are rewritten at the fill flow: flow, fuel used
// and on board, endurance, fuel to the waypoint and on arrival, margin and arrival state, and
// FLAG_FLOW_FILLED instead of FLAG_FLOW_HELD. Their reserve, phase and alarm figures stay as the
// flight saw them then, the same in a replay as live.

import type { EngineState, Outputs } from '../engine';
import type { BlankStretch } from './burn';
import { arrivalCode } from './arrival';
import { FLAG_FLOW_FILLED, FLAG_FLOW_HELD, FLAG_REJECTED, type SampleColumns } from '../types';
import { enduranceH } from '../waypoint';

function rewrite(b: BlankStretch, t: Float64Array, out: Outputs, minFlow: number): void {
	const { flow: oFlow, used: oUsed, onBoard: oOnBoard, flags: oFlags } = out;
	const fill = b.fillLph;
	for (let j = b.fromIdx + 1; j < b.toIdx; j++) {
		if (oFlags[j] & FLAG_REJECTED) {
			// A skipped sample carries the totals of the one before it.
			oUsed[j] = oUsed[j - 1];
			oOnBoard[j] = oOnBoard[j - 1];
			continue;
		}
		const extra = (b.extraLph * (t[j] - b.fromT)) / 3600;
		const ob = oOnBoard[j] - extra;
		oFlow[j] = fill;
		oUsed[j] += extra;
		oOnBoard[j] = ob;
		out.endurance[j] = enduranceH(ob, fill, minFlow);
		const fuel = fill * out.timeToWpt[j];
		out.fuelToWpt[j] = fuel;
		const arrival = ob - fuel;
		out.arrivalL[j] = arrival;
		out.arrivalMarginMin[j] = ((arrival - out.reserveL[j]) / out.cruiseFlow[j]) * 60;
		out.arrivalState[j] = arrivalCode(arrival, out.reserveL[j]);
		oFlags[j] = (oFlags[j] & ~FLAG_FLOW_HELD) | FLAG_FLOW_FILLED;
	}
}

export function refillStage(s: EngineState, cols: SampleColumns, out: Outputs): void {
	const stretches = s.blankStretches;
	const minFlow = s.setup.options.minFlowLph;
	for (const b of stretches) rewrite(b, cols.t, out, minFlow);
	stretches.length = 0;
}
