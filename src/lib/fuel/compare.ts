// Comparing flights: each flight's flow and fuel used put on a common clock of time since engine
// start (bucketed so a 10-hour flight draws in a few hundred points), and the per-phase figures
// of several flights side by side with their differences from the first one.
import { BASELINE_PHASES, type BaselinePhase, type PhaseFigures } from './baseline';

/** Points per compared flight at most; the step grows for long flights (our choice). */
export const COMPARE_MAX_POINTS = 600;
export const COMPARE_MIN_STEP_S = 10;

/** The common step for flights of these lengths (s), a whole number of seconds. */
export function compareStepS(durationsS: readonly number[]): number {
	const longest = Math.max(0, ...durationsS.filter(Number.isFinite));
	return Math.max(COMPARE_MIN_STEP_S, Math.ceil(longest / COMPARE_MAX_POINTS));
}

export interface AlignedSeries {
	/** Bucket k covers [k·step, (k+1)·step) seconds since engine start. */
	stepS: number;
	/** Mean flow in the bucket, L/h; NaN where no sample fell in it. */
	flowLph: Float64Array;
	/** Fuel used at the bucket's last sample, litres; NaN where no sample fell in it. */
	usedL: Float64Array;
}

/** Buckets `flow` and `used` (the engine's arrays) by time since `engineStartT` (epoch s). */
export function alignSinceEngineStart(t: Float64Array, flow: Float64Array, used: Float64Array, engineStartT: number, stepS: number): AlignedSeries {
	const n = t.length;
	let last = -1;
	for (let i = 0; i < n; i++) if (t[i] >= engineStartT) last = Math.max(last, Math.floor((t[i] - engineStartT) / stepS));
	const size = last + 1;
	const flowLph = new Float64Array(size).fill(NaN);
	const usedL = new Float64Array(size).fill(NaN);
	const sum = new Float64Array(size);
	const cnt = new Uint32Array(size);
	for (let i = 0; i < n; i++) {
		if (!(t[i] >= engineStartT)) continue;
		const k = Math.floor((t[i] - engineStartT) / stepS);
		if (Number.isFinite(flow[i])) {
			sum[k] += flow[i];
			cnt[k]++;
		}
		if (Number.isFinite(used[i])) usedL[k] = used[i];
	}
	for (let k = 0; k < size; k++) if (cnt[k] > 0) flowLph[k] = sum[k] / cnt[k];
	return { stepS, flowLph, usedL };
}

export interface PhaseDifference {
	phase: BaselinePhase;
	/** One entry per flight, in the order given; null where the flight has no such phase. */
	timeS: (number | null)[];
	fuelL: (number | null)[];
	flowLph: (number | null)[];
	/** Fuel in the phase minus the first flight's, litres (null for the first or when missing). */
	fuelDeltaL: (number | null)[];
	/** Average flow relative to the first flight's, percent. */
	flowDeltaPercent: (number | null)[];
}

export function phaseDifferences(flights: readonly (readonly PhaseFigures[])[]): PhaseDifference[] {
	return BASELINE_PHASES.map((phase) => {
		const of = flights.map((f) => f.find((p) => p.phase === phase) ?? null);
		const ref = of[0];
		return {
			phase,
			timeS: of.map((p) => p?.timeS ?? null),
			fuelL: of.map((p) => p?.fuelL ?? null),
			flowLph: of.map((p) => p?.averageFlowLph ?? null),
			fuelDeltaL: of.map((p, k) => (k === 0 || !p || !ref ? null : p.fuelL - ref.fuelL)),
			flowDeltaPercent: of.map((p, k) =>
				k === 0 || !p || !ref || p.averageFlowLph === null || !ref.averageFlowLph ? null : ((p.averageFlowLph - ref.averageFlowLph) / ref.averageFlowLph) * 100
			)
		};
	});
}
