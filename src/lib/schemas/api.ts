// The versioned API's own query strings and answers, in zod: the endpoints parse their queries
// with these, the integration tests check each answer against them, and the OpenAPI document
// (lib/server/api/openapi.ts) is generated from them, so the three cannot drift apart.
import { z } from 'zod';
import { fuelTypes, fuelUnits } from '$lib/units';

export { problemSchema } from '$lib/wire/problem';

/** Rows per page of a list: `limit` between 1 and this; 50 when not given. */
export const API_LIST_MAX = 200;
export const API_LIST_DEFAULT = 50;

const limit = z.coerce
	.number('limit must be a whole number.')
	.int('limit must be a whole number.')
	.min(1, `limit must be between 1 and ${API_LIST_MAX}.`)
	.max(API_LIST_MAX, `limit must be between 1 and ${API_LIST_MAX}.`)
	.default(API_LIST_DEFAULT)
	.describe(`Rows per page, 1 to ${API_LIST_MAX}.`);
const cursor = z.string().max(500, 'cursor is not one this API gave.').optional().describe('The `next` cursor of the previous page, as it was given.');
const org = z.string().min(1).max(100).optional().describe("An organisation's slug: only its rows.");
const isoDay = (what: string) => z.iso.date(`${what} must be a date like 2026-05-14.`).optional();

export const aircraftListQuerySchema = z.object({
	org,
	archived: z.enum(['exclude', 'include', 'only'], 'archived must be exclude, include or only.').default('exclude').describe('Archived aircraft: left out (default), included, or only those.'),
	limit,
	cursor
});
export type AircraftListQuery = z.output<typeof aircraftListQuerySchema>;

export const flightListApiQuerySchema = z.object({
	org,
	aircraft: z.uuid('aircraft must be an aircraft id.').optional().describe("An aircraft's id: only its flights."),
	pilot: z.string().min(1).max(200).optional().describe("A pilot's user id: only the flights they flew."),
	from: isoDay('from').describe('Only flights whose engine start is on or after this UTC day.'),
	to: isoDay('to').describe('Only flights whose engine start is on or before this UTC day.'),
	limit,
	cursor
});
export type FlightListApiQuery = z.output<typeof flightListApiQuerySchema>;

const next = z.string().nullable().describe('The URL of the next page (also sent as a Link header, rel="next"); null on the last page.');

export const aircraftItemSchema = z.object({
	id: z.uuid(),
	org: z.string().describe("The organisation's slug."),
	registration: z.string(),
	type: z.string(),
	fuelType: z.enum(fuelTypes),
	displayUnit: z.enum(fuelUnits).describe('The unit its pages show fuel in.'),
	usableCapacityL: z.number().describe('Usable fuel capacity, litres.'),
	archived: z.boolean(),
	url: z.string().describe("The aircraft's page.")
});
export const aircraftPageSchema = z.object({ items: z.array(aircraftItemSchema), next });

export const flightItemSchema = z.object({
	id: z.uuid(),
	org: z.string().describe("The organisation's slug."),
	aircraftId: z.uuid(),
	registration: z.string(),
	title: z.string(),
	status: z.enum(['open', 'closed']).describe('open: a live flight still recording.'),
	source: z.enum(['upload', 'live']),
	startedAt: z.iso.datetime().describe('Engine start, UTC.'),
	endedAt: z.iso.datetime().nullable(),
	pilotId: z.string().nullable(),
	pilot: z.string().nullable().describe("The pilot's name."),
	sampleCount: z.number().int(),
	fuelUsedL: z.number().nullable().describe('Fuel used, litres (closed flights).'),
	url: z.string().describe("The flight's page."),
	samples: z.string().describe('Its samples (GET).'),
	export: z.string().describe('Its export (GET).')
});
export const flightPageSchema = z.object({ items: z.array(flightItemSchema), next });

