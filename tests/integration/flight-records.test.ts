// Keeping flight records tidy, against the real database and the real form actions: editing a
// flight's details (who may, field errors keep the input and store nothing), claiming a
// recorder-opened flight and setting its pilot, the recorder's pilot flying today, and the trash.
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, memberships, recorders, type Flight } from '$lib/server/db/schema';
import { hashToken, newToken } from '$lib/server/tokens';
import { listFlights } from '$lib/server/flights/list';
import { flightListQuerySchema } from '$lib/schemas/flight';
import { actions as flightActions, load as flightLoad } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { actions as liveActions, load as liveLoad } from '../../src/routes/o/[org]/flights/[id]/live/+page.server';
import { actions as recorderActions } from '../../src/routes/o/[org]/recorders/+page.server';
import { call } from './live-fixtures';
import { actions as trashActions, load as trashLoad } from '../../src/routes/o/[org]/trash/+page.server';
import { aircraft, flightFigures, uploads } from '$lib/server/db/schema';
import { isRedirect } from '@sveltejs/kit';
import { makeClub, makeUser, steadyFile, upload, type Club } from './upload-fixture';
import type { AuthUser } from '$lib/server/auth';
import { formOf, routeEvent } from './route-event';

const FLIGHT_ROUTE = '/o/[org]/flights/[id]';
const LIVE_ROUTE = '/o/[org]/flights/[id]/live';
const RECORDERS_ROUTE = '/o/[org]/recorders';
let recorderToken = '';
let recorderId = '';
let club: Club;
let instructor: AuthUser;
let admin: AuthUser;
let otherPilot: AuthUser;
let flightId = '';

const event = routeEvent;
const form = formOf;
type Failure = { status: number; data: { errors: Record<string, string>; values: Record<string, string> } };
const refusedWith = (status: number) => (e: unknown) => isHttpError(e) && e.status === status;
const flightRow = async (id: string): Promise<Flight> => (await db.select().from(flights).where(eq(flights.id, id)))[0];
const details = (user: AuthUser, v: Record<string, string>, id = flightId) => flightActions.details(event(user, FLIGHT_ROUTE, { org: club.slug, id }, form(v)) as never);

beforeAll(async () => {
	club = await makeClub('Records Club');
	instructor = await makeUser('Ines Instructor');
	admin = await makeUser('Ada Admin');
	otherPilot = await makeUser('Olu Otherpilot');
	await db.insert(memberships).values([
		{ orgId: club.orgId, userId: instructor.id, role: 'instructor' },
		{ orgId: club.orgId, userId: admin.id, role: 'admin' },
		{ orgId: club.orgId, userId: otherPilot.id, role: 'pilot' }
	]);
	const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 3, 1, 9), seconds: 600, flowUsgph: 8 }), fileName: 'test.csv' });
	expect(res.status).toBe(201);
	flightId = res.body.flightId;
	recorderToken = newToken('bdr_');
	const [r] = await db.insert(recorders).values({ orgId: club.orgId, aircraftId: club.tourer.id, name: 'panel', tokenHash: hashToken(recorderToken), tokenHint: recorderToken.slice(0, 10) }).returning();
	recorderId = r.id;
});

/** The recorder closes its open flight, if any, and opens a new one, saying nothing of the pilot. */
async function recorderOpens(): Promise<string> {
	await call('close', recorderToken, {});
	const r = await call('open', recorderToken, {});
	expect(r.status).toBeLessThan(300);
	return r.body.flightId as string;
}

describe('editing a flight’s details', () => {
	it('lets the flight’s pilot set title, route and instructor', async () => {
		const r = await details(club.pilot, { title: 'Circuits at Merrow', route: 'KSTR – KSTR', instructorId: instructor.id });
		expect(r).toEqual({ action: 'details', saved: true });
		const f = await flightRow(flightId);
		expect([f.title, f.route, f.instructorId, f.pilotId]).toEqual(['Circuits at Merrow', 'KSTR – KSTR', instructor.id, club.pilot.id]);
	});

	it('refuses the pilot changing the pilot, keeping the input and storing nothing', async () => {
		const r = (await details(club.pilot, { title: 'Handed over', route: '', pilotId: otherPilot.id })) as Failure;
		expect(r.status).toBe(400);
		expect(Object.keys(r.data.errors)).toEqual(['pilotId']);
		expect(r.data.values.title).toBe('Handed over');
		const f = await flightRow(flightId);
		expect([f.title, f.pilotId]).toEqual(['Circuits at Merrow', club.pilot.id]);
	});

	it('refuses an invisible character in the title with the field named, storing nothing', async () => {
		const r = (await details(club.pilot, { title: 'Circuits \u202eetal', route: 'X' })) as Failure;
		expect(r.status).toBe(400);
		expect(Object.keys(r.data.errors)).toEqual(['title']);
		expect(r.data.values.route).toBe('X');
		expect((await flightRow(flightId)).route).toBe('KSTR – KSTR');
	});

	it('refuses an instructor who is not an instructor of this organisation', async () => {
		const r = (await details(club.pilot, { title: 'x', route: '', instructorId: otherPilot.id })) as Failure;
		expect(r.status).toBe(400);
		expect(r.data.errors.instructorId).toMatch(/instructor or admin/);
		expect((await flightRow(flightId)).instructorId).toBe(instructor.id);
	});

	it('refuses the viewer and another pilot (403)', async () => {
		await expect(details(club.viewer, { title: 'mine now', route: '' })).rejects.toSatisfy(refusedWith(403));
		await expect(details(otherPilot, { title: 'mine now', route: '' })).rejects.toSatisfy(refusedWith(403));
		expect((await flightRow(flightId)).title).toBe('Circuits at Merrow');
	});

	it('lets an instructor or an admin set the pilot, but only to a member who flies', async () => {
		const bad = (await details(instructor, { title: 'Circuits at Merrow', route: '', pilotId: club.viewer.id })) as Failure;
		expect(bad.status).toBe(400);
		expect(bad.data.errors.pilotId).toBeDefined();
		expect(await details(admin, { title: 'Circuits at Merrow', route: '', pilotId: otherPilot.id })).toEqual({ action: 'details', saved: true });
		expect((await flightRow(flightId)).pilotId).toBe(otherPilot.id);
		// The former pilot no longer sees it; the new one does, with the choice of pilot withheld.
		await expect(flightLoad(event(club.pilot, FLIGHT_ROUTE, { org: club.slug, id: flightId }) as never)).rejects.toSatisfy(refusedWith(403));
		const seen = (await flightLoad(event(otherPilot, FLIGHT_ROUTE, { org: club.slug, id: flightId }) as never)) as { may: { edit: boolean; setPilot: boolean } };
		expect(seen.may).toMatchObject({ edit: true, setPilot: false });
		await details(instructor, { title: 'Circuits at Merrow', route: '', pilotId: club.pilot.id });
	});
});

describe('a recorder-opened flight gets its pilot', () => {
	const live = (user: AuthUser, id: string) => liveLoad(event(user, LIVE_ROUTE, { org: club.slug, id }) as never) as Promise<{ unclaimed: boolean; may: { claim: boolean; setPilot: boolean; edit: boolean } }>;
	const claim = (user: AuthUser, id: string) => liveActions.claim(event(user, LIVE_ROUTE, { org: club.slug, id }, form({})) as never);
	const setPilotAs = (user: AuthUser, id: string, pilotId: string) => liveActions.setPilot(event(user, LIVE_ROUTE, { org: club.slug, id }, form({ pilotId })) as never);

	it('opens without a pilot; the club’s pilots see it, listed, for claiming', async () => {
		const id = await recorderOpens();
		expect((await flightRow(id)).pilotId).toBeNull();
		const seen = await live(club.pilot, id);
		expect(seen.unclaimed).toBe(true);
		expect(seen.may).toMatchObject({ claim: true, setPilot: false, edit: false });
		const list = await listFlights({ orgId: club.orgId, userId: otherPilot.id, role: 'pilot' }, flightListQuerySchema.parse({}));
		expect(list.flights.map((r) => r.id)).toContain(id);
		// The viewer sees every flight but does not fly: no claim.
		expect((await live(club.viewer, id)).may.claim).toBe(false);
		await expect(claim(club.viewer, id)).rejects.toSatisfy(refusedWith(403));
		expect((await flightRow(id)).pilotId).toBeNull();
	});

	it('is the claiming pilot’s from then on, and other pilots lose sight of it', async () => {
		const id = await recorderOpens();
		expect(await claim(club.pilot, id)).toEqual({ action: 'claim', claimed: true });
		// Claimed, it is no longer open to other pilots at all.
		await expect(claim(otherPilot, id)).rejects.toSatisfy(refusedWith(403));
		expect((await flightRow(id)).pilotId).toBe(club.pilot.id);
		// His own flight now: the replay page opens with the right to correct its fuel inputs.
		const mine = (await flightLoad(event(club.pilot, FLIGHT_ROUTE, { org: club.slug, id }) as never)) as { may: { edit: boolean } };
		expect(mine.may.edit).toBe(true);
		expect((await live(club.pilot, id)).unclaimed).toBe(false);
		await expect(live(otherPilot, id)).rejects.toSatisfy(refusedWith(403));
	});

	it('a second claim by someone who still sees the flight answers 409', async () => {
		const id = await recorderOpens();
		await claim(club.pilot, id);
		await expect(claim(instructor, id)).resolves.toMatchObject({ status: 409 });
	});

	it('lets instructors and admins set the pilot, not pilots or viewers', async () => {
		const id = await recorderOpens();
		await expect(setPilotAs(club.pilot, id, club.pilot.id)).rejects.toSatisfy(refusedWith(403));
		await expect(setPilotAs(club.viewer, id, club.pilot.id)).rejects.toSatisfy(refusedWith(403));
		expect(await setPilotAs(instructor, id, club.viewer.id)).toMatchObject({ status: 400 });
		expect((await flightRow(id)).pilotId).toBeNull();
		expect(await setPilotAs(instructor, id, otherPilot.id)).toEqual({ action: 'setPilot', saved: true });
		expect((await flightRow(id)).pilotId).toBe(otherPilot.id);
	});

	it('gives new flights the pilot flying today, assigned by an admin on the recorder', async () => {
		const assign = (user: AuthUser, pilotId: string) => recorderActions.flyingToday(event(user, RECORDERS_ROUTE, { org: club.slug }, form({ id: recorderId, pilotId })) as never);
		await expect(assign(club.pilot, otherPilot.id)).rejects.toSatisfy(refusedWith(403));
		expect(await assign(admin, club.viewer.id)).toMatchObject({ status: 400 });
		expect(await assign(admin, otherPilot.id)).toEqual({ action: 'flyingToday', recorderId });
		const id = await recorderOpens();
		expect((await flightRow(id)).pilotId).toBe(otherPilot.id);
		// A flight opened by samples alone (no open call) gets the pilot too.
		expect((await call('close', recorderToken, {})).status).toBe(200);
		const sent = await call('samples', recorderToken, { samples: [{ seq: 0, t: new Date().toISOString(), flow: 30, gs: 0, dtg: 10 }] });
		expect(sent.status).toBeLessThan(300);
		expect((await flightRow(sent.body.flightId)).pilotId).toBe(otherPilot.id);
		// Yesterday's assignment does not carry over: the next flight waits to be claimed.
		await db.update(recorders).set({ flyingOn: '2000-01-01' }).where(eq(recorders.id, recorderId));
		expect((await flightRow(await recorderOpens())).pilotId).toBeNull();
	});
});

describe('the trash', () => {
	const TRASH_ROUTE = '/o/[org]/trash';
	let id = '';
	let uploadId = '';
	const lastOnBoard = async () => (await db.select({ l: aircraft.lastOnBoardL }).from(aircraft).where(eq(aircraft.id, club.diesel.id)))[0].l;
	const trash = (user: AuthUser) => flightActions.trash(event(user, FLIGHT_ROUTE, { org: club.slug, id }, form({})) as never);
	const restore = (user: AuthUser) => trashActions.restore(event(user, TRASH_ROUTE, { org: club.slug }, form({ id })) as never);
	const empty = (user: AuthUser) => trashActions.empty(event(user, TRASH_ROUTE, { org: club.slug }, form({})) as never);

	beforeAll(async () => {
		// Two flights of the diesel: the later one sets the aircraft's last fuel on board.
		const first = await upload(club.pilot, { aircraftId: club.diesel.id, file: steadyFile({ start: Date.UTC(2026, 3, 2, 9), seconds: 900, flowUsgph: 6 }), fileName: 'a.csv' });
		const second = await upload(club.pilot, { aircraftId: club.diesel.id, file: steadyFile({ start: Date.UTC(2026, 3, 3, 9), seconds: 1800, flowUsgph: 6 }), fileName: 'b.csv' });
		expect([first.status, second.status]).toEqual([201, 201]);
		id = second.body.flightId;
		uploadId = (await flightRow(id)).uploadId!;
	});

	it('refuses the viewer and other pilots; the pilot moves his flight there and it disappears', async () => {
		const before = await lastOnBoard();
		await expect(trash(club.viewer)).rejects.toSatisfy(refusedWith(403));
		await expect(trash(otherPilot)).rejects.toSatisfy(refusedWith(403));
		await expect(trash(club.pilot)).rejects.toSatisfy((e) => isRedirect(e));
		const f = await flightRow(id);
		expect(f.deletedAt).not.toBeNull();
		expect(f.summary).toBeNull();
		expect(await db.select().from(flightFigures).where(eq(flightFigures.flightId, id))).toEqual([]);
		// The aircraft's last fuel on board is now the earlier flight's (more fuel: it burned less).
		expect(await lastOnBoard()).toBeGreaterThan(before!);
		await expect(flightLoad(event(admin, FLIGHT_ROUTE, { org: club.slug, id }) as never)).rejects.toSatisfy(refusedWith(404));
		const list = await listFlights({ orgId: club.orgId, userId: admin.id, role: 'admin' }, flightListQuerySchema.parse({}));
		expect(list.flights.map((r) => r.id)).not.toContain(id);
		const seen = (await trashLoad(event(club.pilot, TRASH_ROUTE, { org: club.slug }) as never)) as { flights: { id: string }[]; mayEmpty: boolean };
		expect(seen.flights.map((x) => x.id)).toEqual([id]);
		expect(seen.mayEmpty).toBe(false);
	});

	it('is restored by its editors with its figures back', async () => {
		const trashed = await lastOnBoard();
		await expect(restore(otherPilot)).rejects.toSatisfy(refusedWith(403));
		expect(await restore(instructor)).toEqual({ action: 'restore', restored: id });
		const f = await flightRow(id);
		expect(f.deletedAt).toBeNull();
		expect(f.summary).not.toBeNull();
		expect(await lastOnBoard()).toBeLessThan(trashed!);
	});

	it('is emptied by an admin only, which deletes the flight and its original upload', async () => {
		await expect(trash(club.pilot)).rejects.toSatisfy((e) => isRedirect(e));
		expect((await db.select().from(uploads).where(eq(uploads.id, uploadId))).length).toBe(1);
		await expect(empty(instructor)).rejects.toSatisfy(refusedWith(403));
		expect(await empty(admin)).toEqual({ action: 'empty', deleted: 1 });
		expect(await db.select().from(flights).where(eq(flights.id, id))).toEqual([]);
		expect(await db.select().from(uploads).where(eq(uploads.id, uploadId))).toEqual([]);
	});
});
