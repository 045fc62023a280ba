// Logbook legs, splitting a flight at a stop and merging two flights of one aircraft, against the
// real database and the flight page's form actions; and the trash's loose ends at upload time (a
// duplicate of a flight in the trash, overlaps with one, restoring over a newer flight).
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError, isRedirect } from '@sveltejs/kit';
import { eq, sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, memberships, samples, uploads, type Flight } from '$lib/server/db/schema';
import { LEG_STOP_MIN_S, type FlightSummary } from '$lib/fuel';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { actions as flightActions } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { actions as trashActions } from '../../src/routes/o/[org]/trash/+page.server';
import { makeClub, makeUser, steadyFile, upload, type Club } from './upload-fixture';
import { loadFlight } from '$lib/server/flights/load';
import { mergeNeighbours } from '$lib/server/flights/split';
import { computeLoaded } from '$lib/server/flights/summary';
import type { AuthUser } from '$lib/server/auth';
import { formOf, routeEvent } from './route-event';

const FLIGHT_ROUTE = '/o/[org]/flights/[id]';
let club: Club;
let instructor: AuthUser;
let otherPilot: AuthUser;

const row = async (id: string): Promise<Flight | undefined> => (await db.select().from(flights).where(eq(flights.id, id)))[0];
const summaryOf = async (id: string): Promise<FlightSummary> => (await row(id))!.summary!;
const refusedWith = (status: number) => (e: unknown) => isHttpError(e) && e.status === status;
const redirectTo = async (p: Promise<unknown>): Promise<string> => {
	try {
		await p;
	} catch (e) {
		if (isRedirect(e)) return e.location;
		throw e;
	}
	throw new Error('expected a redirect');
};
const split = (user: AuthUser, id: string, stop: string) => flightActions.split(routeEvent(user, FLIGHT_ROUTE, { org: club.slug, id }, formOf({ stop })) as never);
const merge = (user: AuthUser, id: string, otherId: string) => flightActions.merge(routeEvent(user, FLIGHT_ROUTE, { org: club.slug, id }, formOf({ otherId })) as never);
/** Every kept closed flight of the club: its stored summary equals a fresh computation (stored figures are derived). */
async function expectDerived(what: string) {
	const rows = await db.select({ id: flights.id, summary: flights.summary }).from(flights).where(sql`${flights.orgId} = ${club.orgId} and ${flights.status} = 'closed' and ${flights.deletedAt} is null`);
	for (const r of rows) expect(JSON.parse(JSON.stringify(r.summary)), `${what}: flight ${r.id}`).toEqual(JSON.parse(JSON.stringify(computeLoaded((await loadFlight(r.id))!).summary)));
}
const uploadCount = async () => Number((await db.execute<{ n: number }>(sql`select count(*)::int as n from uploads where org_id = ${club.orgId}`)).rows[0].n);

/**
 * A trip with one turn-round at 1 Hz: 1200 s at 8 US gal/h and 90 kt, 1200 s standing with the
 * engine off, then 900 s at 8 US gal/h and 90 kt.
 */
function tripWithStop(start: number): string {
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm'];
	const add = (from: number, to: number, flow: number, gs: number) => {
		for (let s = from; s <= to; s++) lines.push(`${new Date(start + s * 1000).toISOString()},${flow},${gs},10`);
	};
	add(0, 1200, 8, 90);
	add(1201, 2400, 0, 0);
	add(2401, 3300, 8, 90);
	return lines.join('\n') + '\n';
}

beforeAll(async () => {
	club = await makeClub('Legs Club');
	instructor = await makeUser('Ivo Instructor');
	otherPilot = await makeUser('Oda Otherpilot');
	await db.insert(memberships).values([
		{ orgId: club.orgId, userId: instructor.id, role: 'instructor' },
		{ orgId: club.orgId, userId: otherPilot.id, role: 'pilot' }
	]);
});

describe('legs, split and merge', () => {
	let id = '';
	let original: FlightSummary;
	let secondId = '';

	beforeAll(async () => {
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: tripWithStop(Date.UTC(2026, 4, 1, 9)), fileName: 'trip.csv' });
		expect(res.status).toBe(201);
		id = res.body.flightId;
		original = await summaryOf(id);
	});

	it('stores two legs cut at the turn-round, with their block and engine times', () => {
		expect(LEG_STOP_MIN_S).toBeLessThan(1199);
		expect(original.legs).toHaveLength(2);
		expect(original.stops).toHaveLength(1);
		// Closed form: movement 0–1200 s and 2401–3300 s; the engine runs to the first sample of
		// the stop (1201 s) and from its last (2400 s).
		expect(original.legs.map((l) => l.blockTimeS)).toEqual([1200, 899]);
		expect(original.legs.map((l) => l.engineTimeS)).toEqual([1201, 900]);
		// Fuel: 8 US gal/h (NIST HB44: 3.785411784 L/gal) for 1200 s, plus the half-second ramp to 0.
		const lph = 8 * LITRES_PER_US_GALLON;
		expect(original.legs[0].fuelUsedL).toBeCloseTo((lph * 1200) / 3600 + (lph / 2) / 3600, 9);
		expect(original.legs[0].averageFlowLph).toBeCloseTo(original.legs[0].fuelUsedL / (1201 / 3600), 9);
		expect(original.legs[0].fuelUsedL + original.legs[1].fuelUsedL).toBeCloseTo(original.fuelUsedL, 9);
	});

	it('refuses a split by the viewer or another pilot, and at a stop that is not there', async () => {
		await expect(split(club.viewer, id, '0')).rejects.toSatisfy(refusedWith(403));
		await expect(split(otherPilot, id, '0')).rejects.toSatisfy(refusedWith(403));
		const r = (await split(club.pilot, id, '3')) as { status: number; data: { errors: Record<string, string> } };
		expect(r.status).toBe(409);
		expect(r.data.errors.stop).toMatch(/1 stops/);
		expect((await summaryOf(id)).legs).toHaveLength(2);
	});

	it('splits at the stop into two flights whose figures add up to the original', async () => {
		const uploadsBefore = await uploadCount();
		const to = await redirectTo(split(club.pilot, id, '0'));
		secondId = new URL(to, 'http://x').searchParams.get('split')!;
		const [a, b] = [await row(id), await row(secondId)];
		expect(a!.sampleCount + b!.sampleCount).toBe(3301);
		expect(b!.uploadId).toBe(a!.uploadId);
		expect(b!.pilotId).toBe(club.pilot.id);
		expect(await uploadCount()).toBe(uploadsBefore);
		const [sa, sb] = [a!.summary!, b!.summary!];
		expect(sa.legs).toHaveLength(1);
		expect(sb.legs).toHaveLength(1);
		expect(sa.fuelUsedL + sb.fuelUsedL).toBeCloseTo(original.fuelUsedL, 9);
		expect(sa.engineTimeS + sb.engineTimeS).toBe(original.engineTimeS);
		expect([sa.blockTimeS, sb.blockTimeS]).toEqual(original.legs.map((l) => l.blockTimeS));
		// The second part starts with the first one's fuel at shutdown, and lands as the original did.
		expect(b!.previousOnBoardL).toBeCloseTo(sa.onBoardAtShutdownL!, 9);
		expect(sb.onBoardAtShutdownL).toBeCloseTo(original.onBoardAtShutdownL!, 9);
		await expectDerived('after the split');
	});

	it('merges the two parts back (an instructor may), with the original figures', async () => {
		await expect(merge(otherPilot, id, secondId)).rejects.toSatisfy(refusedWith(403));
		const to = await redirectTo(merge(instructor, secondId, id));
		expect(to).toContain(id);
		expect(await row(secondId)).toBeUndefined();
		const merged = await row(id);
		expect(merged!.sampleCount).toBe(3301);
		const s = merged!.summary!;
		expect(s.fuelUsedL).toBeCloseTo(original.fuelUsedL, 9);
		expect(s.engineTimeS).toBe(original.engineTimeS);
		expect(s.onBoardAtShutdownL).toBeCloseTo(original.onBoardAtShutdownL!, 9);
		expect(s.legs).toHaveLength(2);
		await expectDerived('after the merge');
	});

	it('merges two flights a recorder restart cut in two; both uploads are kept and a re-upload finds the merged flight', async () => {
		const start = Date.UTC(2026, 4, 2, 9);
		const first = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start, seconds: 600, flowUsgph: 8 }), fileName: 'a.csv' });
		const laterFile = steadyFile({ start: start + 660_000, seconds: 600, flowUsgph: 9 });
		const second = await upload(club.pilot, { aircraftId: club.trainer.id, file: laterFile, fileName: 'b.csv' });
		expect([first.status, second.status]).toEqual([201, 201]);
		const [sa, sb] = [await summaryOf(first.body.flightId), await summaryOf(second.body.flightId)];
		const uploadsBefore = await uploadCount();
		await redirectTo(merge(club.pilot, first.body.flightId, second.body.flightId));
		const merged = await row(first.body.flightId);
		expect(merged!.sampleCount).toBe(1202);
		// The 60 s silence in flight is a gap filled with the higher flow (9 US gal/h): beyond the two parts' fuel.
		const gapL = (9 * LITRES_PER_US_GALLON * 60) / 3600;
		expect(merged!.summary!.fuelUsedL).toBeCloseTo(sa.fuelUsedL + sb.fuelUsedL + gapL, 6);
		expect(await uploadCount()).toBe(uploadsBefore);
		const again = await upload(club.pilot, { aircraftId: club.trainer.id, file: laterFile, fileName: 'b.csv' });
		expect(again.status).toBe(200);
		expect(again.body).toMatchObject({ outcome: 'duplicate', flightId: first.body.flightId, inTrash: false });
		await expectDerived('after merging two uploads');
	});

	it('refuses to merge flights further apart than one trip, and does not offer them', async () => {
		const start = Date.UTC(2026, 4, 5, 9);
		const a = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start, seconds: 600, flowUsgph: 8 }), fileName: 'far-a.csv' });
		// The next day: 24 h after the first one's start, beyond MERGE_MAX_GAP_S.
		const b = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: start + 24 * 3600_000, seconds: 600, flowUsgph: 8 }), fileName: 'far-b.csv' });
		const far = (await merge(club.pilot, a.body.flightId, b.body.flightId)) as { status: number; data: { errors: Record<string, string> } };
		expect(far.status).toBe(409);
		expect(far.data.errors.otherId).toMatch(/23 h apart/);
		expect((await row(a.body.flightId))!.sampleCount).toBe(601);
		const ra = (await row(a.body.flightId))!;
		expect((await mergeNeighbours(ra)).after).toBeNull();
	});

	it('refuses to merge flights of different aircraft, or flights that overlap, with a clear 409', async () => {
		const start = Date.UTC(2026, 4, 3, 9);
		const x = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start, seconds: 600, flowUsgph: 8 }), fileName: 'x.csv' });
		const y = await upload(club.pilot, { aircraftId: club.tourer.id, file: steadyFile({ start: start + 3600_000, seconds: 600, flowUsgph: 12 }), fileName: 'y.csv' });
		const z = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: start + 3600_000, seconds: 600, flowUsgph: 8 }), fileName: 'z.csv' });
		const other = (await merge(club.pilot, x.body.flightId, y.body.flightId)) as { status: number; data: { errors: Record<string, string> } };
		expect(other.status).toBe(409);
		expect(other.data.errors.otherId).toMatch(/different aircraft/);
		// Make z overlap x (its samples moved 55 minutes earlier).
		await db.update(samples).set({ t: sql`${samples.t} - interval '55 minutes'` }).where(eq(samples.flightId, z.body.flightId));
		const overlap = (await merge(club.pilot, x.body.flightId, z.body.flightId)) as { status: number; data: { errors: Record<string, string> } };
		expect(overlap.status).toBe(409);
		expect(overlap.data.errors.otherId).toMatch(/overlap/);
		expect((await row(x.body.flightId))!.sampleCount).toBe(601);
		expect((await row(z.body.flightId))!.sampleCount).toBe(601);
	});
});

describe('uploads and the trash', () => {
	const trash = (user: AuthUser, id: string) => flightActions.trash(routeEvent(user, FLIGHT_ROUTE, { org: club.slug, id }, formOf({})) as never);
	const restore = (user: AuthUser, id: string) => trashActions.restore(routeEvent(user, '/o/[org]/trash', { org: club.slug }, formOf({ id })) as never);

	it('a file whose flight is in the trash is a duplicate that points to the trash, not to a missing page', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 5, 1, 9), seconds: 300, flowUsgph: 8 });
		const first = await upload(club.pilot, { aircraftId: club.diesel.id, file, fileName: 't.csv' });
		await redirectTo(trash(club.pilot, first.body.flightId));
		const again = await upload(club.pilot, { aircraftId: club.diesel.id, file, fileName: 't.csv' });
		expect(again.status).toBe(200);
		expect(again.body).toMatchObject({ outcome: 'duplicate', flightId: first.body.flightId, inTrash: true, url: `/o/${club.slug}/trash` });
		expect(again.body.message).toMatch(/in the trash/);
	});

	it('a flight in the trash overlaps nothing; restoring it over a newer flight of the same time is refused', async () => {
		const start = Date.UTC(2026, 5, 2, 9);
		const old = await upload(club.pilot, { aircraftId: club.diesel.id, file: steadyFile({ start, seconds: 600, flowUsgph: 6 }), fileName: 'o.csv' });
		await redirectTo(trash(club.pilot, old.body.flightId));
		const fresh = await upload(club.pilot, { aircraftId: club.diesel.id, file: steadyFile({ start: start + 60_000, seconds: 600, flowUsgph: 7 }), fileName: 'n.csv' });
		expect(fresh.status).toBe(201);
		const r = (await restore(club.pilot, old.body.flightId)) as { status: number; data: { errors: Record<string, string> } };
		expect(r.status).toBe(409);
		expect(r.data.errors.form).toMatch(/covers the same time/);
		expect((await row(old.body.flightId))!.deletedAt).not.toBeNull();
	});

	it('emptying the trash keeps an upload that the kept part of a split still uses', async () => {
		const res = await upload(club.pilot, { aircraftId: club.diesel.id, file: tripWithStop(Date.UTC(2026, 5, 3, 9)), fileName: 'trip.csv' });
		const to = await redirectTo(split(club.pilot, res.body.flightId, '0'));
		const second = new URL(to, 'http://x').searchParams.get('split')!;
		const uploadId = (await row(res.body.flightId))!.uploadId!;
		await redirectTo(trash(club.pilot, second));
		const admin = await makeUser('Abe Admin');
		await db.insert(memberships).values({ orgId: club.orgId, userId: admin.id, role: 'admin' });
		await trashActions.empty(routeEvent(admin, '/o/[org]/trash', { org: club.slug }, formOf({})) as never);
		expect(await db.select({ id: uploads.id }).from(uploads).where(eq(uploads.id, uploadId))).toHaveLength(1);
		expect((await row(res.body.flightId))!.uploadId).toBe(uploadId);
	});
});
