// Batch computation of a whole flight: checks the columns, runs the engine pass once over all
// samples and returns every per-sample figure with the timeline lists.

import { allocOutputs, createState, prepare, runKernel, snapshot } from './engine';
import type { EngineWarning, FlightComputation, FlightInput, SampleColumns } from './types';

/**
 * Number of samples all columns share. Columns of different lengths are cut to the shortest,
 * with a warning naming each column's length.
 */
export function columnLength(cols: SampleColumns, warnings: EngineWarning[]): number {
	const t = cols.t?.length ?? 0;
	const flow = cols.flow?.length ?? 0;
	const gs = cols.gs?.length ?? 0;
	const dtg = cols.dtg?.length ?? 0;
	const alt = cols.alt ? cols.alt.length : t;
	const wpt = cols.wpt ? cols.wpt.length : t;
	const n = Math.min(t, flow, gs, dtg, alt, wpt);
	// Live flights call this for every chunk, so the common case allocates nothing.
	if (n !== Math.max(t, flow, gs, dtg, alt, wpt)) {
		const lengths = [`t ${t}`, `flow ${flow}`, `gs ${gs}`, `dtg ${dtg}`];
		if (cols.alt) lengths.push(`alt ${alt}`);
		if (cols.wpt) lengths.push(`wpt ${wpt}`);
		warnings.push({
			code: 'columnLengthMismatch',
			message: `Sample columns differ in length (${lengths.join(', ')}); using the first ${n} samples.`
		});
	}
	return n;
}

/** Every fuel figure for a flight, one value per sample. Never throws on bad samples. */
export function computeFlight(input: FlightInput): FlightComputation {
	const setup = prepare(input);
	const inputWarnings: EngineWarning[] = [];
	const n = columnLength(input.columns, inputWarnings);
	const out = allocOutputs(n);
	const state = createState(setup);
	runKernel(state, input.columns, out, 0, n);
	return snapshot(state, out, n, inputWarnings);
}
