// Flow-sensor calibration after a fill-up: compares fuel used as indicated with fuel actually
// pumped to refill, giving the meter factor and the corrected K-factor for the sensor.

/**
 * Corrections beyond ±10 % are flagged as suspect (our choice): a sensor that far out, or a
 * fill-up that did not reach the same level, deserves a second look before the factor is saved.
 */
export const PLAUSIBLE_CORRECTION_PERCENT = 10;
/**
 * Below this much fuel the refill reading dominates the error (our choice): filling "to the
 * same level" is rarely better than about a litre.
 */
export const MIN_RELIABLE_INDICATED_L = 20;

export interface CalibrationInput {
	/** Fuel used as the sensor indicated, without any meter factor (litres or any one volume unit). */
	indicatedL: number;
	/** Fuel actually pumped to bring the tanks back to the same level, same unit. */
	pumpedL: number;
	/** Sensor K-factor in use: pulses per unit volume. Optional. */
	kFactorOld?: number | null;
}

export type CalibrationResult =
	| {
			ok: true;
			/** Actual ÷ indicated (ISO 1998-6). */
			meterFactor: number;
			/** K_old × indicated ÷ pumped; null without K_old. */
			kFactorNew: number | null;
			/** How far the sensor was off, percent: positive when it under-read. */
			correctionPercent: number;
			plausible: boolean;
			thresholdPercent: number;
			thresholdBasis: string;
			notes: string[];
	  }
	| { ok: false; field: keyof CalibrationInput; message: string };

function positive(x: unknown): x is number {
	return typeof x === 'number' && Number.isFinite(x) && x > 0;
}

/**
 * Meter factor MF = pumped ÷ indicated. The sensor counts pulses; with K pulses per unit, the
 * true K is pulses ÷ actual volume, so K_new = K_old × indicated ÷ pumped = K_old ÷ MF
 * (as API MPMS ch. 12.2 applies it).
 */
export function calibrate(input: CalibrationInput): CalibrationResult {
	const { indicatedL, pumpedL, kFactorOld } = input;
	if (!positive(indicatedL))
		return { ok: false, field: 'indicatedL', message: `Fuel used as indicated must be a number above zero (got ${String(indicatedL)}).` };
	if (!positive(pumpedL))
		return { ok: false, field: 'pumpedL', message: `Fuel pumped must be a number above zero (got ${String(pumpedL)}).` };
	const hasK = kFactorOld !== undefined && kFactorOld !== null;
	if (hasK && !positive(kFactorOld))
		return { ok: false, field: 'kFactorOld', message: `The K-factor must be a number above zero (got ${String(kFactorOld)}).` };

	const meterFactor = pumpedL / indicatedL;
	const correctionPercent = (meterFactor - 1) * 100;
	const plausible = Math.abs(correctionPercent) <= PLAUSIBLE_CORRECTION_PERCENT;
	const notes: string[] = [];
	if (!plausible)
		notes.push(
			`A ${correctionPercent.toFixed(1)} % correction is unusually large: check that the tanks were filled to the same level both times, and look for a leak or a wrong entry before saving it.`
		);
	if (indicatedL < MIN_RELIABLE_INDICATED_L)
		notes.push('Little fuel was used; the refill reading may dominate. A longer flight gives a better factor.');
	notes.push(
		'Set either the new K-factor in the sensor or the meter factor in Burndown, not both: data recorded after a K-factor change is already corrected.'
	);
	return {
		ok: true,
		meterFactor,
		kFactorNew: hasK ? (kFactorOld * indicatedL) / pumpedL : null,
		correctionPercent,
		plausible,
		thresholdPercent: PLAUSIBLE_CORRECTION_PERCENT,
		thresholdBasis: 'our choice',
		notes
	};
}
