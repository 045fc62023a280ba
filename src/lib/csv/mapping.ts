// Column mappings: which column of a recorder file holds which quantity, in which unit, and how
// its time is written. One zod schema serves the upload page, the API, saved import profiles and
// the parser; our own format is just the mapping burndownMapping() derives from its header.
import { z } from 'zod';
import { distanceUnits, flowUnits, speedUnits, type DistanceUnit, type FlowUnit, type SpeedUnit } from '$lib/units';
import { DTG_COLUMN, FLOW_COLUMNS, GS_COLUMN, LAT_COLUMN, LON_COLUMN, ALT_COLUMN, SEQ_COLUMN, TIME_COLUMN, WPT_COLUMN } from './format';

/**
 * iso: 2026-05-02T09:14:05Z or with an offset; epochS / epochMs: Unix time; elapsedS: seconds
 * since `start`; clock: hh:mm:ss on `date`, rolling over to the next day past midnight.
 */
export const timeFormats = ['iso', 'epochS', 'epochMs', 'elapsedS', 'clock'] as const;
export type TimeFormat = (typeof timeFormats)[number];
export const timeFormatLabels: Record<TimeFormat, string> = {
	iso: 'ISO 8601 date-time with Z or offset',
	epochS: 'Unix time, seconds',
	epochMs: 'Unix time, milliseconds',
	elapsedS: 'Seconds since a start time',
	clock: 'Clock time hh:mm:ss on a date'
};

export const altitudeUnits = ['ft', 'm'] as const;
export type AltitudeUnit = (typeof altitudeUnits)[number];
export const delimiters = [',', ';', '\t'] as const;
export type Delimiter = (typeof delimiters)[number];
export const delimiterLabels: Record<Delimiter, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab' };

const column = z.string().trim().min(1, 'Choose a column.').max(200);
const ISO_WITH_ZONE = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/i;

export const timeMappingSchema = z.object({
	column,
	format: z.enum(timeFormats, 'Choose how the time is written.'),
	/** For elapsedS: the date-time of elapsed 0, ISO 8601 with Z or an offset. */
	start: z.string().trim().regex(ISO_WITH_ZONE, 'Give the start as a date-time with Z or an offset, e.g. 2026-05-02T09:00:00Z.').optional(),
	/** For clock: the date of the first sample on the recorder's clock, YYYY-MM-DD. */
	date: z.string().trim().regex(/^\d{4}-\d{2}-\d{2}$/, 'Give the date as YYYY-MM-DD.').optional(),
	/** For clock: minutes to add to UTC to get the recorder's clock (e.g. 120 for UTC+2). */
	utcOffsetMin: z.number().int().min(-14 * 60).max(14 * 60).optional()
});

const unitColumn = <U extends string>(units: readonly U[], what: string) =>
	z.object({ column, unit: z.enum(units as [U, ...U[]], `Choose the ${what} unit.`) });

export const columnMappingSchema = z
	.object({
		delimiter: z.enum(delimiters, 'Choose the delimiter.'),
		decimal: z.enum(['.', ','], 'Choose the decimal mark.'),
		time: timeMappingSchema,
		flow: unitColumn(flowUnits, 'fuel flow'),
		gs: unitColumn(speedUnits, 'speed').nullable().default(null),
		dtg: unitColumn(distanceUnits, 'distance').nullable().default(null),
		alt: unitColumn(altitudeUnits, 'altitude').nullable().default(null),
		wpt: z.object({ column }).nullable().default(null),
		lat: z.object({ column }).nullable().default(null),
		lon: z.object({ column }).nullable().default(null),
		seq: z.object({ column }).nullable().default(null)
	})
	.superRefine((m, ctx) => {
		if (m.delimiter === ',' && m.decimal === ',')
			ctx.addIssue({ code: 'custom', path: ['decimal'], message: 'A decimal comma needs a delimiter other than the comma.' });
		if (m.time.format === 'elapsedS' && !m.time.start)
			ctx.addIssue({ code: 'custom', path: ['time', 'start'], message: 'Elapsed seconds need the date-time the recording started.' });
		if (m.time.format === 'clock' && !m.time.date)
			ctx.addIssue({ code: 'custom', path: ['time', 'date'], message: 'Clock times need the date of the flight.' });
		const used = new Map<string, string>();
		for (const field of MAPPED_FIELDS) {
			const c = m[field];
			if (!c) continue;
			const key = normalizeHeader(c.column);
			const other = used.get(key);
			if (other)
				ctx.addIssue({ code: 'custom', path: [field, 'column'], message: `Column "${c.column}" is already used for ${FIELD_LABELS[other as MappedField]}.` });
			else used.set(key, field);
		}
	});

export type ColumnMapping = z.output<typeof columnMappingSchema>;
export type ColumnMappingInput = z.input<typeof columnMappingSchema>;

export const MAPPED_FIELDS = ['time', 'flow', 'gs', 'dtg', 'alt', 'wpt', 'lat', 'lon', 'seq'] as const;
export type MappedField = (typeof MAPPED_FIELDS)[number];
export const FIELD_LABELS: Record<MappedField, string> = {
	time: 'time',
	flow: 'fuel flow',
	gs: 'ground speed',
	dtg: 'distance to go',
	alt: 'altitude',
	wpt: 'waypoint',
	lat: 'latitude',
	lon: 'longitude',
	seq: 'sequence number'
};

/** A saved import profile keeps the layout, never the date of one particular file. */
export function profileMapping(m: ColumnMapping): ColumnMapping {
	const { start: _s, date: _d, ...time } = m.time;
	return { ...m, time };
}

/** Header names compare trimmed, case-insensitive, with runs of spaces as one. */
export function normalizeHeader(name: string): string {
	return name.trim().toLowerCase().replace(/\s+/g, ' ');
}

/** What import profiles are matched on: the normalised header line. */
export function headerSignature(headers: readonly string[]): string {
	return headers.map(normalizeHeader).join('|');
}

/** The mapping of a file in the Burndown recorder CSV format, or why the header is not one. */
export function burndownMapping(headers: readonly string[]): { mapping: ColumnMapping } | { missing: string[]; message: string } {
	const names = new Set(headers.map(normalizeHeader));
	const flows = Object.keys(FLOW_COLUMNS).filter((c) => names.has(c));
	const missing: string[] = [TIME_COLUMN, GS_COLUMN, DTG_COLUMN].filter((c) => !names.has(c));
	if (flows.length === 0) missing.splice(1, 0, 'fuel_flow_<unit>');
	if (flows.length > 1)
		return { missing: [], message: `The header has ${flows.length} fuel-flow columns (${flows.join(', ')}); keep one.` };
	if (missing.length > 0)
		return { missing, message: `Not a Burndown recorder CSV header: missing ${missing.join(', ')}.` };
	const opt = (c: string) => (names.has(c) ? { column: c } : null);
	return {
		mapping: {
			delimiter: ',',
			decimal: '.',
			time: { column: TIME_COLUMN, format: 'iso' },
			flow: { column: flows[0], unit: FLOW_COLUMNS[flows[0]] },
			gs: { column: GS_COLUMN, unit: 'kt' },
			dtg: { column: DTG_COLUMN, unit: 'nm' },
			alt: names.has(ALT_COLUMN) ? { column: ALT_COLUMN, unit: 'ft' } : null,
			wpt: opt(WPT_COLUMN),
			lat: opt(LAT_COLUMN),
			lon: opt(LON_COLUMN),
			seq: opt(SEQ_COLUMN)
		}
	};
}

// ---- guessing a mapping for another recorder's header, for the mapper to start from ----------

const has = (h: string, ...words: string[]) => words.some((w) => h.includes(w));
const word = (h: string, ...words: string[]) => words.some((w) => new RegExp(`(^|[^a-z])${w}([^a-z]|$)`).test(h));

function guessFlowUnit(h: string): FlowUnit {
	if (has(h, 'l/h', 'lph', 'ltr', 'litre', 'liter') || word(h, 'l')) return 'l/h';
	if (has(h, 'imp')) return 'impgal/h';
	if (has(h, 'kg')) return 'kg/h';
	if (has(h, 'lb', 'pph')) return 'lb/h';
	return 'usgal/h';
}
function guessSpeedUnit(h: string): SpeedUnit {
	if (has(h, 'km/h', 'kmh', 'kph')) return 'km/h';
	if (has(h, 'mph')) return 'mph';
	return 'kt';
}
function guessDistanceUnit(h: string): DistanceUnit {
	if (word(h, 'km')) return 'km';
	if (word(h, 'sm', 'mi', 'mile', 'miles')) return 'sm';
	return 'nm';
}

/** The time format a sample value looks like. */
export function guessTimeFormat(value: string): TimeFormat {
	const v = value.trim();
	if (/^\d{4}-\d{2}-\d{2}[T ]/.test(v)) return 'iso';
	if (/^\d{1,2}:\d{2}(:\d{2}(\.\d+)?)?$/.test(v)) return 'clock';
	if (/^\d{12,14}(\.\d+)?$/.test(v)) return 'epochMs';
	if (/^\d{9,11}(\.\d+)?$/.test(v)) return 'epochS';
	return 'elapsedS';
}

/**
 * A first guess at the mapping from header names (and the first data row for the time format).
 * Fields it cannot place stay null; the user confirms or corrects every choice in the mapper.
 */
export function guessMapping(
	headers: readonly string[],
	firstRow: readonly string[] = [],
	layout: { delimiter: Delimiter; decimal: '.' | ',' } = { delimiter: ',', decimal: '.' }
): Partial<Record<MappedField, { column: string; unit?: string; format?: TimeFormat }>> & { delimiter: Delimiter; decimal: '.' | ',' } {
	const out: ReturnType<typeof guessMapping> = { ...layout };
	const taken = new Set<number>();
	const find = (test: (h: string) => boolean): number => {
		const i = headers.findIndex((raw, idx) => !taken.has(idx) && test(normalizeHeader(raw)));
		if (i >= 0) taken.add(i);
		return i;
	};
	const t = find((h) => has(h, 'time', 'utc', 'zeit', 'timestamp', 'clock') || word(h, 't', 'ts', 'date'));
	if (t >= 0) out.time = { column: headers[t], format: guessTimeFormat(firstRow[t] ?? '') };
	const f = find((h) => has(h, 'flow', 'fuel') || word(h, 'ff', 'fflow'));
	if (f >= 0) out.flow = { column: headers[f], unit: guessFlowUnit(normalizeHeader(headers[f])) };
	const g = find((h) => has(h, 'ground speed', 'groundspeed', 'ground_speed', 'speed') || word(h, 'gs', 'gspd'));
	if (g >= 0) out.gs = { column: headers[g], unit: guessSpeedUnit(normalizeHeader(headers[g])) };
	const d = find((h) => has(h, 'dist', 'dtg', 'to go', 'remaining'));
	if (d >= 0) out.dtg = { column: headers[d], unit: guessDistanceUnit(normalizeHeader(headers[d])) };
	const a = find((h) => has(h, 'alt', 'height', 'elev'));
	if (a >= 0) out.alt = { column: headers[a], unit: /(^|[^a-z])m([^a-z]|$)|metre|meter/.test(normalizeHeader(headers[a])) ? 'm' : 'ft' };
	const w = find((h) => has(h, 'waypoint', 'wpt', 'fix') || word(h, 'wp', 'leg', 'to'));
	if (w >= 0) out.wpt = { column: headers[w] };
	const la = find((h) => has(h, 'lat'));
	if (la >= 0) out.lat = { column: headers[la] };
	const lo = find((h) => has(h, 'lon', 'lng'));
	if (lo >= 0) out.lon = { column: headers[lo] };
	const s = find((h) => word(h, 'seq', 'sequence', 'n', 'no', 'nr', 'record', 'rec'));
	if (s >= 0) out.seq = { column: headers[s] };
	return out;
}
