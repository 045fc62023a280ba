// Stored figures are derived: after every write that changes a fuel input — the declaration or a
// fuel event from the replay page, the declaration from the live page, the aircraft's fuel profile,
// the meter factor, the reserve rule — each flight's stored summary and the aircraft's last known
// fuel on board must equal a fresh computation from the stored samples and inputs. And each change
// of the start fuel or a fuel event leaves its line in the flight's audit trail, readable by every
// member who may view the flight.
import { beforeAll, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { isHttpError } from '@sveltejs/kit';
import { asc, desc, eq } from 'drizzle-orm';
import type { CorrectionView, DeclarationSnapshot, EventSnapshot } from '$lib/wire/corrections';
import { db, pool } from '$lib/server/db';
import { aircraft, calibrations, flightFigures, flightPhaseFigures, flights, fuelCorrections, fuelEvents, memberships, organisations, users } from '$lib/server/db/schema';
import { loadFlight } from '$lib/server/flights/load';
import { computeLoaded, recomputeSummary } from '$lib/server/flights/summary';
import { aircraftFormValues } from '$lib/server/services/aircraft';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { load as replayLoad, actions as replayActions } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { actions as liveActions } from '../../src/routes/o/[org]/flights/[id]/live/+page.server';
import { actions as aircraftActions } from '../../src/routes/o/[org]/aircraft/[id]/+page.server';
import { actions as reconciliationActions } from '../../src/routes/o/[org]/aircraft/[id]/reconciliation/+page.server';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const person = (key: string, name: string) => ({ id: `df-${key}-${stamp}`, email: `${key}-${stamp}@derived.example`, name, prefFuelUnit: null, timeZone: null });
const U = { admin: person('admin', 'Ada Admin'), pilot: person('pilot', 'Pia Pilot'), viewer: person('viewer', 'Vic Viewer'), outsider: person('out', 'Olga Outsider') };
type TestUser = (typeof U)[keyof typeof U];

let slug = '';
let aircraftId = '';
let uploaded = '';
let live = '';
let otherAircraftFlight = '';
const first = generateFlight({ start: Date.UTC(2025, 4, 14, 9, 0, 0) / 1000, cruiseS: 1800 });
const second = generateFlight({ start: Date.UTC(2025, 4, 15, 9, 0, 0) / 1000, cruiseS: 1200 });

function formEvent(user: TestUser, route: string, params: Record<string, string>, path: string, fields: Record<string, string>) {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.set(k, v);
	const url = new URL(`http://127.0.0.1:4173${path}`);
	return {
		locals: { user, session: null, authVia: 'session' },
		params,
		url,
		route: { id: route },
		request: new Request(url, { method: 'POST', body })
	} as unknown as RequestEvent;
}

const onReplay = (action: keyof typeof replayActions, id: string, fields: Record<string, string>, user: TestUser = U.pilot) =>
	replayActions[action](formEvent(user, '/o/[org]/flights/[id]', { org: slug, id }, `/o/${slug}/flights/${id}?/${action}`, fields) as never) as Promise<unknown>;
const onLive = (action: keyof typeof liveActions, id: string, fields: Record<string, string>, user: TestUser = U.pilot) =>
	liveActions[action](formEvent(user, '/o/[org]/flights/[id]/live', { org: slug, id }, `/o/${slug}/flights/${id}/live?/${action}`, fields) as never) as Promise<unknown>;
const onReconciliation = (action: keyof typeof reconciliationActions, fields: Record<string, string>) =>
	reconciliationActions[action](
		formEvent(U.admin, '/o/[org]/aircraft/[id]/reconciliation', { org: slug, id: aircraftId }, `/o/${slug}/aircraft/${aircraftId}/reconciliation?/${action}`, fields) as never
	) as Promise<unknown>;
const onAircraft = (action: keyof typeof aircraftActions, fields: Record<string, string>) =>
	aircraftActions[action](formEvent(U.admin, '/o/[org]/aircraft/[id]', { org: slug, id: aircraftId }, `/o/${slug}/aircraft/${aircraftId}?/${action}`, fields) as never) as Promise<unknown>;

/** As jsonb carries them (NaN → null, -0 → 0). */
const plain = <T>(x: T): T => JSON.parse(JSON.stringify(x));

async function aircraftRow() {
	const [a] = await db.select().from(aircraft).where(eq(aircraft.id, aircraftId));
	return a;
}

/**
 * Every flight's stored summary against a fresh computation from its samples and stored inputs
 * (an open flight stores none: its figures are live), and the aircraft's last known fuel against
 * the latest closed flight's fuel at shutdown.
 */
async function expectDerived(what: string) {
	const rows = await db.select({ id: flights.id, status: flights.status, summary: flights.summary }).from(flights).orderBy(asc(flights.startedAt));
	for (const row of rows) {
		const loaded = await loadFlight(row.id);
		const fresh = row.status === 'closed' ? computeLoaded(loaded!).summary : null;
		expect(plain(row.summary), `${what}: stored summary of flight ${row.id}`).toEqual(plain(fresh));
		// The history's typed figures follow the same summary, phase by phase.
		const figures = await db.select().from(flightFigures).where(eq(flightFigures.flightId, row.id));
		const phases = await db.select().from(flightPhaseFigures).where(eq(flightPhaseFigures.flightId, row.id));
		if (!fresh) {
			expect(figures, `${what}: an open flight stores no history figures`).toEqual([]);
			expect(phases).toEqual([]);
			continue;
		}
		expect(figures, `${what}: history figures of flight ${row.id}`).toHaveLength(1);
		expect(figures[0].fuelUsedL).toBeCloseTo(fresh.fuelUsedL, 9);
		expect(figures[0].engineTimeS).toBeCloseTo(fresh.engineTimeS, 9);
		expect(figures[0].fuelPerEngineHourLph).toBeCloseTo(fresh.averageFlowLph!, 9);
		expect(figures[0].meterFactor).toBe(loaded!.input.profile.meterFactor);
		const byName = new Map(phases.map((p) => [p.phase, p]));
		expect(phases.length).toBe(fresh.phases.length);
		for (const p of fresh.phases) {
			expect(byName.get(p.name)?.fuelL, `${what}: ${p.name} fuel of flight ${row.id}`).toBeCloseTo(p.fuelL, 9);
			expect(byName.get(p.name)?.timeS).toBeCloseTo(p.timeS, 9);
		}
	}
	const [latest] = await db
		.select({ summary: flights.summary })
		.from(flights)
		.where(eq(flights.aircraftId, aircraftId))
		.orderBy(desc(flights.startedAt))
		.limit(1);
	const shutdown = (latest.summary as { onBoardAtShutdownL: number }).onBoardAtShutdownL;
	expect((await aircraftRow()).lastOnBoardL, `${what}: the aircraft's last known fuel on board`).toBeCloseTo(shutdown, 9);
}

const storedOnBoard = async (id: string) => {
	const [row] = await db.select({ summary: flights.summary }).from(flights).where(eq(flights.id, id));
	return (row.summary as { onBoardAtShutdownL: number }).onBoardAtShutdownL;
};

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'Derived Figures Flying Group', slug: `derived-${stamp}` }).returning();
	slug = org.slug;
	await db.insert(memberships).values([
		{ orgId: org.id, userId: U.admin.id, role: 'admin' },
		{ orgId: org.id, userId: U.pilot.id, role: 'pilot' },
		{ orgId: org.id, userId: U.viewer.id, role: 'viewer' }
	]);
	const plane = (registration: string) => ({
		orgId: org.id,
		registration,
		type: 'Four-seat trainer',
		fuelType: 'avgas' as const,
		densityKgPerL: 0.719,
		// 40 US gal usable; 1 US gal = 3.785411784 L (NIST Handbook 44, Appendix C).
		capacityL: 40 * LITRES_PER_US_GALLON,
		lowerLevelL: 28 * LITRES_PER_US_GALLON,
		displayUnit: 'usgal' as const,
		lowFuelL: 10 * LITRES_PER_US_GALLON,
		lowEnduranceMin: 45,
		reserveRule: 'faa-91.151-vfr-day' as const,
		baselineCruiseLph: 31,
		lastOnBoardL: 30 * LITRES_PER_US_GALLON
	});
	const [a] = await db.insert(aircraft).values(plane('DF-ONE')).returning();
	const [b] = await db.insert(aircraft).values(plane('DF-TWO')).returning();
	aircraftId = a.id;
	uploaded = await insertFlight(pool, { orgId: org.id, aircraftId, pilotId: U.pilot.id, declaration: { kind: 'full' } }, first);
	live = await insertFlight(pool, { orgId: org.id, aircraftId, pilotId: U.pilot.id, declaration: { kind: 'lower' }, title: 'recorded live' }, second);
	await db.update(flights).set({ source: 'live' }).where(eq(flights.id, live));
	otherAircraftFlight = await insertFlight(pool, { orgId: org.id, aircraftId: b.id, pilotId: U.pilot.id, declaration: { kind: 'full' } }, first);
	await db.transaction(async (tx) => {
		for (const id of [uploaded, live, otherAircraftFlight]) await recomputeSummary(id, tx);
	});
});

describe('every write that changes a fuel input keeps the stored figures derived', () => {
	it('starts consistent', async () => {
		await expectDerived('after set-up');
	});

	it('replay page: declaration', async () => {
		expect(await onReplay('declaration', uploaded, { kind: 'onBoard', amount: '30', unit: 'usgal', previous: '' })).toMatchObject({ saved: true });
		await expectDerived('replay declaration');
	});

	it('replay page: fuel event added and removed', async () => {
		const at = new Date(second.t[600] * 1000).toISOString().slice(0, 19);
		const before = await storedOnBoard(live);
		expect(await onReplay('addEvent', live, { kind: 'added', amount: '5', unit: 'usgal', at, note: '' })).toMatchObject({ saved: true });
		expect((await storedOnBoard(live)) - before).toBeCloseTo(5 * LITRES_PER_US_GALLON, 6);
		await expectDerived('replay event added');
		const [ev] = await db.select().from(fuelEvents).where(eq(fuelEvents.flightId, live));
		expect(await onReplay('removeEvent', live, { id: ev.id })).toMatchObject({ saved: true });
		await expectDerived('replay event removed');
	});

	it('live page: declaration of a closed live flight', async () => {
		const before = await storedOnBoard(live);
		expect(await onLive('declaration', live, { kind: 'onBoard', amount: '20', unit: 'usgal', previous: '' })).toMatchObject({ saved: true });
		// 20 US gal at engine start instead of the 28 US gal lower level: 8 US gal less at shutdown.
		expect((await storedOnBoard(live)) - before).toBeCloseTo(-8 * LITRES_PER_US_GALLON, 6);
		await expectDerived('live declaration');
	});

	it('aircraft: capacity, fill levels, baseline flow, density and reserve rule', async () => {
		const a = await aircraftRow();
		const values = aircraftFormValues(a);
		const changes: Record<string, string>[] = [
			{ capacity: '38', lowerLevel: '25' },
			{ baselineCruise: '7.5' },
			{ fuelType: 'other', densityKgPerL: '0.74' },
			{ reserveRule: 'custom', reserveCustomMin: '60' }
		];
		let current = values;
		for (const change of changes) {
			current = { ...current, ...change };
			expect(await onAircraft('save', current), JSON.stringify(change)).toMatchObject({ saved: true });
			await expectDerived(`aircraft ${JSON.stringify(change)}`);
		}
		// A flight declared "full" follows the capacity: 38 → 36 US gal is 2 US gal less at shutdown.
		await onReplay('declaration', uploaded, { kind: 'full', amount: '', unit: 'usgal', previous: '' });
		const full = await storedOnBoard(uploaded);
		expect(await onAircraft('save', { ...current, capacity: '36' })).toMatchObject({ saved: true });
		expect((await storedOnBoard(uploaded)) - full).toBeCloseTo(-2 * LITRES_PER_US_GALLON, 6);
		await expectDerived('aircraft capacity, declared full');
	});

	it('aircraft: a dated meter factor set by hand, and one typed on the aircraft form', async () => {
		const before = await storedOnBoard(uploaded);
		// In force from long before every flight: each of them is recomputed with 1.1.
		const result = await onReconciliation('factors', { meterFactor: '1.1', kFactor: '', inForceFrom: '2000-01-01T00:00', note: '' });
		expect(result).toMatchObject({ saved: true });
		expect((await aircraftRow()).meterFactor).toBe(1.1);
		expect(await storedOnBoard(uploaded)).toBeLessThan(before);
		await expectDerived('calibration by hand');
		// Typed on the aircraft form, a factor is dated from now: past flights keep theirs.
		const mid = await storedOnBoard(uploaded);
		expect(await onAircraft('save', { ...aircraftFormValues(await aircraftRow()), meterFactor: '1.2' })).toMatchObject({ saved: true });
		expect((await aircraftRow()).meterFactor).toBe(1.2);
		expect(await storedOnBoard(uploaded)).toBe(mid);
		const entries = await db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId)).orderBy(asc(calibrations.createdAt));
		expect(entries.map((e) => [e.source, e.meterFactorOld, e.meterFactorNew])).toEqual([
			['initial', 1, 1],
			['hand', 1, 1.1],
			['hand', 1.1, 1.2]
		]);
		await expectDerived('meter factor on the aircraft form');
	});

	it('waits for a flight write in progress instead of deadlocking with it', async () => {
		// A flight write (a close, a correction) locks the flight row and then the aircraft row for its
		// last known fuel. Saving the aircraft meanwhile must take the locks in the same order.
		const client = await pool.connect();
		try {
			await client.query('begin');
			await client.query('update flights set updated_at = now() where id = $1', [live]);
			const saving = onAircraft('save', { ...aircraftFormValues(await aircraftRow()), baselineCruise: '7.9' });
			// Until the save is waiting for the flight row.
			for (let k = 0; k < 100; k++) {
				const { rows } = await client.query("select count(*)::int as n from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock'");
				if (rows[0].n > 0) break;
				await new Promise((r) => setTimeout(r, 20));
			}
			await client.query('update aircraft set updated_at = now() where id = $1', [aircraftId]);
			await client.query('commit');
			expect(await saving).toMatchObject({ saved: true });
		} finally {
			client.release();
		}
		await expectDerived('aircraft saved while a flight was being written');
	});

	it('leaves the flights of other aircraft alone', async () => {
		const [row] = await db.select({ updatedAt: flights.updatedAt, summary: flights.summary }).from(flights).where(eq(flights.id, otherAircraftFlight));
		const loaded = await loadFlight(otherAircraftFlight);
		expect(plain(row.summary)).toEqual(plain(computeLoaded(loaded!).summary));
	});
});

describe('the audit trail of corrections', () => {
	const loadAs = async (user: TestUser, id: string) => {
		const url = new URL(`http://127.0.0.1:4173/o/${slug}/flights/${id}`);
		const e = { locals: { user, session: null, authVia: 'session' }, params: { org: slug, id }, url, route: { id: '/o/[org]/flights/[id]' }, request: new Request(url) };
		return (await replayLoad(e as never)) as { corrections: CorrectionView[] };
	};

	it('records who changed the start fuel, when, from what to what and why', async () => {
		const t0 = Date.now();
		await onReplay('declaration', uploaded, { kind: 'onBoard', amount: '25', unit: 'usgal', previous: '', reason: 'dipstick after landing' });
		const [c] = (await loadAs(U.viewer, uploaded)).corrections;
		expect(c).toMatchObject({ kind: 'declaration', by: U.pilot.name, reason: 'dipstick after landing' });
		expect(c.at.getTime()).toBeGreaterThanOrEqual(t0 - 1000);
		// The flight was put back on "full" in the walk above; now 25 US gal on board.
		expect((c.before as DeclarationSnapshot).declaration).toEqual({ kind: 'full' });
		expect((c.after as DeclarationSnapshot).declaration.kind).toBe('onBoard');
		expect((c.after as DeclarationSnapshot & { declaration: { amountL: number } }).declaration.amountL).toBeCloseTo(25 * LITRES_PER_US_GALLON, 9);
	});

	it('records a declaration changed from the live page, and nothing for a save that changes nothing', async () => {
		const before = (await loadAs(U.admin, live)).corrections.length;
		await onLive('declaration', live, { kind: 'onBoard', amount: '22', unit: 'usgal', previous: '', reason: 'pilot radioed the gauge reading' }, U.admin);
		await onLive('declaration', live, { kind: 'onBoard', amount: '22', unit: 'usgal', previous: '' }, U.admin);
		const list = (await loadAs(U.pilot, live)).corrections;
		expect(list).toHaveLength(before + 1);
		expect(list[0]).toMatchObject({ kind: 'declaration', by: U.admin.name, reason: 'pilot radioed the gauge reading' });
		expect((list[0].before as DeclarationSnapshot & { declaration: { amountL: number } }).declaration.amountL).toBeCloseTo(20 * LITRES_PER_US_GALLON, 9);
	});

	it('records a fuel event added and removed with the event as it was', async () => {
		const at = new Date(second.t[900] * 1000).toISOString().slice(0, 19);
		await onReplay('addEvent', live, { kind: 'added', amount: '4', unit: 'usgal', at, note: 'receipt 4471', reason: 'forgot to enter it at the stop' });
		const [ev] = await db.select().from(fuelEvents).where(eq(fuelEvents.flightId, live));
		await onReplay('removeEvent', live, { id: ev.id, reason: 'entered twice' }, U.admin);
		const [removed, added] = (await loadAs(U.viewer, live)).corrections;
		expect(added).toMatchObject({ kind: 'eventAdded', by: U.pilot.name, before: null, reason: 'forgot to enter it at the stop' });
		expect(removed).toMatchObject({ kind: 'eventRemoved', by: U.admin.name, after: null, reason: 'entered twice' });
		for (const snap of [added.after, removed.before] as EventSnapshot[]) {
			expect(snap).toMatchObject({ kind: 'added', note: 'receipt 4471', t: new Date(second.t[900] * 1000).toISOString() });
			expect(snap.amountL).toBeCloseTo(4 * LITRES_PER_US_GALLON, 9);
		}
	});

	it('refuses a reason that is too long, storing neither the change nor a record', async () => {
		const rows = async () => (await db.select().from(fuelCorrections).where(eq(fuelCorrections.flightId, uploaded))).length;
		const count = await rows();
		const [before] = await db.select().from(flights).where(eq(flights.id, uploaded));
		const result = (await onReplay('declaration', uploaded, { kind: 'full', amount: '', unit: 'usgal', previous: '', reason: 'x'.repeat(201) })) as { status: number; data: { errors: Record<string, string> } };
		expect(result.status).toBe(400);
		expect(result.data.errors.reason).toMatch(/at most 200/);
		const [after] = await db.select().from(flights).where(eq(flights.id, uploaded));
		expect(after.declaration).toEqual(before.declaration);
		expect(await rows()).toBe(count);
	});

	it('is hidden from members of other organisations with the flight itself', async () => {
		await db.insert(users).values({ id: U.outsider.id, email: U.outsider.email, name: U.outsider.name, passwordHash: 'not-a-real-hash' }).onConflictDoNothing();
		try {
			await loadAs(U.outsider, uploaded);
			expect.unreachable('an outsider loaded the flight');
		} catch (e) {
			expect(isHttpError(e) && e.status).toBe(404);
		}
	});
});
