// Figures as text: one precision per quantity and unit (PRECISION), one locale and grouping for
// every screen, export and e-mail, so the same figure reads the same everywhere. Rounding itself
// (noise removed, nearest or down for margins) is $lib/rounding's; Intl only writes the digits.
import { round, type RoundMode } from '$lib/rounding';
import {
	distanceUnitLabels,
	flowUnitLabels,
	fuelUnitLabels,
	speedUnitLabels,
	type DistanceUnit,
	type FlowUnit,
	type FuelUnit,
	type SpeedUnit
} from '$lib/units';

export type { RoundMode };

/** Shown for a missing figure (null, NaN, ±Infinity). */
export const MISSING = '—';

/**
 * Decimals per quantity and unit — the one rule, written out in DEVELOPERS.md. Volumes keep a
 * tenth (0.1 US gal ≈ 0.4 L), masses none (1 lb ≈ 0.6 L of avgas); a flow reads like its fuel.
 */
export const PRECISION = {
	fuel: { usgal: 1, impgal: 1, l: 1, lb: 0, kg: 0 } satisfies Record<FuelUnit, number>,
	flow: { 'usgal/h': 1, 'impgal/h': 1, 'l/h': 1, 'lb/h': 0, 'kg/h': 0 } satisfies Record<FlowUnit, number>,
	distance: 1,
	speed: 0,
	specificRange: 2,
	altitude: 0,
	percent: 1,
	meterFactor: 4,
	kFactor: 1,
	density: 3,
	minutes: 0,
	megabytes: 1
} as const;

// en-GB: a point for decimals and a 24-hour clock; 'min2' groups only from five digits (4500 ft,
// 12,000 samples). Fixed, not the reader's locale, so server and browser write the same text.
const LOCALE = 'en-GB';
const formats = new Map<number, Intl.NumberFormat>();
function numberFormat(digits: number): Intl.NumberFormat {
	let f = formats.get(digits);
	if (!f) {
		f = new Intl.NumberFormat(LOCALE, { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: 'min2' });
		formats.set(digits, f);
	}
	return f;
}

const missing = (x: number | null | undefined): x is null | undefined => x === null || x === undefined || !Number.isFinite(x);

/** x with `digits` decimals, rounded by $lib/rounding (nearest, or down for margins). */
export function num(x: number | null | undefined, digits = 0, mode: RoundMode = 'nearest'): string {
	if (missing(x)) return MISSING;
	return numberFormat(digits).format(round(x, digits, mode));
}

/** A difference or margin with its sign (a true minus sign): "+3.2", "−0.4", "0.0". Margins round down. */
export function signedNum(x: number | null | undefined, digits = 0, mode: RoundMode = 'nearest'): string {
	if (missing(x)) return MISSING;
	const r = round(x, digits, mode);
	const text = numberFormat(digits).format(Math.abs(r));
	return r > 0 ? `+${text}` : r < 0 ? `−${text}` : text;
}

/** A count: "7", "12,345". */
export const count = (n: number | null | undefined): string => num(n, 0);

// ---- figures without their unit (for tiles that set the unit apart) ---------------------------

export const fuelFigure = (x: number | null | undefined, unit: FuelUnit, mode: RoundMode = 'nearest') => num(x, PRECISION.fuel[unit], mode);
export const fuelMarginFigure = (x: number | null | undefined, unit: FuelUnit) => signedNum(x, PRECISION.fuel[unit], 'down');
export const flowFigure = (x: number | null | undefined, unit: FlowUnit) => num(x, PRECISION.flow[unit]);
export const distanceFigure = (x: number | null | undefined) => num(x, PRECISION.distance);
export const speedFigure = (x: number | null | undefined) => num(x, PRECISION.speed);
export const specificRangeFigure = (x: number | null | undefined) => num(x, PRECISION.specificRange);
export const altitudeFigure = (x: number | null | undefined) => num(x, PRECISION.altitude);

// ---- figures with their unit ---------------------------------------------------------------------

const withUnit = (text: string, unit: string) => (text === MISSING ? MISSING : `${text} ${unit}`);

/** "12.3 US gal", "41 kg" — already in the display unit. */
export const fuelAmount = (x: number | null | undefined, unit: FuelUnit, mode: RoundMode = 'nearest') => withUnit(fuelFigure(x, unit, mode), fuelUnitLabels[unit]);
/** "+3.2 US gal": a margin, rounded down (never more than exists). */
export const fuelMargin = (x: number | null | undefined, unit: FuelUnit) => withUnit(fuelMarginFigure(x, unit), fuelUnitLabels[unit]);
export const flowRate = (x: number | null | undefined, unit: FlowUnit) => withUnit(flowFigure(x, unit), flowUnitLabels[unit]);
export const distance = (x: number | null | undefined, unit: DistanceUnit) => withUnit(distanceFigure(x), distanceUnitLabels[unit]);
export const speed = (x: number | null | undefined, unit: SpeedUnit) => withUnit(speedFigure(x), speedUnitLabels[unit]);
/** "2.41 NM/US gal"; the label comes from units.specificRangeLabel. */
export const specificRange = (x: number | null | undefined, label: string) => withUnit(specificRangeFigure(x), label);
export const altitude = (x: number | null | undefined) => withUnit(altitudeFigure(x), 'ft');
/** A share or a change in percent: "2.3 %". */
export const percent = (x: number | null | undefined) => withUnit(num(x, PRECISION.percent), '%');
/** A change in percent with its sign: "+2.3 %". */
export const signedPercent = (x: number | null | undefined) => withUnit(signedNum(x, PRECISION.percent), '%');
/** The flow meter's correction factor: "1.0230". */
export const meterFactor = (x: number | null | undefined) => num(x, PRECISION.meterFactor);
/** The flow transducer's pulses per unit: "68000.0". */
export const kFactor = (x: number | null | undefined) => num(x, PRECISION.kFactor);
/** Fuel density: "0.719 kg/L". */
export const density = (x: number | null | undefined) => withUnit(num(x, PRECISION.density), 'kg/L');
/** Whole minutes, e.g. of a margin at cruise; rounded down for margins. */
export const minutes = (x: number | null | undefined, mode: RoundMode = 'nearest') => withUnit(num(x, PRECISION.minutes, mode), 'min');
export const signedMinutes = (x: number | null | undefined) => withUnit(signedNum(x, PRECISION.minutes, 'down'), 'min');
/** A file size: "850 KB" below a megabyte, "12.4 MB" above (1 MB = 1024 × 1024 bytes). */
export function fileSize(bytes: number): string {
	return bytes < 1024 * 1024 ? `${num(Math.max(1, bytes / 1024), 0)} KB` : `${num(bytes / 1024 / 1024, PRECISION.megabytes)} MB`;
}
