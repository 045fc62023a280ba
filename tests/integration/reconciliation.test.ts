// Reconciling against the pump: receipts recorded through the page's actions, the window between
// two fills to full with the flights started in it, the proposed factors (ISO 1998-6 meter factor =
// actual ÷ indicated; API MPMS ch. 12.2 K_new = K_old ÷ MF), a preview that writes nothing, and
// applying from a date: a dated entry and exactly the covered flights recomputed in the same
// transaction. The maintenance viewer reads it all and changes nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { isHttpError } from '@sveltejs/kit';
import { asc, eq, inArray } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, calibrations, flightFigures, flights, memberships, organisations, pumpReceipts, users } from '$lib/server/db/schema';
import { aircraftHistory } from '$lib/server/aircraft/history';
import { recomputeSummary } from '$lib/server/flights/summary';
import { historyQuerySchema } from '$lib/schemas/history';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { load, actions } from '../../src/routes/o/[org]/aircraft/[id]/reconciliation/+page.server';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const person = (key: string, name: string) => ({ id: `rc-${key}-${stamp}`, email: `${key}-${stamp}@reconcile.example`, name, prefFuelUnit: null, timeZone: null });
const U = { admin: person('admin', 'Ada Admin'), pilot: person('pilot', 'Pia Pilot'), viewer: person('viewer', 'Vic Viewer') };
type TestUser = (typeof U)[keyof typeof U];
const K_OLD = 68_000;
/** Pumped this much more than computed: over the finder's 5 % "computed below pumped" line. */
const RATIO = 1.08;

let orgId = '';
let slug = '';
let aircraftId = '';
const ids: Record<'before' | 'in1' | 'in2' | 'after', string> = { before: '', in1: '', in2: '', after: '' };
const day = (d: number, h = 9) => Date.UTC(2025, 6, d, h) / 1000;
const minute = (epochS: number) => new Date(epochS * 1000).toISOString().slice(0, 16);

function event(user: TestUser, fields?: Record<string, string>, action?: string) {
	const url = new URL(`http://127.0.0.1:4173/o/${slug}/aircraft/${aircraftId}/reconciliation${action ? `?/${action}` : ''}`);
	let request = new Request(url);
	if (fields) {
		const body = new FormData();
		for (const [k, v] of Object.entries(fields)) body.set(k, v);
		request = new Request(url, { method: 'POST', body });
	}
	return { locals: { user, session: null, authVia: 'session' }, params: { org: slug, id: aircraftId }, url, route: { id: '/o/[org]/aircraft/[id]/reconciliation' }, request } as unknown as RequestEvent;
}
const act = (user: TestUser, name: keyof typeof actions, fields: Record<string, string>) => (actions[name] as (e: unknown) => Promise<unknown>)(event(user, fields, name));
type Page = Awaited<ReturnType<typeof load>> & { reconciliation: { windows: { fromReceiptId: string; toReceiptId: string; flightIds: string[]; pumpedL: number; computedL: number; pumpedOverComputed: number | null; proposal: { ok: boolean; meterFactor?: number; kFactorNew?: number | null } }[] } };
const page = async (user: TestUser = U.admin) => (await load(event(user) as never)) as unknown as Page;

async function used(): Promise<Record<string, { figures: number; summary: number; mf: number }>> {
	const rows = await db
		.select({ id: flights.id, figures: flightFigures.fuelUsedL, summary: flights.summary, mf: flightFigures.meterFactor })
		.from(flights)
		.innerJoin(flightFigures, eq(flightFigures.flightId, flights.id))
		.where(inArray(flights.id, Object.values(ids)));
	return Object.fromEntries(rows.map((r) => [r.id, { figures: r.figures, summary: (r.summary as { fuelUsedL: number }).fuelUsedL, mf: r.mf }]));
}

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'Pump Flying Group', slug: `pump-${stamp}` }).returning();
	orgId = org.id;
	slug = org.slug;
	await db.insert(memberships).values([
		{ orgId, userId: U.admin.id, role: 'admin' },
		{ orgId, userId: U.pilot.id, role: 'pilot' },
		{ orgId, userId: U.viewer.id, role: 'viewer' }
	]);
	const [a] = await db
		.insert(aircraft)
		.values({ orgId, registration: 'RC-ONE', type: 'Trainer', fuelType: 'avgas', densityKgPerL: 0.719, capacityL: 150, lowerLevelL: 100, displayUnit: 'usgal', kFactor: K_OLD, reserveRule: 'faa-91.151-vfr-day' })
		.returning();
	aircraftId = a.id;
	const at: Record<keyof typeof ids, number> = { before: day(1), in1: day(3), in2: day(5), after: day(8) };
	for (const key of Object.keys(ids) as (keyof typeof ids)[])
		ids[key] = await insertFlight(pool, { orgId, aircraftId, pilotId: U.pilot.id, declaration: { kind: 'full' }, title: key }, generateFlight({ start: at[key], cruiseS: 3600 }));
	await db.transaction(async (tx) => {
		for (const id of Object.values(ids)) await recomputeSummary(id, tx);
	});
});

describe('reconciliation against the pump', () => {
	let fromId = '';
	let toId = '';
	let computedGal = 0;

	it('records receipts in any unit and reconciles the flights between two fills to full', async () => {
		const u = await used();
		computedGal = (u[ids.in1].figures + u[ids.in2].figures) / LITRES_PER_US_GALLON;
		const pumpedGal = computedGal * RATIO;
		// Full on day 2, a 5 US gal top-up on day 4 (entered in litres), full again on day 6.
		expect(await act(U.admin, 'receipt', { at: minute(day(2)), airfield: 'Kestrel Field', amount: '30', unit: 'usgal', full: '1', note: '' })).toMatchObject({ saved: true });
		expect(await act(U.admin, 'receipt', { at: minute(day(4)), amount: String(5 * LITRES_PER_US_GALLON), unit: 'l', full: '0' })).toMatchObject({ saved: true });
		expect(await act(U.admin, 'receipt', { at: minute(day(6)), amount: (pumpedGal - 5).toFixed(6), unit: 'usgal', full: '1' })).toMatchObject({ saved: true });
		const p = await page();
		expect(p.reconciliation.windows).toHaveLength(1);
		const w = p.reconciliation.windows[0];
		fromId = w.fromReceiptId;
		toId = w.toReceiptId;
		expect(w.flightIds.sort()).toEqual([ids.in1, ids.in2].sort());
		expect(w.computedL / LITRES_PER_US_GALLON).toBeCloseTo(computedGal, 9);
		expect(w.pumpedL / LITRES_PER_US_GALLON).toBeCloseTo(pumpedGal, 5);
		// Meter factor = pumped ÷ indicated (every flight so far at 1.000), K_new = K_old ÷ MF.
		expect(w.pumpedOverComputed).toBeCloseTo(RATIO, 6);
		expect(w.proposal.meterFactor).toBeCloseTo(RATIO, 6);
		expect(w.proposal.kFactorNew).toBeCloseTo(K_OLD / RATIO, 1);
	});

	it('names computed-below-pumped among the high-burn causes while it persists', async () => {
		const h = await aircraftHistory({ orgId, userId: U.admin.id, role: 'admin' }, aircraftId, historyQuerySchema.parse({}));
		expect(h.pumpedOverComputed).toBeCloseTo(RATIO, 6);
		for (const r of h.rows) expect(r.highBurn.causes).toContain('belowPumped');
	});

	it('previews without writing anything, then applies from the first fill: only the flights from then are recomputed', async () => {
		const before = await used();
		const preview = (await act(U.admin, 'apply', { from: fromId, to: toId, as: 'meterFactor', inForceFrom: minute(day(2)), step: 'preview' })) as { step: string; preview: { range: { flights: number }; new: { meterFactor: number } } };
		expect(preview.step).toBe('preview');
		// in1, in2 and after start from day 2 on; no later entry bounds them.
		expect(preview.preview.range.flights).toBe(3);
		expect(preview.preview.new.meterFactor).toBeCloseTo(RATIO, 6);
		expect(await db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId))).toHaveLength(0);
		expect(await used()).toEqual(before);

		const applied = (await act(U.admin, 'apply', { from: fromId, to: toId, as: 'meterFactor', inForceFrom: minute(day(2)), step: 'confirm', note: 'July fills' })) as { step: string };
		expect(applied.step).toBe('confirm');
		const after = await used();
		// Fuel used is the integral of flow times the meter factor: the covered flights scale by it.
		for (const key of ['in1', 'in2', 'after'] as const) {
			expect(after[ids[key]].figures / before[ids[key]].figures, key).toBeCloseTo(RATIO, 6);
			expect(after[ids[key]].summary, key).toBeCloseTo(after[ids[key]].figures, 9);
			expect(after[ids[key]].mf, key).toBeCloseTo(RATIO, 6);
		}
		expect(after[ids.before]).toEqual(before[ids.before]);
		const entries = await db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId)).orderBy(asc(calibrations.createdAt));
		expect(entries.map((e) => [e.source, e.meterFactorOld, e.flightsRecomputed])).toEqual([
			['initial', 1, 0],
			['reconciliation', 1, 3]
		]);
		expect(entries[1]).toMatchObject({ createdBy: U.admin.id, receiptFromId: fromId, receiptToId: toId, kFactorOld: K_OLD, kFactorNew: K_OLD, note: 'July fills' });
		expect(entries[1].inForceFrom?.getTime()).toBe(day(2) * 1000);
		const [a] = await db.select().from(aircraft).where(eq(aircraft.id, aircraftId));
		expect(a.meterFactor).toBeCloseTo(RATIO, 6);
		// Recomputing again reads the same dated factor: nothing moves.
		await recomputeSummary(ids.before);
		await recomputeSummary(ids.in1);
		expect(await used()).toEqual(after);
		// The window now agrees with the pump, and the cause is gone.
		const p = await page();
		expect(p.reconciliation.windows[0].pumpedOverComputed).toBeCloseTo(1, 6);
		const h = await aircraftHistory({ orgId, userId: U.admin.id, role: 'admin' }, aircraftId, historyQuerySchema.parse({}));
		for (const r of h.rows) expect(r.highBurn.causes).not.toContain('belowPumped');
	});

	it('sets factors by hand from a date between two flights: only the later one changes, old → new in the history', async () => {
		const before = await used();
		const saved = (await act(U.admin, 'factors', { meterFactor: '1', kFactor: String(K_OLD), inForceFrom: minute(day(7)), note: 'sensor replaced' })) as { saved: boolean; flights: number };
		expect(saved).toMatchObject({ saved: true, flights: 1 });
		const after = await used();
		expect(after[ids.after].figures / before[ids.after].figures).toBeCloseTo(1 / RATIO, 6);
		for (const key of ['before', 'in1', 'in2'] as const) expect(after[ids[key]], key).toEqual(before[ids[key]]);
		const [last] = await db.select().from(calibrations).where(eq(calibrations.source, 'hand'));
		expect(last.meterFactorOld).toBeCloseTo(RATIO, 6);
		expect(last.meterFactorNew).toBe(1);
	});

	it('answers bad input with a 400 naming the field and stores nothing', async () => {
		const receipts = await db.select().from(pumpReceipts).where(eq(pumpReceipts.aircraftId, aircraftId));
		const entries = await db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId));
		const bad = (await act(U.admin, 'receipt', { at: '2025-13-40T25:00', amount: 'lots', unit: 'pints', full: '1' })) as { status: number; data: { errors: Record<string, string> } };
		expect(bad.status).toBe(400);
		expect(Object.keys(bad.data.errors).sort()).toEqual(['amount', 'at', 'unit']);
		const future = (await act(U.admin, 'factors', { meterFactor: '1.01', inForceFrom: '2999-01-01T00:00' })) as { status: number; data: { errors: Record<string, string> } };
		expect(future.status).toBe(400);
		expect(Object.keys(future.data.errors)).toEqual(['inForceFrom']);
		const foreign = (await act(U.admin, 'apply', { from: toId, to: fromId, as: 'meterFactor', inForceFrom: minute(day(2)), step: 'confirm' })) as { status: number };
		expect(foreign.status).toBe(400);
		expect(await db.select().from(pumpReceipts).where(eq(pumpReceipts.aircraftId, aircraftId))).toEqual(receipts);
		expect(await db.select().from(calibrations).where(eq(calibrations.aircraftId, aircraftId))).toEqual(entries);
	});

	it('lets the maintenance viewer read receipts and calibration history and change nothing; a pilot sees neither', async () => {
		const p = (await page(U.viewer)) as unknown as { reconciliation: { receipts: unknown[] }; history: unknown[] };
		expect(p.reconciliation.receipts).toHaveLength(3);
		expect(p.history.length).toBeGreaterThanOrEqual(3);
		for (const [name, fields] of [
			['receipt', { at: minute(day(9)), amount: '10', unit: 'usgal', full: '1' }],
			['deleteReceipt', { receiptId: fromId }],
			['apply', { from: fromId, to: toId, as: 'meterFactor', inForceFrom: minute(day(2)), step: 'confirm' }],
			['factors', { meterFactor: '1.2', inForceFrom: minute(day(9)) }]
		] as const)
			await expect(act(U.viewer, name, fields)).rejects.toSatisfy((e: unknown) => isHttpError(e) && e.status === 403);
		await expect(page(U.pilot)).rejects.toSatisfy((e: unknown) => isHttpError(e) && e.status === 403);
		expect(await db.select().from(pumpReceipts).where(eq(pumpReceipts.aircraftId, aircraftId))).toHaveLength(3);
	});
});
