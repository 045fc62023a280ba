// Stage 2 of the engine pass: the flight phase of every accepted sample (phases.ts decides it
// from flow, ground speed and altitude; this stage runs it over the rows).

import type { EngineState, Outputs } from '../engine';
import { trackPhase } from '../phases';
import { FLAG_REJECTED, type SampleColumns } from '../types';

const K_FLAG_REJECTED = FLAG_REJECTED;
const kTrackPhase = trackPhase;

export function phaseStage(s: EngineState, cols: SampleColumns, out: Outputs, from: number, to: number): void {
	const ph = s.phase;
	const t = cols.t;
	const gs = cols.gs;
	const alt = cols.alt;
	const oFlow = out.flow;
	const oFlags = out.flags;
	const oPhase = out.phase;
	for (let i = from; i < to; i++) {
		if (oFlags[i] & K_FLAG_REJECTED) {
			oPhase[i] = 0;
			continue;
		}
		oPhase[i] = kTrackPhase(ph, t[i], oFlow[i], gs[i], alt !== undefined ? alt[i] : NaN);
	}
}
