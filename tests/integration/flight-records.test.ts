// Keeping flight records tidy, against the real database and the real form actions: editing a
// flight's details (who may, field errors keep the input and store nothing), claiming a
// recorder-opened flight and setting its pilot, the recorder's pilot flying today, and the trash.
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError, type RequestEvent } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, memberships, type Flight } from '$lib/server/db/schema';
import { actions as flightActions, load as flightLoad } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { makeClub, makeUser, steadyFile, upload, type Club } from './upload-fixture';
import type { AuthUser } from '$lib/server/auth';

const FLIGHT_ROUTE = '/o/[org]/flights/[id]';
let club: Club;
let instructor: AuthUser;
let admin: AuthUser;
let otherPilot: AuthUser;
let flightId = '';

function event(user: AuthUser | null, route: string, params: Record<string, string>, body?: FormData) {
	const url = new URL('http://127.0.0.1:4173/');
	return {
		locals: { user, session: null, authVia: user ? 'session' : null },
		params,
		url,
		route: { id: route },
		request: new Request(url, { method: body ? 'POST' : 'GET', body }),
		setHeaders: () => {}
	} as unknown as RequestEvent;
}
const form = (v: Record<string, string>) => {
	const fd = new FormData();
	for (const [k, x] of Object.entries(v)) fd.set(k, x);
	return fd;
};
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
});

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
