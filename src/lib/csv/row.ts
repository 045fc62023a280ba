// One recorder row from cells to a canonical sample (epoch ms, L/h, kt, NM, ft), or a problem
// naming the line, column and value. Shared by the upload parser and the live ingest: both build
// a reader from a mapping and a header, then feed it the cells of each line in order.
import { z } from 'zod';
import {
	flowUnitLabels,
	knotsPerUnit,
	litresPerUnit,
	flowUnitVolume,
	nauticalMilesPerUnit,
	METRES_PER_FOOT,
	speedUnitLabels,
	distanceUnitLabels
} from '$lib/units';
import {
	MAX_ALT_FT,
	MAX_DTG_NM,
	MAX_FLOW_LPH,
	MAX_GS_KT,
	MAX_SEQ,
	MAX_TIME_MS,
	MAX_WPT_LENGTH,
	MIN_ALT_FT,
	MIN_TIME_MS
} from './format';
import { FIELD_LABELS, MAPPED_FIELDS, normalizeHeader, type ColumnMapping, type MappedField } from './mapping';
import { explainIsoTime, formatTimeMs, parseClock, parseDate, parseIsoTime, parseNumber } from './values';

/** A sample in canonical units; null = not recorded in this sample (a blank cell). */
export interface RecorderRow {
	/** Line of the file the row came from (1-based). */
	line: number;
	/** The recorder's sequence number, when the file has one. */
	seq: number | null;
	/** Epoch milliseconds UTC, whole. */
	tMs: number;
	/** Fuel flow, L/h. */
	flow: number | null;
	/** Ground speed, kt. */
	gs: number | null;
	/** Distance to go to the next waypoint, NM. */
	dtg: number | null;
	/** Altitude, ft. */
	alt: number | null;
	wpt: string | null;
	lat: number | null;
	lon: number | null;
}

/** What is wrong and where: line number, column name as in the header, the cell as written. */
export interface RowProblem {
	line: number;
	column: string;
	value: string;
	message: string;
}

export type RowResult = { row: RecorderRow } | { problem: RowProblem };

const nullable = (schema: z.ZodNumber) => schema.nullable();

/**
 * The canonical row: every limit a sample must respect whatever file it came from. The reader
 * converts cells and then checks the row with this schema; live batches sent as JSON can be
 * checked with it directly.
 */
export const recorderRowSchema = z.object({
	line: z.number().int().min(1),
	seq: z.number().int().min(0).max(MAX_SEQ).nullable(),
	tMs: z.number().int().min(MIN_TIME_MS).max(MAX_TIME_MS),
	flow: nullable(z.number().min(0).max(MAX_FLOW_LPH)),
	gs: nullable(z.number().min(0).max(MAX_GS_KT)),
	dtg: nullable(z.number().min(0).max(MAX_DTG_NM)),
	alt: nullable(z.number().min(MIN_ALT_FT).max(MAX_ALT_FT)),
	wpt: z.string().min(1).max(MAX_WPT_LENGTH).nullable(),
	lat: nullable(z.number().min(-90).max(90)),
	lon: nullable(z.number().min(-180).max(180))
});

const inRange = (v: number | null, min: number, max: number) => v === null || (v >= min && v <= max);

/**
 * recorderRowSchema as a plain predicate, for the per-sample loop: zod's own pass costs about a
 * microsecond a row, a third of the whole upload budget at a million rows. The schema stays the
 * definition: a property test checks both agree, and a row failing here is explained by zod.
 */
export function withinLimits(r: RecorderRow): boolean {
	return (
		Number.isInteger(r.line) &&
		r.line >= 1 &&
		(r.seq === null || (Number.isInteger(r.seq) && r.seq >= 0 && r.seq <= MAX_SEQ)) &&
		Number.isInteger(r.tMs) &&
		r.tMs >= MIN_TIME_MS &&
		r.tMs <= MAX_TIME_MS &&
		inRange(r.flow, 0, MAX_FLOW_LPH) &&
		inRange(r.gs, 0, MAX_GS_KT) &&
		inRange(r.dtg, 0, MAX_DTG_NM) &&
		inRange(r.alt, MIN_ALT_FT, MAX_ALT_FT) &&
		(r.wpt === null || (typeof r.wpt === 'string' && r.wpt.length >= 1 && r.wpt.length <= MAX_WPT_LENGTH)) &&
		inRange(r.lat, -90, 90) &&
		inRange(r.lon, -180, 180)
	);
}

const round = (x: number, digits = 1) => Math.round(x * 10 ** digits) / 10 ** digits;

/** Where each field's cell sits in a line, and how to turn it into canonical units. */
interface Compiled {
	index: Record<MappedField, number>;
	names: Record<MappedField, string>;
	/** Multipliers from the file's unit to the canonical one. */
	flowFactor: number;
	gsFactor: number;
	dtgFactor: number;
	altFactor: number;
	decimalComma: boolean;
}

export interface RowReaderOptions {
	/** Fuel density in kg/L: needed when the flow is a mass per hour (lb/h, kg/h). */
	densityKgPerL?: number;
	/** The first row's time must be after this one (live batches continue a flight). */
	afterTMs?: number;
	/** And the first row's sequence number after this one. */
	afterSeq?: number;
}

export interface RowReader {
	/** Number of cells a line must have (the header's). */
	readonly width: number;
	/** Converts and checks one line; null for a line with every cell blank (skipped). */
	read(cells: readonly string[], line: number): RowResult | null;
	/** Header columns no field is mapped to. */
	readonly ignoredColumns: string[];
}

/** The header problems of a mapping (missing or duplicate columns), or a compiled reader. */
export function createRowReader(
	mapping: ColumnMapping,
	headers: readonly string[],
	headerLine: number,
	options: RowReaderOptions = {}
): { reader: RowReader } | { problems: RowProblem[] } {
	const problems: RowProblem[] = [];
	const positions = new Map<string, number[]>();
	headers.forEach((h, i) => {
		const key = normalizeHeader(h);
		positions.set(key, [...(positions.get(key) ?? []), i]);
	});
	const index = {} as Record<MappedField, number>;
	const names = {} as Record<MappedField, string>;
	for (const field of MAPPED_FIELDS) {
		const c = mapping[field];
		index[field] = -1;
		names[field] = c?.column ?? '';
		if (!c) continue;
		const at = positions.get(normalizeHeader(c.column)) ?? [];
		if (at.length === 0)
			problems.push({ line: headerLine, column: c.column, value: '', message: `The ${FIELD_LABELS[field]} column "${c.column}" is not in the header.` });
		else if (at.length > 1)
			problems.push({ line: headerLine, column: c.column, value: '', message: `The header has ${at.length} columns named "${c.column}"; rename one.` });
		else {
			index[field] = at[0];
			names[field] = headers[at[0]];
		}
	}

	let flowFactor = 1;
	if (mapping.flow.unit === 'lb/h' || mapping.flow.unit === 'kg/h') {
		const d = options.densityKgPerL;
		if (d === undefined || !Number.isFinite(d) || d <= 0)
			problems.push({ line: headerLine, column: mapping.flow.column, value: '', message: `Fuel flow in ${flowUnitLabels[mapping.flow.unit]} needs the aircraft's fuel density.` });
		else flowFactor = litresPerUnit(flowUnitVolume(mapping.flow.unit), d);
	} else flowFactor = litresPerUnit(flowUnitVolume(mapping.flow.unit));

	let baseMs = 0;
	if (mapping.time.format === 'elapsedS') {
		baseMs = parseIsoTime(mapping.time.start ?? '');
		if (baseMs !== baseMs) problems.push({ line: headerLine, column: mapping.time.column, value: mapping.time.start ?? '', message: 'Elapsed seconds need a valid start date-time with Z or an offset.' });
	} else if (mapping.time.format === 'clock') {
		baseMs = parseDate(mapping.time.date ?? '') - (mapping.time.utcOffsetMin ?? 0) * 60_000;
		if (baseMs !== baseMs) problems.push({ line: headerLine, column: mapping.time.column, value: mapping.time.date ?? '', message: 'Clock times need a valid date, YYYY-MM-DD.' });
	}
	if (problems.length > 0) return { problems };

	const used = new Set(MAPPED_FIELDS.map((f) => index[f]).filter((i) => i >= 0));
	const compiled: Compiled = {
		index,
		names,
		flowFactor,
		gsFactor: mapping.gs ? knotsPerUnit(mapping.gs.unit) : 1,
		dtgFactor: mapping.dtg ? nauticalMilesPerUnit(mapping.dtg.unit) : 1,
		altFactor: mapping.alt?.unit === 'm' ? 1 / METRES_PER_FOOT : 1,
		decimalComma: mapping.decimal === ','
	};
	return {
		reader: new Reader(compiled, mapping, headers.length, baseMs, options, headers.filter((_, i) => !used.has(i)))
	};
}

const UNIT_LABEL = (m: ColumnMapping, field: MappedField): string => {
	switch (field) {
		case 'flow':
			return flowUnitLabels[m.flow.unit];
		case 'gs':
			return m.gs ? speedUnitLabels[m.gs.unit] : 'kt';
		case 'dtg':
			return m.dtg ? distanceUnitLabels[m.dtg.unit] : 'NM';
		case 'alt':
			return m.alt?.unit ?? 'ft';
		case 'lat':
		case 'lon':
			return '°';
		default:
			return '';
	}
};

class Reader implements RowReader {
	private prevT: number;
	private prevLine = 0;
	private prevSeq: number;
	/** Clock format: whole days added after passing midnight, and the last time of day seen. */
	private dayOffsetMs = 0;
	private prevClockS = -1;
	// Cell positions as plain fields: the loop below runs once per sample of million-row files.
	private iTime: number;
	private iFlow: number;
	private iGs: number;
	private iDtg: number;
	private iAlt: number;
	private iLat: number;
	private iLon: number;
	private iSeq: number;
	private iWpt: number;

	constructor(
		private c: Compiled,
		private mapping: ColumnMapping,
		readonly width: number,
		private baseMs: number,
		options: RowReaderOptions,
		readonly ignoredColumns: string[]
	) {
		this.prevT = options.afterTMs ?? -Infinity;
		this.prevSeq = options.afterSeq ?? -1;
		const i = c.index;
		this.iTime = i.time;
		this.iFlow = i.flow;
		this.iGs = i.gs;
		this.iDtg = i.dtg;
		this.iAlt = i.alt;
		this.iLat = i.lat;
		this.iLon = i.lon;
		this.iSeq = i.seq;
		this.iWpt = i.wpt;
	}

	private problem(line: number, field: MappedField | null, value: string, message: string): RowResult {
		return { problem: { line, column: field ? this.c.names[field] : '', value, message } };
	}

	/** A number cell: null when blank, NaN when malformed. */
	private number(cells: readonly string[], i: number): number | null {
		if (i < 0) return null;
		const s = cells[i];
		if (s.length === 0) return null;
		const v = parseNumber(s, this.c.decimalComma);
		if (v === v) return v;
		// A cell of spaces only is blank too.
		return s.trim() === '' ? null : NaN;
	}

	private time(cell: string): number {
		const f = this.mapping.time.format;
		if (f === 'iso') return parseIsoTime(cell);
		if (f === 'clock') {
			const s = parseClock(cell);
			if (s !== s) return NaN;
			// Past midnight the clock starts again from 0: a jump back of more than 12 hours is the
			// next day, anything less is a real step backwards for the order check to catch.
			if (this.prevClockS >= 0 && s < this.prevClockS - 43_200) this.dayOffsetMs += 86_400_000;
			this.prevClockS = s;
			return this.baseMs + this.dayOffsetMs + s * 1000;
		}
		const v = parseNumber(cell, this.c.decimalComma);
		if (f === 'epochS') return v * 1000;
		if (f === 'epochMs') return v;
		return this.baseMs + v * 1000;
	}

	/**
	 * Why a comma-separated line may have more fields than its header: numbers written with a
	 * decimal comma split in two ("8,5" reads as two cells).
	 */
	private extraFieldsHint(cells: readonly string[]): string {
		if (this.mapping.delimiter !== ',' || cells.length <= this.width) return '';
		const digits = cells.filter((x) => /^\s*-?\d+\s*$/.test(x)).length;
		return digits >= 2 ? ' Numbers with a decimal comma in a comma-separated file split into two fields: export the file with decimal points, or with semicolons between the cells.' : '';
	}

	read(cells: readonly string[], line: number): RowResult | null {
		const c = this.c;
		if (cells.length !== this.width) {
			if (cells.length === 1 && cells[0].trim() === '') return null;
			return this.problem(
				line,
				null,
				cells.join(this.mapping.delimiter).slice(0, 80),
				`The line has ${cells.length} ${cells.length === 1 ? 'field' : 'fields'}; the header has ${this.width}.${this.extraFieldsHint(cells)}`
			);
		}
		const tCell = cells[this.iTime];
		if (tCell.length === 0 || tCell.trim() === '') {
			if (cells.every((x) => x.trim() === '')) return null;
			return this.problem(line, 'time', '', 'The time is missing; every sample needs one.');
		}
		const rawT = this.time(tCell);
		if (rawT !== rawT) {
			const f = this.mapping.time.format;
			const why = f === 'iso' ? explainIsoTime(tCell) : f === 'clock' ? 'not a clock time hh:mm:ss' : 'not a number of seconds' + (f === 'epochMs' ? ' (milliseconds)' : '');
			return this.problem(line, 'time', tCell, `Malformed time: ${why}.`);
		}
		const tMs = Math.round(rawT);

		const flow = this.number(cells, this.iFlow);
		const gs = this.number(cells, this.iGs);
		const dtg = this.number(cells, this.iDtg);
		const alt = this.number(cells, this.iAlt);
		const lat = this.number(cells, this.iLat);
		const lon = this.number(cells, this.iLon);
		const seqRaw = this.number(cells, this.iSeq);
		const bad: MappedField | null =
			flow !== flow ? 'flow' : gs !== gs ? 'gs' : dtg !== dtg ? 'dtg' : alt !== alt ? 'alt' : lat !== lat ? 'lat' : lon !== lon ? 'lon' : seqRaw !== seqRaw ? 'seq' : null;
		if (bad) {
			const cell = cells[c.index[bad]];
			const hint = !c.decimalComma && /^-?\d+,\d+$/.test(cell.trim()) ? ' (a decimal comma? choose the decimal comma in the mapping)' : '';
			return this.problem(line, bad, cell, `Malformed ${FIELD_LABELS[bad]}: not a number${hint}.`);
		}
		let wpt: string | null = null;
		if (this.iWpt >= 0) {
			const w = cells[this.iWpt].trim();
			wpt = w === '' ? null : w;
		}
		let seq: number | null = null;
		if (this.iSeq >= 0) {
			if (seqRaw === null) return this.problem(line, 'seq', '', 'The sequence number is missing.');
			seq = seqRaw;
		}

		const row: RecorderRow = {
			line,
			seq,
			tMs,
			flow: flow === null ? null : flow * c.flowFactor,
			gs: gs === null ? null : gs * c.gsFactor,
			dtg: dtg === null ? null : dtg * c.dtgFactor,
			alt: alt === null ? null : alt * c.altFactor,
			wpt,
			lat,
			lon
		};
		if (!withinLimits(row)) {
			const checked = recorderRowSchema.safeParse(row);
			if (!checked.success) return this.explain(row, cells, checked.error);
		}

		if (tMs <= this.prevT) {
			const when = this.prevLine > 0 ? `line ${this.prevLine}` : 'the samples already stored';
			const message =
				tMs === this.prevT
					? `The time ${formatTimeMs(tMs)} repeats the previous sample's (${when}).`
					: `The time goes backwards: ${formatTimeMs(tMs)} is ${round((this.prevT - tMs) / 1000, 3)} s before the previous sample (${when}, ${formatTimeMs(this.prevT)}).`;
			this.prevT = tMs;
			this.prevLine = line;
			return this.problem(line, 'time', tCell, message);
		}
		this.prevT = tMs;
		this.prevLine = line;
		if (seq !== null) {
			if (seq <= this.prevSeq) {
				const message = `The sequence number ${seq} is not above the previous sample's (${this.prevSeq}).`;
				this.prevSeq = seq;
				return this.problem(line, 'seq', cells[this.iSeq], message);
			}
			this.prevSeq = seq;
		}
		return { row };
	}

	/** Turns the row schema's complaint into a message in the file's own units. */
	private explain(row: RecorderRow, cells: readonly string[], error: z.ZodError): RowResult {
		const issue = error.issues[0];
		const key = issue.path[0] as keyof RecorderRow;
		const field: MappedField = key === 'tMs' ? 'time' : (key as MappedField);
		const cell = c(this.c, cells, field);
		const unit = UNIT_LABEL(this.mapping, field);
		const label = FIELD_LABELS[field] ?? String(key);
		const value = row[key];
		let message: string;
		if (field === 'time') {
			message = `The time ${formatTimeMs(row.tMs)} is outside 2000–2099: check the time format (seconds or milliseconds?).`;
		} else if (field === 'seq') {
			message = 'The sequence number must be a whole number from 0 to 2147483647.';
		} else if (field === 'wpt') {
			message = `The waypoint is longer than ${MAX_WPT_LENGTH} characters.`;
		} else if (typeof value === 'number' && value < 0 && field !== 'alt' && field !== 'lat' && field !== 'lon') {
			message = `Negative ${label}: ${cell} ${unit}.`;
		} else {
			const limits: Partial<Record<MappedField, string>> = {
				flow: `${MAX_FLOW_LPH} L/h, more than a piston single burns`,
				gs: `${MAX_GS_KT} kt`,
				dtg: `${MAX_DTG_NM} NM`,
				alt: `${MIN_ALT_FT} to ${MAX_ALT_FT} ft`,
				lat: '-90 to 90°',
				lon: '-180 to 180°'
			};
			const converted = typeof value === 'number' && (field === 'flow' || field === 'gs' || field === 'dtg' || field === 'alt') && unit !== canonicalUnit(field) ? ` (${round(value)} ${canonicalUnit(field)})` : '';
			message = `Implausible ${label}: ${cell} ${unit}${converted}; the limit is ${limits[field]}.`;
		}
		return this.problem(row.line, field, cell, message);
	}
}

function c(compiled: Compiled, cells: readonly string[], field: MappedField): string {
	const i = compiled.index[field];
	return i >= 0 ? cells[i] : '';
}

function canonicalUnit(field: 'flow' | 'gs' | 'dtg' | 'alt'): string {
	return { flow: 'L/h', gs: 'kt', dtg: 'NM', alt: 'ft' }[field];
}
