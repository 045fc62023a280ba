// Applying new factors to past flights over an explicit date range, and the progress of the
// recompute. Fuel used is the integral of flow times the meter factor, so a flight inside the
// range scales by new ÷ old and one outside keeps its figures exactly. The progress row is written
// on its own connection while the transaction recomputes one flight at a time: another connection
// sees done advance while the stored figures stay as before, and 'done' with every figure changed
// once the transaction committed.
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { asc, eq, inArray } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, calibrations, flightFigures, memberships, organisations, recomputeJobs, users } from '$lib/server/db/schema';
import { writeEntry } from '$lib/server/calibration/factors';
import { withRecomputeJob } from '$lib/server/flights/recompute-jobs';
import { recomputeFlights, recomputeSummary } from '$lib/server/flights/summary';
import { actions } from '../../src/routes/o/[org]/aircraft/[id]/reconciliation/+page.server';
import { GET as recomputeGET } from '../../src/routes/o/[org]/aircraft/[id]/recompute/+server';
import { generateFlight, insertFlight } from './replay-fixture';
import { formOf, routeEvent } from './route-event';

const stamp = Date.now().toString(36);
const person = (key: string, name: string) => ({ id: `cr-${key}-${stamp}`, email: `${key}-${stamp}@range.example`, name, prefFuelUnit: null, timeZone: null });
const U = { admin: person('admin', 'Ada Admin'), pilot: person('pilot', 'Pia Pilot'), viewer: person('viewer', 'Vic Viewer') };
const day = (d: number) => Date.UTC(2025, 8, d, 9) / 1000;
const minute = (epochS: number) => new Date(epochS * 1000).toISOString().slice(0, 16);

let orgId = '';
let slug = '';
const ranged = { id: '', flights: [] as string[] };
const long = { id: '', flights: [] as string[] };

async function figures(ids: string[]): Promise<Map<string, { used: number; mf: number }>> {
	const rows = await db.select({ id: flightFigures.flightId, used: flightFigures.fuelUsedL, mf: flightFigures.meterFactor }).from(flightFigures).where(inArray(flightFigures.flightId, ids));
	return new Map(rows.map((r) => [r.id, { used: r.used, mf: r.mf }]));
}
const aircraftRow = async (id: string) => (await db.select().from(aircraft).where(eq(aircraft.id, id)))[0];
const factorsAction = (fields: Record<string, string>) =>
	(actions.factors as (e: unknown) => Promise<unknown>)(routeEvent(U.admin, '/o/[org]/aircraft/[id]/reconciliation', { org: slug, id: ranged.id }, formOf(fields), '?/factors'));

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'Range Flying Group', slug: `range-${stamp}` }).returning();
	orgId = org.id;
	slug = org.slug;
	await db.insert(memberships).values([
		{ orgId, userId: U.admin.id, role: 'admin' },
		{ orgId, userId: U.pilot.id, role: 'pilot' },
		{ orgId, userId: U.viewer.id, role: 'viewer' }
	]);
	const base = { type: 'Trainer', fuelType: 'avgas' as const, densityKgPerL: 0.719, capacityL: 150, displayUnit: 'l' as const, reserveRule: 'easa-nco.op.125-vfr-day' as const };
	const [a, b] = await db
		.insert(aircraft)
		.values([
			{ orgId, registration: 'CR-RNG', ...base, kFactor: 68_000 },
			{ orgId, registration: 'CR-LNG', ...base }
		])
		.returning();
	ranged.id = a.id;
	long.id = b.id;
	// Flights on days 1, 3, 5 and 8 of September on the first; twelve on the second.
	for (const d of [1, 3, 5, 8]) ranged.flights.push(await insertFlight(pool, { orgId, aircraftId: a.id, pilotId: U.pilot.id, declaration: { kind: 'full' } }, generateFlight({ start: day(d), cruiseS: 600 })));
	for (let d = 1; d <= 12; d++) long.flights.push(await insertFlight(pool, { orgId, aircraftId: b.id, pilotId: U.pilot.id, declaration: { kind: 'full' } }, generateFlight({ start: day(d), cruiseS: 900 })));
	await db.transaction((tx) => recomputeFlights([...ranged.flights, ...long.flights], tx));
});

describe('new factors over a date range', () => {
	it('previews how many flights change, writes nothing, then changes only the flights in the range', async () => {
		const [f1, f3, f5, f8] = ranged.flights;
		const before = await figures(ranged.flights);
		const fields = { meterFactor: '1.05', kFactor: '64761.9', inForceFrom: minute(day(2)), inForceUntil: minute(day(6)), note: 'suspect sensor' };
		const preview = (await factorsAction(fields)) as { step: string; preview: { range: { flights: number; endsAt: string; until: Date } } };
		expect(preview.step).toBe('preview');
		// Days 3 and 5 lie between day 2 and day 6.
		expect(preview.preview.range).toMatchObject({ flights: 2, endsAt: 'chosen' });
		expect(preview.preview.range.until.getTime()).toBe(day(6) * 1000);
		expect(await db.select().from(calibrations).where(eq(calibrations.aircraftId, ranged.id))).toHaveLength(0);
		expect(await figures(ranged.flights)).toEqual(before);

		const saved = (await factorsAction({ ...fields, step: 'confirm' })) as { step: string; preview: { range: { flights: number } } };
		expect(saved).toMatchObject({ step: 'confirm', preview: { range: { flights: 2 } } });
		const after = await figures(ranged.flights);
		for (const id of [f3, f5]) {
			// Fuel used = ∫ flow dt × meter factor: 1.05 ÷ 1.00.
			expect(after.get(id)!.used / before.get(id)!.used).toBeCloseTo(1.05, 9);
			expect(after.get(id)!.mf).toBe(1.05);
		}
		for (const id of [f1, f8]) expect(after.get(id)).toEqual(before.get(id));
		// The range's end brings the factors in force before back, in the history.
		const entries = await db.select().from(calibrations).where(eq(calibrations.aircraftId, ranged.id)).orderBy(asc(calibrations.inForceFrom));
		expect(entries.map((e) => [e.source, e.meterFactorOld, e.meterFactorNew, e.kFactorOld, e.kFactorNew, e.flightsRecomputed])).toEqual([
			['initial', 1, 1, 68_000, 68_000, 0],
			['hand', 1, 1.05, 68_000, 64_761.9, 2],
			['rangeEnd', 1.05, 1, 64_761.9, 68_000, 0]
		]);
		expect(entries[2].inForceFrom?.getTime()).toBe(day(6) * 1000);
		// Now is after the range: the aircraft's factors in force are the old ones again.
		expect((await aircraftRow(ranged.id)).meterFactor).toBe(1);
		// Recomputing every flight reads the same dated factors: nothing moves.
		for (const id of ranged.flights) await recomputeSummary(id);
		expect(await figures(ranged.flights)).toEqual(after);
	});

	it('stops at the next dated entry when it comes before the chosen end, and refuses an end before the start', async () => {
		const [, , f5, f8] = ranged.flights;
		const before = await figures(ranged.flights);
		// From day 4 until day 9: the range end entry of day 6 comes first, so only day 5 changes.
		const preview = (await factorsAction({ meterFactor: '0.98', inForceFrom: minute(day(4)), inForceUntil: minute(day(9)) })) as { preview: { range: { flights: number; endsAt: string } } };
		expect(preview.preview.range).toMatchObject({ flights: 1, endsAt: 'nextEntry' });
		await factorsAction({ meterFactor: '0.98', inForceFrom: minute(day(4)), inForceUntil: minute(day(9)), step: 'confirm' });
		const after = await figures(ranged.flights);
		expect(after.get(f5)!.used / before.get(f5)!.used).toBeCloseTo(0.98 / 1.05, 9);
		for (const id of ranged.flights.filter((x) => x !== f5)) expect(after.get(id)).toEqual(before.get(id));
		expect(after.get(f8)!.mf).toBe(1);
		const n = (await db.select().from(calibrations).where(eq(calibrations.aircraftId, ranged.id))).length;
		const bad = (await factorsAction({ meterFactor: '1.1', inForceFrom: minute(day(5)), inForceUntil: minute(day(4)), step: 'confirm' })) as { status: number; data: { errors: Record<string, string> } };
		expect(bad.status).toBe(400);
		expect(Object.keys(bad.data.errors)).toEqual(['inForceUntil']);
		expect(await db.select().from(calibrations).where(eq(calibrations.aircraftId, ranged.id))).toHaveLength(n);
		expect(await figures(ranged.flights)).toEqual(after);
	});
});

describe('progress of a long recompute', () => {
	it('advances done flight by flight on its own connection while the figures change only at the commit', async () => {
		const watched = long.flights[long.flights.length - 1];
		let jobId: string | null = null;
		const seen: { state: string; done: number; total: number; mf: number }[] = [];
		let watching = true;
		const watch = (async () => {
			while (watching) {
				if (jobId) {
					const [j] = await db.select().from(recomputeJobs).where(eq(recomputeJobs.id, jobId));
					const [f] = await db.select({ mf: flightFigures.meterFactor }).from(flightFigures).where(eq(flightFigures.flightId, watched));
					seen.push({ state: j.state, done: j.done, total: j.total, mf: f.mf });
				}
				await new Promise((r) => setTimeout(r, 2));
			}
		})();
		const a = await aircraftRow(long.id);
		const written = await writeEntry(a, { source: 'hand', inForceFrom: new Date(day(1) * 1000 - 60_000), factors: { meterFactor: 1.02, kFactor: null } }, U.admin.id, { everyMs: 0, onBegin: (id) => (jobId = id) });
		watching = false;
		await watch;
		expect(written.ok && written.range.flights).toBe(12);
		const running = seen.filter((s) => s.state === 'running');
		// The count advanced while the transaction ran, never backwards, and never past the total.
		expect(running.some((s) => s.done > 0 && s.done < 12)).toBe(true);
		for (let i = 1; i < running.length; i++) expect(running[i].done).toBeGreaterThanOrEqual(running[i - 1].done);
		expect(running.every((s) => s.total === 12 && s.done <= 12)).toBe(true);
		// Outside the transaction the stored figures were the old ones until the last flight was done
		// (between the commit and the row turning 'done' a reader may see 12 of 12 still running).
		expect(running.filter((s) => s.done < 12).every((s) => s.mf === 1)).toBe(true);
		const [job] = await db.select().from(recomputeJobs).where(eq(recomputeJobs.id, jobId!));
		expect(job).toMatchObject({ state: 'done', done: 12, total: 12, reason: 'calibration', startedBy: U.admin.id });
		expect(job.finishedAt).not.toBeNull();
		const after = await figures(long.flights);
		expect([...after.values()].every((f) => f.mf === 1.02)).toBe(true);
	});

	it('says failed, and nothing changed, when the transaction rolls back part way', async () => {
		const before = await figures(long.flights);
		let jobId = '';
		await expect(
			withRecomputeJob(
				long.id,
				'aircraft',
				U.admin.id,
				(progress) =>
					db.transaction(async (tx) => {
						await tx.update(aircraft).set({ capacityL: 140 }).where(eq(aircraft.id, long.id));
						await progress.begin(long.flights.length);
						for (let i = 0; i < 3; i++) {
							await recomputeSummary(long.flights[i], tx);
							await progress.step(i + 1);
						}
						throw new Error('stopped part way');
					}),
				{ everyMs: 0, onBegin: (id) => (jobId = id) }
			)
		).rejects.toThrow('stopped part way');
		const [job] = await db.select().from(recomputeJobs).where(eq(recomputeJobs.id, jobId));
		expect(job).toMatchObject({ state: 'failed', done: 3, total: 12 });
		expect(await figures(long.flights)).toEqual(before);
		expect((await aircraftRow(long.id)).capacityL).toBe(150);
	});

	it('serves the newest recompute to those who read calibration, and to nobody else', async () => {
		const get = (user: (typeof U)[keyof typeof U]) => recomputeGET(routeEvent(user, '/o/[org]/aircraft/[id]/recompute', { org: slug, id: long.id }) as never);
		const res = await get(U.viewer);
		const body = (await res.json()) as { job: { state: string; done: number; total: number } };
		expect(body.job).toMatchObject({ state: 'failed', done: 3, total: 12 });
		await expect(get(U.pilot)).rejects.toSatisfy((e: unknown) => isHttpError(e) && e.status === 403);
	});
});
