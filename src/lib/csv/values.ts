// Cell values: strict numbers (decimal point or comma) and the time formats a mapping can name.
// The fast paths return NaN for anything malformed; explainTime() says why, for the error report.
// Hand-written rather than Date.parse: Date.parse accepts times without a zone as local time.

/**
 * A number cell; NaN when it is not a plain decimal number (no hex, no "Infinity", no units).
 * Number() does the work: after it, only its extra spellings (0x…, 0b…, 0o…) need refusing, which
 * keeps this at a few nanoseconds per cell for million-row files.
 */
export function parseNumber(cell: string, decimalComma: boolean): number {
	let s = cell;
	if (decimalComma) {
		if (s.indexOf('.') !== -1) return NaN;
		s = s.replace(',', '.');
	}
	const v = +s;
	if (v - v !== 0) return NaN; // NaN or ±Infinity
	const c1 = s.charCodeAt(1) | 32;
	if (c1 === 120 || c1 === 98 || c1 === 111 || s.charCodeAt(0) <= 32) {
		// 0x10, 0b1, 0o7 (also behind spaces): not decimal.
		if (/^\s*0[xbo]/i.test(s)) return NaN;
	}
	// Number('') and Number('  ') are 0: a blank cell is the caller's business, never a zero.
	if (v === 0 && s.trim() === '') return NaN;
	return v;
}

const DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
const daysIn = (y: number, m: number) => (m === 2 && ((y % 4 === 0 && y % 100 !== 0) || y % 400 === 0) ? 29 : DAYS[m - 1]);

function num(s: string, from: number, len: number): number {
	let v = 0;
	for (let i = from; i < from + len; i++) {
		const c = s.charCodeAt(i) - 48;
		if (c < 0 || c > 9) return -1;
		v = v * 10 + c;
	}
	return v;
}

/** Fractional seconds after a '.' starting at i: [value in ms, index after the digits]. */
function fraction(s: string, i: number): [number, number] {
	let ms = 0;
	let scale = 100;
	let j = i;
	while (j < s.length) {
		const c = s.charCodeAt(j) - 48;
		if (c < 0 || c > 9) break;
		ms += c * scale;
		scale /= 10;
		j++;
	}
	return [j === i ? NaN : ms, j];
}

/**
 * ISO 8601 date-time with a zone: YYYY-MM-DDThh:mm[:ss[.fff]] then Z, ±hh:mm, ±hhmm or ±hh.
 * A space may stand for the T. Returns epoch milliseconds (fraction kept), NaN when malformed
 * or when the zone is missing.
 */
export function parseIsoTime(cell: string): number {
	const s = cell.length > 0 && (cell.charCodeAt(0) === 32 || cell.charCodeAt(cell.length - 1) === 32) ? cell.trim() : cell;
	if (s.length < 17 || s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45) return NaN;
	const sep = s.charCodeAt(10);
	if (sep !== 84 && sep !== 116 && sep !== 32) return NaN;
	const y = num(s, 0, 4);
	const mo = num(s, 5, 2);
	const d = num(s, 8, 2);
	const h = num(s, 11, 2);
	const mi = num(s, 14, 2);
	if (y < 0 || mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) || h < 0 || h > 23 || s.charCodeAt(13) !== 58 || mi < 0 || mi > 59) return NaN;
	let i = 16;
	let sec = 0;
	let ms = 0;
	if (s.charCodeAt(i) === 58) {
		sec = num(s, i + 1, 2);
		if (sec < 0 || sec > 59) return NaN;
		i += 3;
		if (s.charCodeAt(i) === 46 || s.charCodeAt(i) === 44) {
			[ms, i] = fraction(s, i + 1);
			if (ms !== ms) return NaN;
		}
	}
	let offsetMin: number;
	const z = s.charCodeAt(i);
	if ((z === 90 || z === 122) && i + 1 === s.length) offsetMin = 0;
	else if (z === 43 || z === 45) {
		const rest = s.length - i - 1;
		const oh = num(s, i + 1, 2);
		let om = 0;
		if (rest === 5 && s.charCodeAt(i + 3) === 58) om = num(s, i + 4, 2);
		else if (rest === 4) om = num(s, i + 3, 2);
		else if (rest !== 2) return NaN;
		if (oh < 0 || oh > 14 || om < 0 || om > 59) return NaN;
		offsetMin = (z === 45 ? -1 : 1) * (oh * 60 + om);
	} else return NaN;
	return Date.UTC(y, mo - 1, d, h, mi, sec) + ms - offsetMin * 60_000;
}

/** Seconds since midnight for hh:mm[:ss[.fff]] (hour 0–23); NaN when malformed. */
export function parseClock(cell: string): number {
	const s = cell.trim();
	const m = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?$/.exec(s);
	if (!m) return NaN;
	const h = Number(m[1]);
	const mi = Number(m[2]);
	const sec = m[3] === undefined ? 0 : Number(m[3]);
	if (h > 23 || mi > 59 || sec > 59) return NaN;
	const frac = m[4] === undefined ? 0 : Number(`0.${m[4]}`);
	return h * 3600 + mi * 60 + sec + frac;
}

/** Epoch milliseconds of a YYYY-MM-DD date at 00:00 UTC; NaN when it is no real date. */
export function parseDate(date: string): number {
	const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date.trim());
	if (!m) return NaN;
	const y = Number(m[1]);
	const mo = Number(m[2]);
	const d = Number(m[3]);
	if (mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo)) return NaN;
	return Date.UTC(y, mo - 1, d);
}

/** Why an ISO time cell was refused, in words for the report. */
export function explainIsoTime(cell: string): string {
	const s = cell.trim();
	if (/^\d{4}-\d{2}-\d{2}[Tt ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?$/.test(s))
		return 'the time has no zone: add Z for UTC or an offset such as +02:00';
	if (/^\d{4}-\d{2}-\d{2}$/.test(s)) return 'a date without a time of day';
	if (/^\d+(\.\d+)?$/.test(s)) return 'a number where an ISO 8601 date-time was expected (is the time format epoch or elapsed seconds?)';
	if (/^\d{4}-\d{2}-\d{2}[Tt ]/.test(s)) return 'not a real date-time (check month, day, hour, minute and second)';
	return 'not an ISO 8601 date-time such as 2026-05-02T09:14:05Z';
}

/** Formats epoch milliseconds for messages, e.g. 2026-05-02 09:14:05Z (milliseconds when set). */
export function formatTimeMs(ms: number): string {
	// Outside ±8.64e15 ms (ECMAScript's time range) toISOString throws: such a value is shown as it is.
	if (!Number.isFinite(ms) || Math.abs(ms) > 8.64e15) return String(ms);
	const iso = new Date(ms).toISOString();
	return `${iso.slice(0, 10)} ${ms % 1000 === 0 ? iso.slice(11, 19) : iso.slice(11, 23)}Z`;
}
