// The one place figures are rounded for display ($lib/format writes them). Floating-point noise is removed first (a value
// computed as 179.9999999 is 180), then the figure is rounded to nearest — or down, for margins,
// so a screen never shows more margin (or fuel) than the engine computed.

/** Significant digits kept when removing noise: far finer than any figure shown, far coarser than float error. */
const CLEAN_DIGITS = 9;

/** x without floating-point noise: 179.9999999 → 180, 0.1 + 0.2 → 0.3. */
export function clean(x: number): number {
	return Number.isFinite(x) && x !== 0 ? Number(x.toPrecision(CLEAN_DIGITS)) : x;
}

export type RoundMode = 'nearest' | 'down';

/**
 * x rounded to `digits` decimals: 'nearest' (halves away from zero) or 'down' (towards −∞, so a
 * negative margin shows at least as short as it is).
 */
export function round(x: number, digits = 0, mode: RoundMode = 'nearest'): number {
	if (!Number.isFinite(x)) return x;
	const f = 10 ** digits;
	const scaled = clean(x * f);
	const r = mode === 'down' ? Math.floor(scaled) : Math.sign(scaled) * Math.round(Math.abs(scaled));
	// −0 reads as "-0" in some formatters.
	return (r === 0 ? 0 : r) / f;
}
