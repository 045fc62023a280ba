// Batch computation of a whole flight: checks the columns, runs the engine pass once over all
// samples and returns every per-sample figure with the timeline lists.

import { allocOutputs, createState, prepare, runKernel, snapshot } from './engine';
import type { EngineWarning, FlightComputation, FlightInput, SampleColumns } from './types';

/**
 * Number of samples all columns share. Columns of different lengths are cut to the shortest,
 * with a warning naming each column's length.
 */
export function columnLength(cols: SampleColumns, warnings: EngineWarning[]): number {
	const lengths: [string, number][] = [
		['t', cols.t?.length ?? 0],
		['flow', cols.flow?.length ?? 0],
		['gs', cols.gs?.length ?? 0],
		['dtg', cols.dtg?.length ?? 0]
	];
	if (cols.alt) lengths.push(['alt', cols.alt.length]);
	if (cols.wpt) lengths.push(['wpt', cols.wpt.length]);
	let n = Infinity;
	let max = 0;
	for (const [, len] of lengths) {
		if (len < n) n = len;
		if (len > max) max = len;
	}
	if (n !== max)
		warnings.push({
			code: 'columnLengthMismatch',
			message: `Sample columns differ in length (${lengths.map(([k, len]) => `${k} ${len}`).join(', ')}); using the first ${n} samples.`
		});
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
