// Dates and times as text. UTC is the primary clock (aviation practice): ISO dates (2026-12-03),
// a 24-hour clock, "UTC" written out; the time in the reader's zone follows in brackets when one
// is known, e.g. "14:05 UTC (15:05 CET)". Everything goes through Intl with a fixed locale, so
// the server and the browser write the same text for the same zone.

/** A moment: a Date, or epoch seconds (the engine's and the wire's time). */
export type Instant = Date | number;

export const MISSING_TIME = '—';

const LOCALE = 'en-GB';
const UTC_NAMES = new Set(['UTC', 'Etc/UTC', 'Etc/GMT', 'GMT', 'Etc/UCT', 'UCT', 'Etc/Universal', 'Universal', 'Etc/Zulu', 'Zulu', 'Etc/GMT0', 'Etc/GMT+0', 'Etc/GMT-0', 'GMT0', 'Etc/Greenwich', 'Greenwich']);

function toDate(at: Instant | null | undefined): Date | null {
	if (at === null || at === undefined) return null;
	const d = typeof at === 'number' ? new Date(Math.round(at * 1000)) : at;
	return Number.isFinite(d.getTime()) ? d : null;
}

type Parts = { year: string; month: string; day: string; hour: string; minute: string; second: string };
const partFormats = new Map<string, Intl.DateTimeFormat>();
function parts(d: Date, timeZone: string): Parts {
	let f = partFormats.get(timeZone);
	if (!f) {
		f = new Intl.DateTimeFormat(LOCALE, { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' });
		partFormats.set(timeZone, f);
	}
	const out: Record<string, string> = {};
	for (const p of f.formatToParts(d)) out[p.type] = p.value;
	return out as Parts;
}
const ymd = (p: Parts) => `${p.year}-${p.month}-${p.day}`;
const hm = (p: Parts, seconds: boolean) => `${p.hour}:${p.minute}${seconds ? `:${p.second}` : ''}`;

/** Whether `zone` is an IANA time zone this platform knows (Intl.supportedValuesOf lists the canonical ones). */
export function isTimeZone(zone: string): boolean {
	if (zone === 'UTC') return true;
	try {
		return Intl.supportedValuesOf('timeZone').includes(zone);
	} catch {
		return false;
	}
}

/** True when `zone` keeps UTC itself: no local time is added beside the UTC one. */
export const isUtcZone = (zone: string) => UTC_NAMES.has(zone);

// ---- UTC ---------------------------------------------------------------------------------------

/** "2026-12-03" (the UTC day). */
export function isoDate(at: Instant | null | undefined): string {
	const d = toDate(at);
	return d ? ymd(parts(d, 'UTC')) : MISSING_TIME;
}

/** "14:05" or, with seconds, "14:05:09" (UTC, no suffix: for axes and tables headed UTC). */
export function utcClock(at: Instant | null | undefined, seconds = false): string {
	const d = toDate(at);
	return d ? hm(parts(d, 'UTC'), seconds) : MISSING_TIME;
}

/** "2026-12-03 14:05" (UTC, no suffix). */
export function utcDateTime(at: Instant | null | undefined, seconds = false): string {
	const d = toDate(at);
	if (!d) return MISSING_TIME;
	const p = parts(d, 'UTC');
	return `${ymd(p)} ${hm(p, seconds)}`;
}

// ---- the reader's zone -------------------------------------------------------------------------

const nameFormats = new Map<string, Intl.DateTimeFormat>();
function shortName(d: Date, timeZone: string, locale: string): string {
	const key = `${locale}|${timeZone}`;
	let f = nameFormats.get(key);
	if (!f) {
		f = new Intl.DateTimeFormat(locale, { timeZone, timeZoneName: 'short' });
		nameFormats.set(key, f);
	}
	return f.formatToParts(d).find((p) => p.type === 'timeZoneName')?.value ?? timeZone;
}

/**
 * The zone's short name at that moment: "CET", "BST", "EST", or its offset ("GMT+9") where the
 * platform has no abbreviation in use.
 */
export function zoneName(at: Instant, timeZone: string): string {
	const d = toDate(at) ?? new Date(0);
	const gb = shortName(d, timeZone, LOCALE);
	if (!/^(GMT|UTC)[+−-]/.test(gb)) return gb;
	const us = shortName(d, timeZone, 'en-US');
	return /^[A-Z]{2,5}$/.test(us) ? us : gb;
}

/** "15:05 CET"; "2026-12-04 00:30 CET" when the local day is not the UTC day (or `withDate`). */
export function localTime(at: Instant | null | undefined, timeZone: string, opts: { seconds?: boolean; withDate?: boolean } = {}): string {
	const d = toDate(at);
	if (!d) return MISSING_TIME;
	const p = parts(d, timeZone);
	const dayDiffers = ymd(p) !== ymd(parts(d, 'UTC'));
	return `${opts.withDate || dayDiffers ? `${ymd(p)} ` : ''}${hm(p, opts.seconds ?? false)} ${zoneName(d, timeZone)}`;
}

const withLocal = (utc: string, d: Date, timeZone: string | null | undefined, seconds: boolean) =>
	timeZone && !isUtcZone(timeZone) ? `${utc} UTC (${localTime(d, timeZone, { seconds })})` : `${utc} UTC`;

/** "14:05 UTC (15:05 CET)"; "14:05 UTC" when no zone is known yet or the zone is UTC. */
export function timeText(at: Instant | null | undefined, timeZone: string | null | undefined, seconds = false): string {
	const d = toDate(at);
	return d ? withLocal(utcClock(d, seconds), d, timeZone, seconds) : MISSING_TIME;
}

/** "2026-12-03 14:05 UTC (15:05 CET)"; the local date is added when it is another day. */
export function dateTimeText(at: Instant | null | undefined, timeZone: string | null | undefined, seconds = false): string {
	const d = toDate(at);
	return d ? withLocal(utcDateTime(d, seconds), d, timeZone, seconds) : MISSING_TIME;
}

/** Only the bracketed local part, " (15:05 CET)", or "" — for places that write the UTC part themselves. */
export function localSuffix(at: Instant | null | undefined, timeZone: string | null | undefined, seconds = false): string {
	const d = toDate(at);
	return d && timeZone && !isUtcZone(timeZone) ? ` (${localTime(d, timeZone, { seconds })})` : '';
}

/** The machine-readable form for <time datetime>: ISO 8601 in UTC. */
export function isoInstant(at: Instant | null | undefined): string | undefined {
	return toDate(at)?.toISOString();
}
