// Flight phase at each sample (stopped, taxi, climb, cruise, descent), from ground speed and flow,
// and from vertical speed when altitude is recorded. Uses past samples only, so a live flight
// and its replay get the same phases.

export const PHASE_UNKNOWN = 0;
export const PHASE_STOPPED = 1;
export const PHASE_TAXI = 2;
export const PHASE_CLIMB = 3;
export const PHASE_CRUISE = 4;
export const PHASE_DESCENT = 5;
export const PHASE_COUNT = 6;

/** The one list of phase names, indexed by phase code; the database enum and the labels take it. */
export const PHASE_NAMES = ['unknown', 'stopped', 'taxi', 'climb', 'cruise', 'descent'] as const;
export type PhaseName = (typeof PHASE_NAMES)[number];
export const phaseNames: readonly PhaseName[] = PHASE_NAMES;

/*
 * Detector settings (our choice, tuned on typical four-seat singles, not from a source):
 * - vertical speed beyond ±300 ft/min, smoothed over about 15 s, is a climb or descent;
 * - without altitude, flow relative to a reference cruise flow — the aircraft's set baseline,
 *   else its recent median cruise — (≥ 1.3× climb, ≤ 0.7× descent);
 * - with no reference at all, climb needs evidence: a flow near the highest smoothed airborne
 *   flow so far (≥ 0.8×) AND that highest flow clearly above the lowest one (≥ 1.3×), i.e. a
 *   high-flow segment standing out from a lower one (climb flow near twice cruise, common
 *   practice); descent ≤ 0.4× the highest. A steady flight is therefore cruise throughout. Using
 *   past samples only, the first climb after take-off of such a flight reads as cruise (nothing
 *   lower has been seen yet): its measured cruise flow comes out higher, and so does the reserve
 *   amount — the error is on the side of less fuel.
 */
export const VS_CLIMB_FPM = 300;
export const VS_SMOOTH_S = 15;
export const FLOW_SMOOTH_S = 30;
/** Vertical speed older than this is not used. */
export const VS_STALE_S = 60;
export const BASELINE_CLIMB_RATIO = 1.3;
export const BASELINE_DESCENT_RATIO = 0.7;
export const PEAK_CLIMB_RATIO = 0.8;
export const PEAK_DESCENT_RATIO = 0.4;

export interface PhaseTracker {
	minFlowLph: number;
	minGsKt: number;
	airborneGsKt: number;
	holdS: number;
	baselineLph: number;
	current: number;
	/** When the candidate phase first differed from the current one (NaN: it does not). */
	divergedSince: number;
	lastT: number;
	flowDt: number;
	flowWeight: number;
	flowSmooth: number;
	peakAirborneFlow: number;
	lowestAirborneFlow: number;
	/** First sample of the current airborne stretch (NaN on the ground). */
	airborneSince: number;
	lastAlt: number;
	lastAltT: number;
	altDt: number;
	altWeight: number;
	altPerMin: number;
	vsFpm: number;
	vsT: number;
}

export function createPhaseTracker(o: {
	minFlowLph: number;
	minGsKt: number;
	airborneGsKt: number;
	holdS: number;
	baselineLph: number | null;
}): PhaseTracker {
	return {
		minFlowLph: o.minFlowLph,
		minGsKt: o.minGsKt,
		airborneGsKt: o.airborneGsKt,
		holdS: o.holdS,
		baselineLph: o.baselineLph ?? NaN,
		current: -1,
		divergedSince: NaN,
		lastT: NaN,
		flowDt: NaN,
		flowWeight: NaN,
		flowSmooth: NaN,
		peakAirborneFlow: 0,
		lowestAirborneFlow: Infinity,
		airborneSince: NaN,
		lastAlt: NaN,
		lastAltT: NaN,
		altDt: NaN,
		altWeight: NaN,
		altPerMin: NaN,
		vsFpm: NaN,
		vsT: NaN
	};
}

/** Updates the smoothed flow and vertical speed with one sample. */
function smooth(p: PhaseTracker, t: number, flowLph: number, altFt: number): void {
	if (flowLph === flowLph) {
		// dt/(τ+dt) is a cheap stand-in for 1 − exp(−dt/τ) that behaves the same at both ends;
		// recorders mostly keep one interval, so the weight is cached.
		const dt = t - p.lastT;
		if (dt !== p.flowDt) {
			p.flowDt = dt;
			p.flowWeight = dt / (FLOW_SMOOTH_S + dt);
		}
		const fs = p.flowSmooth;
		p.flowSmooth = fs === fs ? fs + p.flowWeight * (flowLph - fs) : flowLph;
	}
	if (altFt === altFt) {
		const lastAlt = p.lastAlt;
		if (lastAlt === lastAlt) {
			const dtAlt = t - p.lastAltT;
			if (dtAlt !== p.altDt) {
				p.altDt = dtAlt;
				p.altWeight = dtAlt / (VS_SMOOTH_S + dtAlt);
				p.altPerMin = 60 / dtAlt;
			}
			const vs = (altFt - lastAlt) * p.altPerMin;
			const v = p.vsFpm;
			p.vsFpm = v === v ? v + p.altWeight * (vs - v) : vs;
			p.vsT = t;
		}
		p.lastAlt = altFt;
		p.lastAltT = t;
	}
	p.lastT = t;
}

/** Climb, cruise or descent for an airborne sample, from vertical speed or else from flow. */
function airbornePhase(p: PhaseTracker, t: number): number {
	const vs = p.vsFpm;
	if (vs === vs && t - p.vsT <= VS_STALE_S) {
		if (vs > VS_CLIMB_FPM) return PHASE_CLIMB;
		if (vs < -VS_CLIMB_FPM) return PHASE_DESCENT;
		return PHASE_CRUISE;
	}
	const f = p.flowSmooth;
	if (f !== f) return PHASE_UNKNOWN;
	const base = p.baselineLph;
	if (base === base) {
		if (f >= BASELINE_CLIMB_RATIO * base) return PHASE_CLIMB;
		if (f <= BASELINE_DESCENT_RATIO * base) return PHASE_DESCENT;
		return PHASE_CRUISE;
	}
	if (f > p.peakAirborneFlow) p.peakAirborneFlow = f;
	// The smoothed flow still carries the taxi flow just after take-off: the lowest airborne flow
	// is taken only once that has faded (three smoothing times, about 5 % left).
	if (f < p.lowestAirborneFlow && t - p.airborneSince >= 3 * FLOW_SMOOTH_S) p.lowestAirborneFlow = f;
	if (f >= PEAK_CLIMB_RATIO * p.peakAirborneFlow && p.peakAirborneFlow >= BASELINE_CLIMB_RATIO * p.lowestAirborneFlow) return PHASE_CLIMB;
	if (f <= PEAK_DESCENT_RATIO * p.peakAirborneFlow) return PHASE_DESCENT;
	return PHASE_CRUISE;
}

/** What the sample on its own suggests, from ground speed and flow first. */
function candidatePhase(p: PhaseTracker, t: number, flowLph: number, gsKt: number): number {
	const running = flowLph > p.minFlowLph;
	if (gsKt !== gsKt) return flowLph === flowLph && !running ? PHASE_STOPPED : PHASE_UNKNOWN;
	if (gsKt < p.airborneGsKt) {
		p.airborneSince = NaN;
		if (running) return PHASE_TAXI;
		// Moving with no flow reading yet: most likely taxiing before the first reading.
		return flowLph !== flowLph && gsKt >= p.minGsKt ? PHASE_TAXI : PHASE_STOPPED;
	}
	if (p.airborneSince !== p.airborneSince) p.airborneSince = t;
	return airbornePhase(p, t);
}

/**
 * Phase at a sample. A new phase must be suggested for holdS seconds before it is taken, so a
 * noisy reading does not flip the phase back and forth.
 */
export function trackPhase(p: PhaseTracker, t: number, flowLph: number, gsKt: number, altFt: number): number {
	// Small functions so the engine's loop can inline them: a call that is not inlined boxes
	// its number arguments, which at a million samples is most of the cost.
	smooth(p, t, flowLph, altFt);
	const c = candidatePhase(p, t, flowLph, gsKt);
	if (p.current < 0) {
		p.current = c;
		return c;
	}
	if (c === p.current) {
		p.divergedSince = NaN;
	} else {
		if (p.divergedSince !== p.divergedSince) p.divergedSince = t;
		if (t - p.divergedSince >= p.holdS) {
			p.current = c;
			p.divergedSince = NaN;
		}
	}
	return p.current;
}
