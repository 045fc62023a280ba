// Forms on a flight: the start-of-flight declaration, fuel events on the timeline, and notes.
// Amounts are typed in a chosen fuel unit and come out in litres; times are UTC. The replay page
// runs the same schemas in the browser to preview a change before it is saved. The declaration
// itself is the shared one ($lib/schemas/declaration), in the form's words.
import { z } from 'zod';
import type { Declaration, FuelEventKind } from '$lib/fuel';
import { REASON_MAX } from '$lib/corrections';
import { FUEL_EVENT_KINDS, verdictStates } from '$lib/fuel';
import { toLitres, type FuelUnit } from '$lib/units';
import { plainText } from './text';
import { MAX_AMOUNT, amountField, declarationKindOf, declarationSchema, fuelUnitSchema, toDeclaration } from './declaration';

const unitSchema = fuelUnitSchema('Choose a unit.');

/** A number typed in a form: a decimal comma is accepted; blank is null. */
const amountText = (what: string) => amountField('text', { notANumber: `Enter ${what} as a number.`, outOfRange: `Enter ${what} between 0 and ${MAX_AMOUNT}.` }, MAX_AMOUNT);

const UTC_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(?:Z|\+00:00)?$/;

/** '2025-05-14T10:32', '2025-05-14 10:32:05' or '…Z': always read as UTC. */
export function parseUtc(text: string): Date | null {
	const m = UTC_TIME.exec(text.trim());
	if (!m) return null;
	const [, y, mo, d, h, mi, s = '0', ms = '0'] = m;
	const date = new Date(Date.UTC(+y, +mo - 1, +d, +h, +mi, +s, +ms.padEnd(3, '0')));
	// Date.UTC rolls 31 April over to 1 May; a real date survives the round trip.
	if (date.getUTCMonth() !== +mo - 1 || date.getUTCDate() !== +d || +h > 23 || +mi > 59 || +s > 59) return null;
	return date;
}

/** An instant as a form field shows it: UTC, to the second, "2025-05-14 10:32:05". */
export function utcFieldValue(epochSeconds: number): string {
	return new Date(Math.round(epochSeconds) * 1000).toISOString().slice(0, 19).replace('T', ' ');
}

const utcText = (what: string) =>
	z.string('Enter the time.').transform((raw, ctx) => {
		const date = parseUtc(raw);
		if (!date) {
			ctx.addIssue({ code: 'custom', message: `Enter ${what} as a UTC date and time, e.g. 2025-05-14T10:32:00.` });
			return z.NEVER;
		}
		return date;
	});

/** The form fields' values for a stored declaration (amounts in `unit`). */
export function declarationFormValues(
	d: Declaration,
	previousOnBoardL: number | null,
	unit: FuelUnit,
	densityKgPerL: number
): Record<string, string> {
	const show = (litres: number | null) => (litres === null ? '' : String(Math.round((litres / toLitres(1, unit, densityKgPerL)) * 100) / 100));
	const kind = declarationKindOf(d);
	const amount = 'amountL' in d && kind !== 'unchanged' ? show(d.amountL) : '';
	return { kind, amount, unit, previous: show(previousOnBoardL) };
}

export const declarationFormSchema = (densityKgPerL: number) =>
	declarationSchema(
		{ amount: amountText('the amount'), unit: unitSchema },
		{
			kind: 'Choose what was done with the fuel before engine start.',
			missingAmount: (kind) => (kind === 'onBoard' ? 'Enter the amount on board.' : `Enter the amount ${kind}.`)
		},
		{ previous: amountText('the fuel on board before') }
	).transform((v): { declaration: Declaration; previousOnBoardL: number | null } => ({
		declaration: toDeclaration(v, { displayUnit: v.unit, densityKgPerL }),
		previousOnBoardL: v.previous === null ? null : toLitres(v.previous, v.unit, densityKgPerL)
	}));

export const fuelEventFormSchema = (densityKgPerL: number) =>
	z
		.object({
			kind: z.enum(FUEL_EVENT_KINDS, 'Choose what happened.'),
			amount: amountText('the amount'),
			unit: unitSchema,
			at: utcText('when it happened'),
			note: plainText(200).default('')
		})
		.superRefine((v, ctx) => {
			if ((v.kind === 'added' || v.kind === 'removed') && v.amount === null)
				ctx.addIssue({ code: 'custom', path: ['amount'], message: `Enter the amount ${v.kind}.` });
		})
		.transform((v) => ({
			kind: v.kind,
			amountL: v.kind === 'added' || v.kind === 'removed' ? toLitres(v.amount ?? 0, v.unit, densityKgPerL) : null,
			t: v.at,
			note: v.note
		}));

export const idFormSchema = z.object({ id: z.uuid('That item is not on this flight.') });

/** The optional "why" beside a correction of the declaration or a fuel event (the audit trail). */
export const reasonFormSchema = z.object({
	reason: z.string().trim().max(REASON_MAX, `Use at most ${REASON_MAX} characters.`).default('')
});

export const noteFormSchema = z.object({
	body: plainText(2000, { required: 'Write the note.', multiline: true }),
	at: z
		.string()
		.optional()
		.transform((raw, ctx) => {
			if (!raw || raw.trim() === '') return null;
			const date = parseUtc(raw);
			if (!date) {
				ctx.addIssue({ code: 'custom', message: 'Enter the moment as a UTC date and time, or leave it blank.' });
				return z.NEVER;
			}
			return date;
		})
});

/** Editing a note: the same fields, and which note. */
export const noteEditFormSchema = noteFormSchema.extend({ id: z.uuid('That note is not on this flight.') });

export type DeclarationInput = z.output<ReturnType<typeof declarationFormSchema>>;
export type FuelEventInput = z.output<ReturnType<typeof fuelEventFormSchema>>;
export type NoteInput = z.output<typeof noteFormSchema>;

export const FLIGHT_SORTS = ['date', 'aircraft', 'pilot', 'block', 'used', 'flow', 'onboard', 'margin', 'alarms'] as const;
export type FlightSort = (typeof FLIGHT_SORTS)[number];
export const FLIGHTS_PER_PAGE = 25;

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;
export const day = z
	.string()
	.optional()
	.transform((raw) => (raw && ISO_DAY.test(raw) && !Number.isNaN(Date.parse(`${raw}T00:00:00Z`)) ? raw : null));

/**
 * The flights list's query string. A list is read with whatever a link carries, so anything
 * unusable falls back to the default instead of failing the page.
 */
export const flightListQuerySchema = z.object({
	aircraft: z.uuid().optional().catch(undefined),
	pilot: plainText(100, { required: 'pilot' }).optional().catch(undefined),
	from: day.catch(null),
	to: day.catch(null),
	/** The flight's reserve verdict (FlightSummary.verdict.state). */
	verdict: z.enum(verdictStates).optional().catch(undefined),
	sort: z.enum(FLIGHT_SORTS).default('date').catch('date'),
	dir: z.enum(['asc', 'desc']).optional().catch(undefined),
	page: z.coerce.number().int().min(1).max(100_000).default(1).catch(1)
});
export type FlightListQuery = z.output<typeof flightListQuerySchema>;

/** GET /api/v1/flights/[id]/export query: what to export, how often, in which fuel unit. */
export const exportQuerySchema = z.object({
	what: z.enum(['log', 'summary'], 'what must be log or summary.').default('log'),
	every: z.enum(['sample', 'minute'], 'every must be sample or minute.').default('sample'),
	unit: unitSchema.optional(),
	format: z.enum(['csv', 'json'], 'format must be csv or json.').default('csv'),
	/** Times as ISO 8601, or as "yyyy-mm-dd hh:mm:ss" (UTC) that spreadsheets read as date and time. */
	times: z.enum(['iso', 'spreadsheet'], 'times must be iso or spreadsheet.').default('iso').describe('iso: 2026-05-02T09:00:00.000Z; spreadsheet: 2026-05-02 09:00:00 (both UTC).'),
	/** Start the CSV with a UTF-8 byte-order mark, for spreadsheets that need it to read UTF-8. */
	bom: z.stringbool({ error: 'bom must be true or false.' }).default(false).describe('true: start the CSV with a UTF-8 byte-order mark.')
});

export const samplesQuerySchema = z.object({
	format: z.enum(['json', 'binary'], 'format must be json or binary.').default('json')
});

/** A member chosen in a select: a user id, or blank for nobody. */
const memberChoice = z
	.string()
	.trim()
	.max(200, 'Choose a member of this organisation.')
	.optional()
	.transform((v) => (v === undefined ? undefined : v === '' ? null : v));

/**
 * A flight's details: title, route as written, instructor and (for those who may set it) pilot.
 * An absent pilot field leaves the pilot as it is; a blank one clears it.
 */
export const flightDetailsFormSchema = z.object({
	title: plainText(200),
	route: plainText(200),
	pilotId: memberChoice,
	instructorId: memberChoice
});
export type FlightDetailsInput = z.output<typeof flightDetailsFormSchema>;

/** Choosing the pilot flying today on a recorder (blank: nobody assigned). */
export const flyingTodayFormSchema = z.object({
	id: z.uuid('That recorder is not in this organisation.'),
	pilotId: memberChoice
});
