// Plans made before the flight, against the real database: a waiting plan is taken by the upload
// or live flight of its aircraft that starts within WAITING_PLAN_WINDOW_MS of its expected
// departure (the nearest one when several wait), in the flight's own transaction; outside the
// window it keeps waiting. The form that makes one refuses bad input field by field and stores
// nothing; the instructor's list shows it and removes it.
import { describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { and, count, eq, isNull } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, fuelPlans, memberships } from '$lib/server/db/schema';
import { createWaitingPlan, waitingPlansOf } from '$lib/server/plans';
import { WAITING_PLAN_WINDOW_MS } from '$lib/wire/plan';
import type { PlanInput } from '$lib/schemas/plan';
import type { AuthUser } from '$lib/server/auth';
import { makeClub, makeUser, sample, upload, type Club } from './upload-fixture';
import { call, liveWorld, samples, T0 } from './live-fixtures';
import { actions as newPlanActions, load as newPlanLoad } from '../../src/routes/o/[org]/plans/new/+page.server';
import { actions as studentsActions, load as studentsLoad } from '../../src/routes/o/[org]/students/+page.server';
import { formOf, routeEvent } from './route-event';

const GAL = 3.785411784; // NIST Handbook 44, Appendix C
/** The cross-country sample's first row is at 08:42:00 UTC on 20 June 2026. */
const XC_START = Date.parse('2026-06-20T08:42:00Z');
const H = 3600 * 1000;

const plan: PlanInput = {
	startOnBoardL: 62 * GAL,
	taxiL: 0.8 * GAL,
	climbL: GAL,
	reserveRule: 'faa-91.151-vfr-day',
	reserveCustomMin: null,
	reserveFlowLph: 13.4 * GAL,
	tolerancePercent: 10,
	legs: [{ to: 'CAIRNS', distanceNm: 36.2, gsKt: 120, timeMin: null, flowLph: 13.4 * GAL, fuelL: null, refuelToL: null }]
};

async function clubWithInstructor() {
	const club = await makeClub('Waiting Plans Club');
	const instructor = await makeUser('Wren Instructor');
	await db.insert(memberships).values({ orgId: club.orgId, userId: instructor.id, role: 'instructor' });
	return { club, instructor };
}

const waitFor = (club: Club, instructor: AuthUser, at: number, aircraftId = club.tourer.id, pilot: string | null = club.pilot.id) =>
	createWaitingPlan(club.orgId, { aircraft: aircraftId, departure: new Date(at), pilot }, plan, instructor.id);

const uploadXc = (club: Club, user: AuthUser = club.pilot) =>
	upload(user, { aircraftId: club.tourer.id, file: sample('kestrel-crosscountry-3leg.csv'), fileName: 'xc.csv', declaration: 'onBoard', amount: '62' });

const planOf = (id: string) => db.query.fuelPlans.findFirst({ where: eq(fuelPlans.id, id) });

const event = routeEvent;
const form = formOf;

describe('an upload takes a waiting plan', () => {
	it('inside the window: the plan becomes the flight’s, with its pilot and instructor', async () => {
		const { club, instructor } = await clubWithInstructor();
		// An instructor uploads the student's file: the plan, not the uploader, says who flew.
		const p = await waitFor(club, instructor, XC_START + 2.5 * H);
		const res = await uploadXc(club, instructor);
		expect(res.status).toBe(201);
		const attached = await planOf(p.id);
		expect(attached!.flightId).toBe(res.body.flightId);
		const [f] = await db.select().from(flights).where(eq(flights.id, res.body.flightId));
		expect(f.pilotId).toBe(club.pilot.id);
		expect(f.instructorId).toBe(instructor.id);
		expect(await waitingPlansOf(club.orgId)).toEqual([]);
	});

	it('outside the window: the plan keeps waiting, the flight has none', async () => {
		const { club, instructor } = await clubWithInstructor();
		const early = await waitFor(club, instructor, XC_START - WAITING_PLAN_WINDOW_MS - 60_000);
		const late = await waitFor(club, instructor, XC_START + WAITING_PLAN_WINDOW_MS + 60_000);
		// The right time but another aircraft of the club.
		const other = await waitFor(club, instructor, XC_START, club.trainer.id);
		const res = await uploadXc(club);
		expect(res.status).toBe(201);
		for (const p of [early, late, other]) expect((await planOf(p.id))!.flightId).toBeNull();
		expect((await db.select({ n: count() }).from(fuelPlans).where(eq(fuelPlans.flightId, res.body.flightId)))[0].n).toBe(0);
		const [f] = await db.select().from(flights).where(eq(flights.id, res.body.flightId));
		expect(f.instructorId).toBeNull();
		expect((await waitingPlansOf(club.orgId)).map((w) => w.id).sort()).toEqual([early.id, late.id, other.id].sort());
	});

	it('two plans waiting: the one nearest the start is taken, the other keeps waiting', async () => {
		const { club, instructor } = await clubWithInstructor();
		const far = await waitFor(club, instructor, XC_START - 2 * H);
		const near = await waitFor(club, instructor, XC_START + 40 * 60_000);
		const res = await uploadXc(club);
		expect(res.status).toBe(201);
		expect((await planOf(near.id))!.flightId).toBe(res.body.flightId);
		expect((await planOf(far.id))!.flightId).toBeNull();
	});

	it('a refused upload leaves the plan waiting', async () => {
		const { club, instructor } = await clubWithInstructor();
		const p = await waitFor(club, instructor, XC_START);
		// More than the tank holds: the declaration is refused, the transaction rolled back.
		const res = await upload(club.pilot, { aircraftId: club.tourer.id, file: sample('kestrel-crosscountry-3leg.csv'), fileName: 'xc.csv', declaration: 'onBoard', amount: '500' });
		expect(res.status).toBe(400);
		expect((await planOf(p.id))!.flightId).toBeNull();
	});
});

describe('a live flight takes a waiting plan', () => {
	it('a recorder’s first batch inside the window attaches the plan; a second flight finds none', async () => {
		const w = await liveWorld();
		const p = await createWaitingPlan(w.orgId, { aircraft: w.aircraftA, departure: new Date(T0 + 90 * 60_000), pilot: w.pilot.id }, plan, w.instructor.id);
		const later = await createWaitingPlan(w.orgId, { aircraft: w.aircraftA, departure: new Date(T0 + 10 * H), pilot: null }, plan, w.instructor.id);
		const r = await call('samples', w.tokenA, { samples: samples(0, 5) });
		expect(r.status).toBe(200);
		const [f] = await db.select().from(flights).where(eq(flights.aircraftId, w.aircraftA));
		expect((await planOf(p.id))!.flightId).toBe(f.id);
		expect(f.pilotId).toBe(w.pilot.id);
		expect(f.instructorId).toBe(w.instructor.id);
		expect((await planOf(later.id))!.flightId).toBeNull();
	});

	it('an explicit open attaches the plan waiting for about now', async () => {
		const w = await liveWorld();
		const p = await createWaitingPlan(w.orgId, { aircraft: w.aircraftB, departure: new Date(Date.now() - 20 * 60_000), pilot: null }, plan, w.instructor.id);
		const r = await call('open', w.tokenB, { declaration: { kind: 'full' } });
		expect(r.status).toBeLessThan(300);
		const attached = await planOf(p.id);
		expect(attached!.flightId).toBe(r.body.flightId);
	});
});

describe('the waiting-plan form and list', () => {
	const NEW = '/o/[org]/plans/new';
	const STUDENTS = '/o/[org]/students';
	const planValues = (club: Club, extra: Record<string, string> = {}) => ({
		aircraft: club.tourer.id,
		departure: '2026-06-21 09:00',
		pilot: club.pilot.id,
		unit: 'usgal',
		start: '62',
		taxi: '0.8',
		climb: '1',
		reserveRule: 'faa-91.151-vfr-day',
		reserveMin: '',
		reserveFlow: '13.4',
		tolerance: '10',
		'legs.0.to': 'CAIRNS',
		'legs.0.distance': '36.2',
		'legs.0.gs': '120',
		'legs.0.flow': '13.4',
		...extra
	});

	it('refuses bad input field by field, keeping it, and stores nothing', async () => {
		const { club, instructor } = await clubWithInstructor();
		const outsider = await makeUser('Olly Outsider');
		const r = (await newPlanActions.save(event(instructor, NEW, { org: club.slug }, form(planValues(club, { departure: 'tomorrow', 'legs.0.distance': '' }))) as never)) as {
			status: number;
			data: { errors: Record<string, string>; values: Record<string, string> };
		};
		expect(r.status).toBe(400);
		expect(Object.keys(r.data.errors).sort()).toEqual(['departure', 'legs.0.distance']);
		expect(r.data.values.departure).toBe('tomorrow');
		const notMember = (await newPlanActions.save(event(instructor, NEW, { org: club.slug }, form(planValues(club, { pilot: outsider.id }))) as never)) as { status: number; data: { errors: Record<string, string> } };
		expect(notMember.status).toBe(400);
		expect(notMember.data.errors.pilot).toMatch(/not a member/);
		const foreign = (await newPlanActions.save(event(instructor, NEW, { org: club.slug }, form(planValues(club, { aircraft: crypto.randomUUID() }))) as never)) as { status: number; data: { errors: Record<string, string> } };
		expect(foreign.status).toBe(400);
		expect(foreign.data.errors.aircraft).toBeDefined();
		expect((await db.select({ n: count() }).from(fuelPlans).where(eq(fuelPlans.orgId, club.orgId)))[0].n).toBe(0);
	});

	it('refuses a pilot (403); saves for the instructor, lists it, and removes it', async () => {
		const { club, instructor } = await clubWithInstructor();
		await expect(newPlanActions.save(event(club.pilot, NEW, { org: club.slug }, form(planValues(club))) as never)).rejects.toSatisfy((e) => isHttpError(e) && e.status === 403);
		const page = (await newPlanLoad(event(instructor, NEW, { org: club.slug }, undefined, `?aircraft=${club.trainer.id}`) as never)) as { values: Record<string, string>; aircraft: { id: string }[] };
		expect(page.values.aircraft).toBe(club.trainer.id);
		expect(page.aircraft.map((a) => a.id)).toContain(club.tourer.id);
		await expect(newPlanActions.save(event(instructor, NEW, { org: club.slug }, form(planValues(club))) as never)).rejects.toSatisfy(
			(e: unknown) => typeof e === 'object' && e !== null && 'status' in e && (e as { status: number }).status === 303
		);
		const [stored] = await db.select().from(fuelPlans).where(and(eq(fuelPlans.orgId, club.orgId), isNull(fuelPlans.flightId)));
		expect(stored.expectedDepartureAt!.toISOString()).toBe('2026-06-21T09:00:00.000Z');
		expect(stored.startOnBoardL / GAL).toBeCloseTo(62, 9);
		const list = (await studentsLoad(event(instructor, STUDENTS, { org: club.slug }) as never)) as { waiting: { id: string; registration: string; pilot: string | null; route: string[] }[] };
		expect(list.waiting).toEqual([expect.objectContaining({ id: stored.id, registration: 'BD-TTT', pilot: 'Pat Pilot', route: ['CAIRNS'] })]);
		await expect(studentsActions.removeWaiting(event(club.pilot, STUDENTS, { org: club.slug }, form({ id: stored.id })) as never)).rejects.toSatisfy((e) => isHttpError(e) && e.status === 403);
		expect(await studentsActions.removeWaiting(event(instructor, STUDENTS, { org: club.slug }, form({ id: stored.id })) as never)).toMatchObject({ action: 'removeWaiting', removed: true });
		expect(await waitingPlansOf(club.orgId)).toEqual([]);
		const again = (await studentsActions.removeWaiting(event(instructor, STUDENTS, { org: club.slug }, form({ id: stored.id })) as never)) as { status: number };
		expect(again.status).toBe(404);
	});
});
