// What an aircraft usually burns, learned from its own recent flights: per phase a robust centre
// (median) and spread (scaled median absolute deviation) of the average flow, so one odd flight
// does not move it; or a usual flow set by hand. Input is the stored per-phase figures, no samples.
import type { PhaseName } from './phases';

/** The phases a baseline is kept for: the ones with a power setting the pilot chooses. */
export const BASELINE_PHASES = ['taxi', 'climb', 'cruise', 'descent'] as const satisfies readonly PhaseName[];
export type BaselinePhase = (typeof BASELINE_PHASES)[number];

/**
 * MAD × 1.4826 estimates the standard deviation of normally distributed data (the consistency
 * constant 1 / Φ⁻¹(3/4); Rousseeuw & Croux 1993; NIST/SEMATECH e-Handbook 1.3.5.6 defines the MAD).
 */
export const MAD_SCALE = 1.4826;
/** How many of the newest flights the learned baseline uses (our choice). */
export const DEFAULT_BASELINE_FLIGHTS = 20;
/** A phase shorter than this says little about its usual flow and is not counted (our choice). */
export const MIN_PHASE_S = 120;
/** Fewer flights than this and no baseline is learned for the phase (our choice). */
export const MIN_BASELINE_FLIGHTS = 3;

export interface PhaseFigures {
	phase: PhaseName;
	timeS: number;
	fuelL: number;
	/** L/h; null when the phase took no time. */
	averageFlowLph: number | null;
}

export interface BaselineFlight {
	id: string;
	phases: readonly PhaseFigures[];
	/** Fuel used ÷ engine time, L/h. */
	fuelPerEngineHourLph: number | null;
	/** Marked unusual by the owner: left out of the learned baseline. */
	unusual?: boolean;
}

export interface PhaseBaseline {
	phase: BaselinePhase;
	/** learned: from its flights; manual: set by hand here; configured: the aircraft's own usual cruise flow, used until enough flights exist. */
	source: 'learned' | 'manual' | 'configured';
	/** Usual average flow, L/h (median, or the hand-set value). */
	centreLph: number;
	/** Robust standard deviation of the flow, L/h; null for a hand-set value. */
	spreadLph: number | null;
	/** Median time spent in the phase, s; null when not learned. */
	usualTimeS: number | null;
	/** Flights it rests on (0 for a hand-set value). */
	flights: number;
}

export interface Baseline {
	phases: Record<BaselinePhase, PhaseBaseline | null>;
	fuelPerEngineHour: { centreLph: number; spreadLph: number; flights: number } | null;
	/** Flights the learned figures rest on (the newest not marked unusual), and how many were marked. */
	flightsUsed: number;
	flightsLeftOut: number;
}

/** Median of finite values; NaN for none. */
export function median(values: readonly number[]): number {
	const xs = values.filter(Number.isFinite).sort((a, b) => a - b);
	const n = xs.length;
	if (n === 0) return NaN;
	const m = n >> 1;
	return n % 2 ? xs[m] : (xs[m - 1] + xs[m]) / 2;
}

/** Median absolute deviation from the median (unscaled); NaN for none. */
export function medianAbsoluteDeviation(values: readonly number[]): number {
	const c = median(values);
	return median(values.map((x) => Math.abs(x - c)));
}

function robust(values: number[]): { centre: number; spread: number } {
	return { centre: median(values), spread: MAD_SCALE * medianAbsoluteDeviation(values) };
}

/**
 * The baseline from `flights`, newest first. Takes the newest `recent` flights not marked
 * unusual; a phase set by hand in `manual` uses that value instead of the learned one.
 */
export function learnBaseline(
	flights: readonly BaselineFlight[],
	options: {
		recent?: number;
		manual?: Partial<Record<BaselinePhase, number | null>>;
		/** Used for a phase with too few flights to learn from (e.g. the aircraft's configured cruise flow). */
		fallback?: Partial<Record<BaselinePhase, number | null>>;
	} = {}
): Baseline {
	const recent = options.recent ?? DEFAULT_BASELINE_FLIGHTS;
	const usable = flights.filter((f) => !f.unusual);
	const window = usable.slice(0, recent);
	const phases = {} as Record<BaselinePhase, PhaseBaseline | null>;
	for (const phase of BASELINE_PHASES) {
		const hand = options.manual?.[phase];
		if (hand !== undefined && hand !== null && Number.isFinite(hand) && hand > 0) {
			phases[phase] = { phase, source: 'manual', centreLph: hand, spreadLph: null, usualTimeS: null, flights: 0 };
			continue;
		}
		const flows: number[] = [];
		const times: number[] = [];
		for (const f of window) {
			const p = f.phases.find((x) => x.phase === phase);
			if (!p || p.timeS < MIN_PHASE_S || p.averageFlowLph === null) continue;
			flows.push(p.averageFlowLph);
			times.push(p.timeS);
		}
		if (flows.length < MIN_BASELINE_FLIGHTS) {
			const configured = options.fallback?.[phase];
			phases[phase] =
				configured !== undefined && configured !== null && Number.isFinite(configured) && configured > 0
					? { phase, source: 'configured', centreLph: configured, spreadLph: null, usualTimeS: null, flights: 0 }
					: null;
			continue;
		}
		const { centre, spread } = robust(flows);
		phases[phase] = { phase, source: 'learned', centreLph: centre, spreadLph: spread, usualTimeS: median(times), flights: flows.length };
	}
	const perHour = window.map((f) => f.fuelPerEngineHourLph).filter((x): x is number => x !== null && Number.isFinite(x));
	const fph = perHour.length >= MIN_BASELINE_FLIGHTS ? robust(perHour) : null;
	return {
		phases,
		fuelPerEngineHour: fph ? { centreLph: fph.centre, spreadLph: fph.spread, flights: perHour.length } : null,
		flightsUsed: window.length,
		flightsLeftOut: flights.length - usable.length
	};
}

/**
 * The usual band of a flow: centre ± USUAL_BAND_SPREADS robust spreads (our choice: about 95 % of
 * usual flights for normal scatter). The history's trend shades it, the fleet view places each
 * aircraft's month in it.
 */
export const USUAL_BAND_SPREADS = 2;

export interface UsualBand {
	centreLph: number;
	lowLph: number;
	highLph: number;
}

export function usualBand(centreLph: number, spreadLph: number | null): UsualBand {
	const half = spreadLph === null || !Number.isFinite(spreadLph) ? 0 : USUAL_BAND_SPREADS * spreadLph;
	return { centreLph, lowLph: centreLph - half, highLph: centreLph + half };
}

/** Where a flow sits against a band; words in $lib/labels. */
export const BAND_POSITIONS = ['below', 'within', 'above'] as const;
export type BandPosition = (typeof BAND_POSITIONS)[number];

export function bandPosition(flowLph: number, band: UsualBand): BandPosition {
	if (flowLph > band.highLph) return 'above';
	if (flowLph < band.lowLph) return 'below';
	return 'within';
}
