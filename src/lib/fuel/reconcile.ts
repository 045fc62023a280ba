// Reconciling computed fuel against fuel pumped: between two fills to full, the fuel pumped after
// the first (every receipt up to and including the second fill) is the fuel burnt in between.
// Burndown sums its own fuel used over the flights started in that window and proposes the meter
// factor and K-factor (calibration.ts), with what the figure rests on.
import { calibrate, type CalibrationResult } from './calibration';

export interface ReconcileReceipt {
	id: string;
	/** Epoch seconds. */
	at: number;
	amountL: number;
	filledToFull: boolean;
}

export interface ReconcileFlight {
	id: string;
	/** Engine start, epoch seconds. */
	startedAt: number;
	/** Stored fuel used, litres (meter factor applied); null when no figures are stored (open, or no samples). */
	fuelUsedL: number | null;
	/** The meter factor the stored figures were computed with. */
	meterFactor: number | null;
	engineTimeS: number;
	gapCount: number;
	gapTimeS: number;
}

export interface ReconciliationWindow {
	fromReceiptId: string;
	toReceiptId: string;
	from: number;
	to: number;
	/** Flights whose engine start lies in [from, to), in order. */
	flightIds: string[];
	/** Receipts after the first fill up to and including the second. */
	receiptCount: number;
	pumpedL: number;
	/** Burndown's fuel used over the window's flights, as stored (meter factors applied). */
	computedL: number;
	/** The same without the meter factors: what the sensor indicated. */
	indicatedL: number;
	/** pumped ÷ computed; null when nothing was computed. */
	pumpedOverComputed: number | null;
	engineTimeS: number;
	flightsWithGaps: string[];
	gapTimeS: number;
	/** Flights in the window without stored figures: their fuel is missing from the sum. */
	flightsWithoutFigures: string[];
	/** True when the flights were computed with more than one meter factor. */
	mixedFactors: boolean;
	/** Meter factor = pumped ÷ indicated and K_new = K_old ÷ MF (calibration.ts). */
	proposal: CalibrationResult;
}

/** Windows between consecutive fills to full, newest first. */
/**
 * `kFactorOld` is the sensor's K-factor during the window (K_new = K_old ÷ MF needs the K the
 * pulses were counted with): one number, or the K in force at a window's start.
 */
export function reconcile(
	receipts: readonly ReconcileReceipt[],
	flights: readonly ReconcileFlight[],
	options: { kFactorOld?: number | null | ((from: number) => number | null) }
): ReconciliationWindow[] {
	const sorted = [...receipts].sort((a, b) => a.at - b.at || a.id.localeCompare(b.id));
	const byStart = [...flights].sort((a, b) => a.startedAt - b.startedAt || a.id.localeCompare(b.id));
	const windows: ReconciliationWindow[] = [];
	let open: { receipt: ReconcileReceipt; index: number } | null = null;
	sorted.forEach((r, index) => {
		if (!r.filledToFull) return;
		if (open) {
			const first = open.receipt;
			const pumped = sorted.slice(open.index + 1, index + 1);
			const inside = byStart.filter((f) => f.startedAt >= first.at && f.startedAt < r.at);
			const withFigures = inside.filter((f) => f.fuelUsedL !== null);
			const computedL = withFigures.reduce((s, f) => s + (f.fuelUsedL as number), 0);
			const indicatedL = withFigures.reduce((s, f) => s + (f.fuelUsedL as number) / (f.meterFactor && f.meterFactor > 0 ? f.meterFactor : 1), 0);
			const pumpedL = pumped.reduce((s, x) => s + x.amountL, 0);
			const factors = new Set(withFigures.map((f) => f.meterFactor));
			windows.push({
				fromReceiptId: first.id,
				toReceiptId: r.id,
				from: first.at,
				to: r.at,
				flightIds: inside.map((f) => f.id),
				receiptCount: pumped.length,
				pumpedL,
				computedL,
				indicatedL,
				pumpedOverComputed: computedL > 0 ? pumpedL / computedL : null,
				engineTimeS: inside.reduce((s, f) => s + f.engineTimeS, 0),
				flightsWithGaps: inside.filter((f) => f.gapCount > 0).map((f) => f.id),
				gapTimeS: inside.reduce((s, f) => s + f.gapTimeS, 0),
				flightsWithoutFigures: inside.filter((f) => f.fuelUsedL === null).map((f) => f.id),
				mixedFactors: factors.size > 1,
				proposal: calibrate({ indicatedL, pumpedL, kFactorOld: typeof options.kFactorOld === 'function' ? options.kFactorOld(first.at) : options.kFactorOld })
			});
		}
		open = { receipt: r, index };
	});
	return windows.reverse();
}

/** How many of the newest windows must agree for "computed below pumped" to persist (our choice). */
export const BELOW_PUMPED_WINDOWS = 3;

/**
 * The smallest pumped ÷ computed over the newest windows (up to BELOW_PUMPED_WINDOWS): above the
 * finder's threshold only when every one of them had computed fuel below fuel pumped. Null
 * without a window that computed any fuel.
 */
export function belowPumpedRatio(windows: readonly ReconciliationWindow[]): number | null {
	const ratios = windows
		.map((w) => w.pumpedOverComputed)
		.filter((x): x is number => x !== null)
		.slice(0, BELOW_PUMPED_WINDOWS);
	return ratios.length === 0 ? null : Math.min(...ratios);
}

export type ApplyAs = 'meterFactor' | 'kFactor';
export interface Factors {
	meterFactor: number;
	kFactor: number | null;
}

/**
 * The factors a proposal leaves in force: a new meter factor Burndown applies (the sensor's K
 * unchanged), or a new K-factor set in the sensor with the meter factor back to 1.
 */
export function factorsToApply(proposal: Extract<CalibrationResult, { ok: true }>, as: ApplyAs, current: Factors): Factors {
	if (as === 'kFactor') return { meterFactor: 1, kFactor: proposal.kFactorNew };
	return { meterFactor: proposal.meterFactor, kFactor: current.kFactor };
}
