// Reading one live batch, JSON or CSV lines of our recorder format, into canonical samples, or the
// list of what is wrong and where. A batch is judged whole: one bad sample refuses all of it.
// Per-sample limits come from the upload side's row validator ($lib/csv), so both paths agree.
import Papa from 'papaparse';
import { z } from 'zod';
import {
	burndownMapping,
	createRowReader,
	formatTimeMs,
	MAX_SEQ,
	MAX_TIME_MS,
	MIN_TIME_MS,
	parseIsoTime,
	recorderRowSchema,
	type RecorderRow
} from '$lib/csv';
import { plainText, textProblem } from '$lib/schemas/text';
import { MAX_AMOUNT, amountField, declarationSchema, fuelUnitSchema } from '$lib/schemas/declaration';
import {
	distanceUnits,
	flowUnits,
	knotsPerUnit,
	litresPerUnit,
	flowUnitVolume,
	nauticalMilesPerUnit,
	speedUnits,
	METRES_PER_FOOT,
	type FlowUnit
} from '$lib/units';
import { MAX_BATCH_SAMPLES } from './config';

/** A sample in canonical units (L/h, kt, NM, ft, epoch ms); null = not recorded. */
export type LiveSample = Omit<RecorderRow, 'line'> & { seq: number };

/** What is wrong and where: the sample's index in the batch (0-based), its line for CSV. */
export interface BatchProblem {
	index: number | null;
	line?: number;
	seq?: number | null;
	field: string;
	value?: string;
	message: string;
}

export interface Batch {
	flightId: string | null;
	/** Used only when this batch opens a flight: the sequence number it starts at. Default 0. */
	firstSeq: number;
	samples: LiveSample[];
}

export type BatchResult = { ok: true; batch: Batch } | { ok: false; problems: BatchProblem[] };

const MAX_LISTED = 50;

const n = z.number().nullable().optional();
const jsonSampleSchema = z.object({
	seq: z.number('seq must be a whole number.').int('seq must be a whole number.').min(0).max(MAX_SEQ),
	/** ISO 8601 with Z or an offset, or epoch seconds (fractions allowed). */
	t: z.union([z.string(), z.number()], 't must be an ISO 8601 time with Z or an offset, or epoch seconds.'),
	flow: n,
	gs: n,
	dtg: n,
	alt: n,
	// A waypoint name is shown and stored: the same rule as every other name.
	wpt: z
		.string()
		.nullable()
		.optional()
		.superRefine((v, ctx) => {
			const problem = v ? textProblem(v) : null;
			if (problem) ctx.addIssue({ code: 'custom', message: problem });
		}),
	lat: n,
	lon: n
});

export const jsonBatchSchema = z.object({
	flightId: z.uuid('flightId must be the id an earlier answer gave.').optional(),
	firstSeq: z.number().int().min(0).max(MAX_SEQ).optional(),
	units: z
		.object({
			flow: z.enum(flowUnits).default('l/h'),
			speed: z.enum(speedUnits).default('kt'),
			distance: z.enum(distanceUnits).default('nm'),
			altitude: z.enum(['ft', 'm']).default('ft')
		})
		.optional(),
	samples: z.array(z.unknown()).min(1, 'samples must hold at least one sample.').max(MAX_BATCH_SAMPLES, `A batch holds at most ${MAX_BATCH_SAMPLES} samples; split it.`)
});

/**
 * The declaration in an open request: the shared one ($lib/schemas/declaration) with a JSON
 * number for the amount, in the unit given or the aircraft's display unit, and messages that name
 * the JSON path.
 */
const declarationJsonSchema = declarationSchema(
	{ amount: amountField('number', undefined, MAX_AMOUNT), unit: fuelUnitSchema().optional() },
	{ kind: 'declaration.kind must be unchanged, onBoard, full, lower, added or removed.', missingAmount: (kind) => `declaration.amount is needed for ${kind}.` }
);

/** The body of POST /api/v1/live/open. */
export const openSchema = z.object({
	declaration: declarationJsonSchema.optional(),
	firstSeq: z.number().int().min(0).max(MAX_SEQ).optional(),
	title: plainText(200).optional(),
	/** E-mail of the member flying, so the flight is theirs. */
	pilot: z.email('pilot must be the e-mail address of a member.').optional()
});
export type OpenRequest = z.output<typeof openSchema>;

export const closeSchema = z.object({ flightId: z.uuid('flightId must be the id an earlier answer gave.').optional() });

const path = (p: PropertyKey[]) => p.map((k) => (typeof k === 'number' ? `[${k}]` : `.${String(k)}`)).join('').replace(/^\./, '');

function zodProblems(error: z.ZodError, index: number | null, seq?: number | null, prefix = ''): BatchProblem[] {
	return error.issues.map((i) => ({ index, seq, field: prefix + path(i.path), message: i.message }));
}

/** Within a batch: consecutive sequence numbers and time moving forward. */
function checkOrder(samples: LiveSample[], where: (i: number) => Pick<BatchProblem, 'index' | 'line'>): BatchProblem[] {
	const problems: BatchProblem[] = [];
	for (let i = 1; i < samples.length && problems.length < MAX_LISTED; i++) {
		const a = samples[i - 1];
		const b = samples[i];
		if (b.seq !== a.seq + 1)
			problems.push({
				...where(i),
				seq: b.seq,
				field: 'seq',
				value: String(b.seq),
				message: `seq ${b.seq} follows ${a.seq}: sequence numbers in a batch must be consecutive (one per sample, no gaps, in order).`
			});
		else if (b.tMs <= a.tMs)
			problems.push({
				...where(i),
				seq: b.seq,
				field: 't',
				value: formatTimeMs(b.tMs),
				message: b.tMs === a.tMs ? `The time ${formatTimeMs(b.tMs)} repeats the previous sample's.` : `The time goes backwards: ${formatTimeMs(b.tMs)} is before the previous sample's ${formatTimeMs(a.tMs)}.`
			});
	}
	return problems;
}

const CANONICAL_UNITS: Record<string, string> = { flow: 'L/h', gs: 'kt', dtg: 'NM', alt: 'ft', lat: '°', lon: '°' };

/** "flow 612 L/h is above the limit of 500 L/h", in canonical units (after the batch's units). */
function limitMessage(field: string, issue: z.core.$ZodIssue, row: Record<string, unknown>): string {
	const unit = CANONICAL_UNITS[field] ?? '';
	const value = row[field];
	const shown = typeof value === 'number' ? `${Math.round(value * 100) / 100}${unit ? ` ${unit}` : ''}` : String(value);
	if (typeof value === 'string' && issue.code === 'too_big' && 'maximum' in issue) return `${field} is longer than ${String(issue.maximum)} characters.`;
	if (issue.code === 'too_big' && 'maximum' in issue) return `${field} ${shown} is above the limit of ${String(issue.maximum)}${unit ? ` ${unit}` : ''}.`;
	if (issue.code === 'too_small' && 'minimum' in issue)
		return Number(issue.minimum) === 0 ? `${field} is negative (${shown}).` : `${field} ${shown} is below the limit of ${String(issue.minimum)}${unit ? ` ${unit}` : ''}.`;
	return `${field}: ${issue.message}`;
}

const FLOW_LIMIT_FIELDS: Record<string, string> = { flow: 'flow', gs: 'gs', dtg: 'dtg', alt: 'alt', lat: 'lat', lon: 'lon', wpt: 'wpt', tMs: 't', seq: 'seq' };

/** A JSON batch: { flightId?, firstSeq?, units?, samples: [{ seq, t, flow, gs, dtg, alt?, wpt?, lat?, lon? }] }. */
export function readJsonBatch(body: unknown, densityKgPerL: number): BatchResult {
	const top = jsonBatchSchema.safeParse(body);
	if (!top.success) return { ok: false, problems: zodProblems(top.error, null) };
	const units = top.data.units ?? { flow: 'l/h' as FlowUnit, speed: 'kt' as const, distance: 'nm' as const, altitude: 'ft' as const };
	const isMass = units.flow === 'lb/h' || units.flow === 'kg/h';
	const flowFactor = litresPerUnit(flowUnitVolume(units.flow), isMass ? densityKgPerL : undefined);
	const gsFactor = knotsPerUnit(units.speed);
	const dtgFactor = nauticalMilesPerUnit(units.distance);
	const altFactor = units.altitude === 'm' ? 1 / METRES_PER_FOOT : 1;

	const problems: BatchProblem[] = [];
	const samples: LiveSample[] = [];
	const raw = top.data.samples;
	for (let i = 0; i < raw.length && problems.length < MAX_LISTED; i++) {
		const s = jsonSampleSchema.safeParse(raw[i]);
		if (!s.success) {
			problems.push(...zodProblems(s.error, i, undefined, `samples[${i}].`));
			continue;
		}
		const v = s.data;
		const tMs = typeof v.t === 'number' ? Math.round(v.t * 1000) : parseIsoTime(v.t);
		if (!Number.isFinite(tMs)) {
			problems.push({ index: i, seq: v.seq, field: `samples[${i}].t`, value: String(v.t), message: 'Malformed time: use ISO 8601 with Z or an offset (2026-05-02T09:14:05Z), or epoch seconds.' });
			continue;
		}
		const scale = (x: number | null | undefined, f: number) => (x === null || x === undefined ? null : x * f);
		const row = {
			line: i + 1,
			seq: v.seq,
			tMs,
			flow: scale(v.flow, flowFactor),
			gs: scale(v.gs, gsFactor),
			dtg: scale(v.dtg, dtgFactor),
			alt: scale(v.alt, altFactor),
			wpt: v.wpt === undefined || v.wpt === null || v.wpt.trim() === '' ? null : v.wpt.trim(),
			lat: v.lat ?? null,
			lon: v.lon ?? null
		};
		const checked = recorderRowSchema.safeParse(row);
		if (!checked.success) {
			for (const issue of checked.error.issues) {
				const key = String(issue.path[0]);
				const field = FLOW_LIMIT_FIELDS[key] ?? key;
				const value = key === 'tMs' ? String(v.t) : String((v as Record<string, unknown>)[field]);
				const message = key === 'tMs' ? `The time ${formatTimeMs(tMs)} is outside ${new Date(MIN_TIME_MS).getUTCFullYear()}–${new Date(MAX_TIME_MS).getUTCFullYear() - 1}: seconds sent as milliseconds, or the reverse?` : limitMessage(field, issue, row);
				problems.push({ index: i, seq: v.seq, field: `samples[${i}].${field}`, value, message });
			}
			continue;
		}
		const { line: _line, ...sample } = checked.data;
		samples.push({ ...sample, seq: v.seq });
	}
	if (problems.length === 0) problems.push(...checkOrder(samples, (i) => ({ index: i })).map((p) => ({ ...p, field: `samples[${p.index}].${p.field}` })));
	if (problems.length > 0) return { ok: false, problems };
	return { ok: true, batch: { flightId: top.data.flightId ?? null, firstSeq: top.data.firstSeq ?? 0, samples } };
}

/**
 * A CSV batch: a header line of our recorder format (with its seq column) and sample lines.
 * Line numbers in problems count from the header as line 1.
 */
export function readCsvBatch(text: string, options: { flightId: string | null; firstSeq: number; densityKgPerL: number }): BatchResult {
	const clean = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
	// PostgreSQL text holds no NUL byte; a cell with one would fail as a server error.
	const nul = clean.indexOf('\u0000');
	if (nul !== -1) {
		const before = clean.slice(0, nul);
		const line = before.split('\n').length;
		const column = nul - before.lastIndexOf('\n');
		return { ok: false, problems: [{ index: null, line, field: 'body', message: `A NUL byte (U+0000) at line ${line}, character ${column}: recorder lines are text.` }] };
	}
	const parsed = Papa.parse<string[]>(clean.replace(/\r?\n$/, ''), { delimiter: ',', newline: clean.includes('\r\n') ? '\r\n' : '\n', quoteChar: '"' });
	const rows = parsed.data;
	const headerIndex = rows.findIndex((r) => r.some((c) => c.trim() !== ''));
	if (headerIndex < 0) return { ok: false, problems: [{ index: null, line: 1, field: 'header', message: 'The batch is empty: send a header line and at least one sample line.' }] };
	const headers = rows[headerIndex].map((h) => h.trim());
	const headerLine = headerIndex + 1;
	const found = burndownMapping(headers);
	if (!('mapping' in found)) return { ok: false, problems: [{ index: null, line: headerLine, field: 'header', value: headers.join(','), message: found.message }] };
	if (!found.mapping.seq) return { ok: false, problems: [{ index: null, line: headerLine, field: 'header', value: headers.join(','), message: 'Live CSV batches need the seq column: the recorder\'s sequence number of each sample.' }] };
	const built = createRowReader(found.mapping, headers, headerLine, { densityKgPerL: options.densityKgPerL });
	if ('problems' in built) return { ok: false, problems: built.problems.map((p) => ({ index: null, line: p.line, field: p.column || 'header', value: p.value, message: p.message })) };
	const problems: BatchProblem[] = [];
	const samples: LiveSample[] = [];
	const lines: number[] = [];
	for (let r = headerIndex + 1; r < rows.length && problems.length < MAX_LISTED; r++) {
		const line = r + 1;
		const result = built.reader.read(rows[r], line);
		if (result === null) continue;
		if ('problem' in result) {
			const p = result.problem;
			problems.push({ index: samples.length, line: p.line, field: p.column, value: p.value, message: p.message });
			continue;
		}
		const { line: _l, ...row } = result.row;
		samples.push({ ...row, seq: row.seq as number });
		lines.push(line);
	}
	if (problems.length === 0 && samples.length === 0) problems.push({ index: null, line: headerLine, field: 'header', message: 'The batch has a header but no samples.' });
	if (problems.length === 0 && samples.length > MAX_BATCH_SAMPLES)
		problems.push({ index: null, field: 'samples', message: `A batch holds at most ${MAX_BATCH_SAMPLES} samples (this one has ${samples.length}); split it.` });
	if (problems.length === 0) problems.push(...checkOrder(samples, (i) => ({ index: i, line: lines[i] })));
	if (problems.length > 0) return { ok: false, problems };
	return { ok: true, batch: { flightId: options.flightId, firstSeq: options.firstSeq, samples } };
}
