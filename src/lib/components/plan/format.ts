// Display helpers for plan figures: hours as h:mm, signed differences.

/** 1.75 → "1:45"; NaN → "—". */
export function hoursText(h: number): string {
	if (!Number.isFinite(h)) return '—';
	const total = Math.round(Math.abs(h) * 60);
	const sign = h < 0 && total > 0 ? '−' : '';
	return `${sign}${Math.floor(total / 60)}:${String(total % 60).padStart(2, '0')}`;
}

/** A difference with its sign: "+1.2", "−0.4", "0.0"; NaN → "—". */
export function signed(x: number, digits = 1): string {
	if (!Number.isFinite(x)) return '—';
	const r = x.toFixed(digits);
	if (Number(r) === 0) return (0).toFixed(digits);
	return x > 0 ? `+${r}` : `−${r.slice(1)}`;
}
