// The high-burn finder: one flight's per-phase average flows against the aircraft's baseline.
// A phase burning more than a threshold over usual marks the flight, with the extra fuel
// quantified, and a short list of possible causes in trade words. Advisory only: it points the
// owner at a flight to look at, it does not diagnose the engine.
import { BASELINE_PHASES, MIN_PHASE_S, type Baseline, type BaselinePhase, type PhaseFigures } from './baseline';

/**
 * A phase more than this many percent over its usual flow marks the flight (our default, settable
 * per aircraft). Proper leaning saves about 10 % (FAA AC 61-23C), so an unleaned cruise sits
 * near or above this line while day-to-day scatter of a leaned cruise stays well below it.
 */
export const DEFAULT_HIGH_BURN_PERCENT = 10;
/** A phase this much longer than usual counts as long (our choice). */
export const LONG_PHASE_RATIO = 1.5;
/** Phases whose flow ratios to usual all lie within this many percent of each other are "shifted alike" (our choice). */
export const UNIFORM_SHIFT_TOLERANCE_PERCENT = 3;
/** Computed fuel this many percent below fuel pumped points at the sensor or a leak (our choice). */
export const BELOW_PUMPED_PERCENT = 5;

/** The possible causes the finder names, in the order it lists them; words in $lib/labels. */
export const HIGH_BURN_CAUSES = ['sensorCalibration', 'belowPumped', 'mixtureNotLeaned', 'longClimbFullPower', 'longGroundRunning'] as const;
export type HighBurnCause = (typeof HIGH_BURN_CAUSES)[number];

export interface PhaseComparison {
	phase: BaselinePhase;
	flowLph: number;
	usualLph: number;
	/** Flow over usual, L/h (negative when under). */
	overLph: number;
	overPercent: number;
	timeS: number;
	usualTimeS: number | null;
	/** overLph over the phase's time, litres: the fuel a usual flow would not have burnt. */
	extraL: number;
	marked: boolean;
}

export interface HighBurnResult {
	/** The phases that could be compared (flown long enough, with a baseline). */
	phases: PhaseComparison[];
	marked: boolean;
	/** Sum of the marked phases' extra fuel, litres. */
	extraL: number;
	causes: HighBurnCause[];
	thresholdPercent: number;
}

export interface HighBurnOptions {
	thresholdPercent?: number;
	/** Leaning moments found in the flight's cruise (leaning.ts); undefined when not looked for. */
	leaningMoments?: number;
	/** Fuel pumped ÷ fuel computed over the latest fill-up-to-fill-up window, if there is one. */
	pumpedOverComputed?: number | null;
}

export function findHighBurn(phases: readonly PhaseFigures[], baseline: Baseline, options: HighBurnOptions = {}): HighBurnResult {
	const thresholdPercent = options.thresholdPercent ?? DEFAULT_HIGH_BURN_PERCENT;
	const compared: PhaseComparison[] = [];
	for (const name of BASELINE_PHASES) {
		const usual = baseline.phases[name];
		const p = phases.find((x) => x.phase === name);
		if (!usual || !p || p.averageFlowLph === null || p.timeS < MIN_PHASE_S) continue;
		const overLph = p.averageFlowLph - usual.centreLph;
		const overPercent = (overLph / usual.centreLph) * 100;
		compared.push({
			phase: name,
			flowLph: p.averageFlowLph,
			usualLph: usual.centreLph,
			overLph,
			overPercent,
			timeS: p.timeS,
			usualTimeS: usual.usualTimeS,
			extraL: overLph * (p.timeS / 3600),
			marked: overPercent > thresholdPercent
		});
	}
	const marked = compared.some((c) => c.marked);
	const extraL = compared.filter((c) => c.marked).reduce((s, c) => s + c.extraL, 0);

	const causes: HighBurnCause[] = [];
	const of = (name: BaselinePhase) => compared.find((c) => c.phase === name);
	// Every phase over usual by the same factor: the engine is not burning more in one phase, the
	// sensor is reading more in all of them.
	const ratios = compared.map((c) => c.flowLph / c.usualLph);
	const shiftedAlike =
		marked &&
		compared.length >= 3 &&
		ratios.every((r) => r > 1) &&
		(Math.max(...ratios) - Math.min(...ratios)) / (ratios.reduce((s, r) => s + r, 0) / ratios.length) <= UNIFORM_SHIFT_TOLERANCE_PERCENT / 100;
	if (shiftedAlike) causes.push('sensorCalibration');
	const pumped = options.pumpedOverComputed;
	if (pumped !== undefined && pumped !== null && (pumped - 1) * 100 > BELOW_PUMPED_PERCENT) causes.push('belowPumped');
	if (!shiftedAlike) {
		const cruise = of('cruise');
		if (cruise?.marked && !(options.leaningMoments && options.leaningMoments > 0)) causes.push('mixtureNotLeaned');
		const climb = of('climb');
		if (climb && (climb.marked || (climb.overLph >= 0 && climb.usualTimeS !== null && climb.timeS > LONG_PHASE_RATIO * climb.usualTimeS)))
			causes.push('longClimbFullPower');
		const taxi = of('taxi');
		if (taxi && taxi.usualTimeS !== null && taxi.timeS > LONG_PHASE_RATIO * taxi.usualTimeS) causes.push('longGroundRunning');
	}
	return { phases: compared, marked, extraL, causes, thresholdPercent };
}
