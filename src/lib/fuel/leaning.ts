// Leaning moments: where, in cruise after the climb, the flow steps down clearly while ground
// speed and altitude hold steady — the pilot leaning the mixture. One pass with prefix sums over
// the engine's flow and phase arrays; the replay timeline marks them and the high-burn finder
// uses their absence in an over-usual cruise as a hint that the mixture was not leaned.
import { PHASE_CRUISE } from './phases';

/** Averages over this long before and after a candidate moment are compared, s (our choice). */
export const LEAN_WINDOW_S = 60;
/** The flow after must be at least this many percent below the flow before (our choice). */
export const LEAN_STEP_PERCENT = 5;
/** Ground speed and altitude count as steady within these changes of their averages (our choice). */
export const LEAN_STEADY_GS_KT = 8;
export const LEAN_STEADY_ALT_FT = 150;

export interface LeaningMoment {
	/** The sample where the lower flow begins, and its time (epoch s). */
	index: number;
	t: number;
	fromLph: number;
	toLph: number;
}

export interface LeaningInput {
	t: Float64Array;
	/** The engine's flow (after the meter factor, blanks held). */
	flow: Float64Array;
	gs: Float64Array;
	alt?: Float64Array;
	phase: Uint8Array;
}

/** Leaning moments in cruise, in time order; at most one per window on either side. */
export function findLeaningMoments(input: LeaningInput, options: { windowS?: number; stepPercent?: number } = {}): LeaningMoment[] {
	const { t, flow, gs, alt, phase } = input;
	const n = t.length;
	const windowS = options.windowS ?? LEAN_WINDOW_S;
	const step = (options.stepPercent ?? LEAN_STEP_PERCENT) / 100;
	// Prefix sums of flow, ground speed and altitude over cruise samples with a reading (count too),
	// so each window's average is two lookups.
	const cnt = new Float64Array(n + 1);
	const sf = new Float64Array(n + 1);
	const sg = new Float64Array(n + 1);
	const sa = new Float64Array(n + 1);
	const ca = new Float64Array(n + 1);
	for (let i = 0; i < n; i++) {
		const ok = phase[i] === PHASE_CRUISE && Number.isFinite(flow[i]) && Number.isFinite(gs[i]);
		cnt[i + 1] = cnt[i] + (ok ? 1 : 0);
		sf[i + 1] = sf[i] + (ok ? flow[i] : 0);
		sg[i + 1] = sg[i] + (ok ? gs[i] : 0);
		const a = alt ? alt[i] : NaN;
		const okA = ok && Number.isFinite(a);
		ca[i + 1] = ca[i] + (okA ? 1 : 0);
		sa[i + 1] = sa[i] + (okA ? a : 0);
	}
	const moments: LeaningMoment[] = [];
	let lo = 0;
	let hi = 0;
	let far = 0;
	let best: LeaningMoment | null = null;
	let bestDrop = 0;
	for (let i = 0; i < n; i++) {
		if (phase[i] !== PHASE_CRUISE) continue;
		while (t[lo] < t[i] - windowS) lo++;
		if (hi < i) hi = i;
		while (hi + 1 < n && t[hi + 1] < t[i] + windowS) hi++;
		// Cruise must also go on for a second window after the one averaged: the phase detector
		// follows the start of a descent some seconds late, and that power reduction is not leaning.
		if (far < hi) far = hi;
		while (far + 1 < n && t[far + 1] < t[i] + 2 * windowS) far++;
		// Both windows must be filled with cruise: a step at the top of climb is the power reduction, not leaning.
		const before = cnt[i] - cnt[lo];
		const after = cnt[hi + 1] - cnt[i];
		const filled =
			t[i] - t[lo] >= windowS * 0.9 &&
			t[far] - t[i] >= 2 * windowS * 0.9 &&
			before >= 0.9 * (i - lo) &&
			cnt[far + 1] - cnt[i] >= 0.9 * (far + 1 - i);
		if (best && t[i] - best.t > windowS) {
			moments.push(best);
			best = null;
			bestDrop = 0;
		}
		if (!filled || before === 0 || after === 0) continue;
		const fb = (sf[i] - sf[lo]) / before;
		const fa = (sf[hi + 1] - sf[i]) / after;
		const gb = (sg[i] - sg[lo]) / before;
		const ga = (sg[hi + 1] - sg[i]) / after;
		let steady = Math.abs(ga - gb) <= LEAN_STEADY_GS_KT;
		const ab = ca[i] - ca[lo];
		const aa = ca[hi + 1] - ca[i];
		if (ab > 0 && aa > 0) steady &&= Math.abs((sa[hi + 1] - sa[i]) / aa - (sa[i] - sa[lo]) / ab) <= LEAN_STEADY_ALT_FT;
		// Level across both windows end to end.
		if (alt && Number.isFinite(alt[lo]) && Number.isFinite(alt[hi])) steady &&= Math.abs(alt[hi] - alt[lo]) <= LEAN_STEADY_ALT_FT;
		const drop = fb - fa;
		// The largest drop within a window is the moment itself; its neighbours see part of the step.
		if (steady && fb > 0 && drop >= step * fb && drop > bestDrop) {
			best = { index: i, t: t[i], fromLph: fb, toLph: fa };
			bestDrop = drop;
		}
	}
	if (best) moments.push(best);
	return moments;
}
