// The owner's fuel history of an aircraft: stored per-flight and per-phase figures read through
// the history module and its page, the baseline learned from the aircraft's own flights, the
// high-burn finder marking a flight flown full rich, and who may see and change what.
import { beforeAll, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { isHttpError } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, aircraftBurnSettings, flights, flightUnusualMarks, memberships, organisations, users } from '$lib/server/db/schema';
import { aircraftHistory } from '$lib/server/aircraft/history';
import { recomputeSummary } from '$lib/server/flights/summary';
import { historyQuerySchema } from '$lib/schemas/history';
import { load, actions } from '../../src/routes/o/[org]/aircraft/[id]/history/+page.server';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const person = (key: string, name: string) => ({ id: `ah-${key}-${stamp}`, email: `${key}-${stamp}@history.example`, name, prefFuelUnit: null, timeZone: null });
const U = { admin: person('admin', 'Ada Admin'), pilot: person('pilot', 'Pia Pilot'), other: person('other', 'Otto Other'), viewer: person('viewer', 'Vic Viewer') };
type TestUser = (typeof U)[keyof typeof U];

let orgId = '';
let slug = '';
let aircraftId = '';
let rich = '';
const usual: string[] = [];
const CRUISE_S = 5400;
const RICH_FACTOR = 1.25;

function event(user: TestUser, search = '', fields?: Record<string, string>, action?: string) {
	const url = new URL(`http://127.0.0.1:4173/o/${slug}/aircraft/${aircraftId}/history${action ? `?/${action}` : search}`);
	let request = new Request(url);
	if (fields) {
		const body = new FormData();
		for (const [k, v] of Object.entries(fields)) body.set(k, v);
		request = new Request(url, { method: 'POST', body });
	}
	return { locals: { user, session: null, authVia: 'session' }, params: { org: slug, id: aircraftId }, url, route: { id: '/o/[org]/aircraft/[id]/history' }, request } as unknown as RequestEvent;
}
const viewerOf = (user: TestUser, role: 'admin' | 'pilot' | 'viewer') => ({ orgId, userId: user.id, role });

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'History Flying Group', slug: `history-${stamp}` }).returning();
	orgId = org.id;
	slug = org.slug;
	await db.insert(memberships).values([
		{ orgId, userId: U.admin.id, role: 'admin' },
		{ orgId, userId: U.pilot.id, role: 'pilot' },
		{ orgId, userId: U.other.id, role: 'pilot' },
		{ orgId, userId: U.viewer.id, role: 'viewer' }
	]);
	const [a] = await db
		.insert(aircraft)
		.values({ orgId, registration: 'AH-ONE', type: 'Four-seat trainer', fuelType: 'avgas', densityKgPerL: 0.719, capacityL: 150, lowerLevelL: 100, displayUnit: 'l', reserveRule: 'faa-91.151-vfr-day' })
		.returning();
	aircraftId = a.id;
	// Five usual flights on five days, then one flown full rich: the same profile with the cruise
	// flow 25 % higher (the fixture's cruise follows 300 s of taxi and 600 s of climb).
	for (let d = 0; d < 5; d++) {
		const s = generateFlight({ start: Date.UTC(2025, 5, 1 + d, 9) / 1000, cruiseS: CRUISE_S });
		usual.push(await insertFlight(pool, { orgId, aircraftId, pilotId: d % 2 ? U.other.id : U.pilot.id, declaration: { kind: 'full' }, title: `usual ${d}` }, s));
	}
	const s = generateFlight({ start: Date.UTC(2025, 5, 10, 9) / 1000, cruiseS: CRUISE_S });
	for (let i = 900; i < 900 + CRUISE_S; i++) s.flow[i] *= RICH_FACTOR;
	rich = await insertFlight(pool, { orgId, aircraftId, pilotId: U.pilot.id, declaration: { kind: 'full' }, title: 'never leaned' }, s);
	await db.transaction(async (tx) => {
		for (const id of [...usual, rich]) await recomputeSummary(id, tx);
	});
});

describe('aircraft fuel history', () => {
	it('lists every closed flight newest first with its stored figures, and learns the baseline', async () => {
		const h = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({}));
		expect(h.total).toBe(6);
		expect(h.rows.map((r) => r.id)).toEqual([rich, ...usual.slice().reverse()]);
		const first = h.rows[1];
		// Fuel per engine hour is fuel used ÷ engine time (definition of an average flow).
		expect(first.fuelPerEngineHourLph).toBeCloseTo(first.fuelUsedL / (first.engineTimeS / 3600), 9);
		// The fixture's cruise is 30.5 L/h: the learned centre is the median of six flights, five at 30.5.
		expect(h.baseline.phases.cruise?.centreLph).toBeCloseTo(30.5, 0);
		expect(h.baseline.phases.cruise?.flights).toBe(6);
		expect(h.trend).toHaveLength(6);
		// The reserve column is the flight's stored verdict, the very one the replay and the flights list read.
		const [stored] = await db.select({ summary: flights.summary }).from(flights).where(eq(flights.id, first.id));
		expect(first.reserveVerdict).not.toBeNull();
		expect(first.reserveVerdict).toEqual((stored.summary as { verdict: unknown }).verdict);
		expect(['kept', 'notKept', 'noReserve']).toContain(first.reserveVerdict!.state);
	});

	it('marks the rich flight, quantifies its extra cruise fuel and names the mixture', async () => {
		const h = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({}));
		const r = h.rows.find((x) => x.id === rich)!;
		expect(r.highBurn.marked).toBe(true);
		const cruise = r.highBurn.phases.find((c) => c.phase === 'cruise')!;
		expect(cruise.marked).toBe(true);
		// 25 % over 30.5 L/h is 7.6 L/h; over the cruise time that is the extra fuel (flow × time).
		expect(cruise.overPercent).toBeGreaterThan(20);
		expect(cruise.extraL).toBeCloseTo(cruise.overLph * (cruise.timeS / 3600), 9);
		expect(cruise.extraL).toBeGreaterThan(0.2 * 30.5 * (CRUISE_S / 3600) * 0.9);
		expect(r.highBurn.causes).toContain('mixtureNotLeaned');
		for (const u of h.rows.filter((x) => x.id !== rich)) expect(u.highBurn.marked, u.title).toBe(false);
	});

	it('sorts by a phase flow, filters by pilot and date', async () => {
		const byCruise = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({ sort: 'cruise' }));
		expect(byCruise.rows[0].id).toBe(rich);
		const other = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({ pilot: U.other.id }));
		expect(other.rows.map((r) => r.pilotId)).toEqual([U.other.id, U.other.id]);
		const days = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({ from: '2025-06-02', to: '2025-06-03' }));
		expect(days.total).toBe(2);
		// A pilot sees only their own flights of the aircraft.
		const own = await aircraftHistory(viewerOf(U.pilot, 'pilot'), aircraftId, historyQuerySchema.parse({}));
		expect(own.rows.every((r) => r.pilotId === U.pilot.id)).toBe(true);
		expect(own.total).toBe(4);
	});

	it('leaves a flight marked unusual out of the baseline, and the owner may set the threshold by hand', async () => {
		expect(await actions.unusual(event(U.admin, '', { flightId: rich, on: '1', reason: 'ferry, rich on purpose' }, 'unusual') as never)).toMatchObject({ saved: true });
		const h = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({}));
		expect(h.baseline.flightsLeftOut).toBe(1);
		expect(h.baseline.phases.cruise?.flights).toBe(5);
		expect(h.rows[0].unusual).toEqual({ reason: 'ferry, rich on purpose' });

		expect(await actions.settings(event(U.admin, '', { threshold: '30', taxi: '', climb: '', cruise: '', descent: '' }, 'settings') as never)).toMatchObject({ saved: true });
		const strict = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({}));
		expect(strict.settings).toMatchObject({ thresholdPercent: 30, thresholdIsDefault: false });
		expect(strict.rows.find((r) => r.id === rich)!.highBurn.marked).toBe(false);
		// A usual cruise flow set by hand replaces the learned one.
		await actions.settings(event(U.admin, '', { threshold: '', taxi: '', climb: '', cruise: '25', descent: '' }, 'settings') as never);
		const manual = await aircraftHistory(viewerOf(U.admin, 'admin'), aircraftId, historyQuerySchema.parse({}));
		expect(manual.baseline.phases.cruise).toMatchObject({ source: 'manual', centreLph: 25, flights: 0 });
		expect(manual.settings.thresholdIsDefault).toBe(true);
	});

	it('answers bad settings with a 400 naming the field and stores nothing', async () => {
		const before = await db.select().from(aircraftBurnSettings).where(eq(aircraftBurnSettings.aircraftId, aircraftId));
		const bad = (await actions.settings(event(U.admin, '', { threshold: 'lots', cruise: '-3' }, 'settings') as never)) as { status: number; data: { errors: Record<string, string> } };
		expect(bad.status).toBe(400);
		expect(Object.keys(bad.data.errors).sort()).toEqual(['cruise', 'threshold']);
		expect(await db.select().from(aircraftBurnSettings).where(eq(aircraftBurnSettings.aircraftId, aircraftId))).toEqual(before);
		const foreign = (await actions.unusual(event(U.admin, '', { flightId: '00000000-0000-4000-8000-000000000000', on: '1' }, 'unusual') as never)) as { status: number };
		expect(foreign.status).toBe(400);
	});

	it('lets the maintenance viewer read the history and change nothing', async () => {
		const page = (await load(event(U.viewer) as never)) as { history: { total: number } };
		expect(page.history.total).toBe(6);
		for (const [name, fields] of [
			['unusual', { flightId: rich, on: '0' }],
			['settings', { threshold: '5' }]
		] as const) {
			const attempt = (actions[name] as (e: unknown) => Promise<unknown>)(event(U.viewer, '', fields, name));
			await expect(attempt).rejects.toSatisfy((e: unknown) => isHttpError(e) && e.status === 403);
		}
		const marks = await db.select().from(flightUnusualMarks).where(eq(flightUnusualMarks.flightId, rich));
		expect(marks).toHaveLength(1);
	});
});
