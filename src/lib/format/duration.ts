// Durations as text: hours and minutes as h:mm for flight times, h:mm:ss for the scrubber, and
// the short "42 s" / "3 min 5 s" of how long ago something arrived.
import { round as roundFigure } from '$lib/rounding';
import { num } from './numbers';

export interface DurationFormatOptions {
	/**
	 * 'nearest' for elapsed times; 'down' for what is left (endurance), so the display never
	 * promises a minute that is not there.
	 */
	round?: 'nearest' | 'down';
	/** Shown for a missing value (NaN or infinite). */
	missing?: string;
}

/** A duration in hours as h:mm, e.g. 1.5 → "1:30"; negative durations keep their sign (a true minus). */
export function formatDuration(hours: number, options: DurationFormatOptions = {}): string {
	const { round = 'nearest', missing = '–:––' } = options;
	if (!Number.isFinite(hours)) return missing;
	const sign = hours < 0 ? '−' : '';
	// One rounding for every screen (rounding.ts): noise removed first, so 3 h computed as
	// 2.9999999999 shows 3:00 rounded down too.
	const totalMinutes = roundFigure(Math.abs(hours) * 60, 0, round);
	const h = Math.floor(totalMinutes / 60);
	const m = totalMinutes - h * 60;
	return `${totalMinutes === 0 ? '' : sign}${h}:${m < 10 ? '0' : ''}${m}`;
}

/** A duration in seconds as h:mm. */
export function formatSeconds(seconds: number, options: DurationFormatOptions = {}): string {
	return formatDuration(seconds / 3600, options);
}

/** Elapsed seconds as h:mm:ss ("1:02:03"), whole seconds; "—" when missing. */
export function elapsed(seconds: number): string {
	if (!Number.isFinite(seconds)) return '—';
	const s = Math.max(0, Math.round(seconds));
	return `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}

/** How long ago, short: "42 s", "3 min 5 s", "2 h". */
export function age(seconds: number): string {
	if (!Number.isFinite(seconds)) return '—';
	if (seconds < 90) return `${num(seconds, 0)} s`;
	if (seconds < 5400) return `${Math.floor(seconds / 60)} min ${Math.round(seconds % 60)} s`;
	return `${num(seconds / 3600, 0)} h`;
}
