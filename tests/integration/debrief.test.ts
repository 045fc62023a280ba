// Plans and debriefs against the real database, on the demo's solo cross-country recorder file:
// the plan form's write path (bad input stores nothing), import from GPX, waypoint passages and
// plan against actual from the stored samples, editing notes, sign-off and publishing (the
// student's e-mail), and share links (hash only, expiry, revocation).
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { count, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { debriefShares, flightFigures, flightNotes, flights, fuelPlans, memberships } from '$lib/server/db/schema';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { createShare, debriefReport, flightOfShare, publishDebrief, revokeShare, signOff } from '$lib/server/debriefs';
import { addNote, editNote } from '$lib/server/flights/edit';
import { hashToken } from '$lib/server/tokens';
import { OFF_PLAN_WORDS } from '$lib/fuel';
import { actions as planActions, load as planLoad } from '../../src/routes/o/[org]/flights/[id]/plan/+page.server';
import { actions as debriefActions, load as debriefLoad } from '../../src/routes/o/[org]/flights/[id]/debrief/+page.server';
import { load as shareLoad } from '../../src/routes/share/[token]/+page.server';
import { makeClub, makeUser, sample, upload, type Club } from './upload-fixture';
import { waitForMail } from '../helpers/mailbox';
import { DEMO } from '../../scripts/demo-scenario';
import type { AuthUser } from '$lib/server/auth';
import { routeEvent } from './route-event';

const GAL = LITRES_PER_US_GALLON; // NIST Handbook 44, Appendix C
let club: Club;
let instructor: AuthUser;
let flightId = '';

const event = routeEvent;
const form = (v: Record<string, string | Blob>, name?: string) => {
	const fd = new FormData();
	for (const [k, x] of Object.entries(v)) (x instanceof Blob ? fd.set(k, x, name ?? 'file') : fd.set(k, x));
	return fd;
};
const PLAN_ROUTE = '/o/[org]/flights/[id]/plan';
const DEBRIEF_ROUTE = '/o/[org]/flights/[id]/debrief';
const params = () => ({ org: club.slug, id: flightId });

/** The demo plan as the form would send it (US gal). */
function demoPlanForm(): Record<string, string> {
	const p = DEMO.crossCountryPlan;
	const v: Record<string, string> = { unit: 'usgal', start: String(p.startOnBoard), taxi: String(p.taxi), climb: String(p.climb), reserveRule: p.reserveRule, reserveMin: '', reserveFlow: String(p.reserveFlow), tolerance: '' };
	p.legs.forEach((l, i) => {
		Object.assign(v, { [`legs.${i}.to`]: l.to, [`legs.${i}.distance`]: String(l.distanceNm), [`legs.${i}.gs`]: String(l.gsKt), [`legs.${i}.flow`]: String(l.flow), [`legs.${i}.refuel`]: 'refuelTo' in l ? String(l.refuelTo) : '' });
	});
	return v;
}

beforeAll(async () => {
	club = await makeClub('Debrief Club');
	instructor = await makeUser('Ines Instructor');
	await db.insert(memberships).values({ orgId: club.orgId, userId: instructor.id, role: 'instructor' });
	const res = await upload(club.pilot, { aircraftId: club.tourer.id, file: sample('kestrel-crosscountry-3leg.csv'), fileName: 'xc.csv', declaration: 'onBoard', amount: '62' });
	expect(res.status).toBe(201);
	flightId = res.body.flightId;
	await db.update(flights).set({ instructorId: instructor.id }).where(eq(flights.id, flightId));
});

describe('plan form', () => {
	it('refuses a bad plan with an error per cell and stores nothing', async () => {
		const v = { ...demoPlanForm(), 'legs.1.distance': 'far', 'legs.3.to': '' };
		const r = (await planActions.save(event(instructor, PLAN_ROUTE, params(), form(v)) as never)) as { status: number; data: { errors: Record<string, string>; values: Record<string, string> } };
		expect(r.status).toBe(400);
		expect(Object.keys(r.data.errors).sort()).toEqual(['legs.1.distance', 'legs.3.to']);
		expect(r.data.values['legs.1.distance']).toBe('far');
		expect((await db.select({ n: count() }).from(fuelPlans))[0].n).toBe(0);
	});

	it('refuses the viewer (403) and saves the plan for the instructor', async () => {
		await expect(planActions.save(event(club.viewer, PLAN_ROUTE, params(), form(demoPlanForm())) as never)).rejects.toSatisfy((e) => isHttpError(e) && e.status === 403);
		const r = await planActions.save(event(instructor, PLAN_ROUTE, params(), form(demoPlanForm())) as never);
		expect(r).toMatchObject({ action: 'save', saved: true });
		const page = (await planLoad(event(instructor, PLAN_ROUTE, params()) as never)) as Exclude<Awaited<ReturnType<typeof planLoad>>, void>;
		expect(page.plan?.legs.map((l) => l.to)).toEqual(['CAIRNS', 'SALTMR', 'BRAMBL', 'FENWAY', 'KESTRL']);
		// FAA-H-8083-25: time = distance ÷ GS; 36.2 NM at 120 kt = 18.1 min.
		expect(page.worked!.legs[0].timeH * 60).toBeCloseTo(18.1, 6);
		expect(page.values['legs.2.refuel']).toBe('88');
	});

	it('fills the legs from a GPX route and says what is wrong with a bad file, storing nothing', async () => {
		const gpx = `<?xml version="1.0"?><gpx version="1.1" xmlns="http://www.topografix.com/GPX/1/1"><rte><rtept lat="47.2" lon="-31.4"><name>KESTRL</name></rtept><rtept lat="47.7" lon="-30.9"><name>SALTMR</name></rtept></rte></gpx>`;
		const ok = (await planActions.import(event(instructor, PLAN_ROUTE, params(), form({ unit: 'usgal', file: new Blob([gpx]) }, 'route.gpx')) as never)) as { imported: number; values: Record<string, string> };
		expect(ok.imported).toBe(1);
		expect(ok.values['legs.0.to']).toBe('SALTMR');
		expect(ok.values.unit).toBe('usgal');
		const bad = (await planActions.import(event(instructor, PLAN_ROUTE, params(), form({ file: new Blob(['<gpx><rte>']) }, 'route.gpx')) as never)) as { status: number; data: { errors: Record<string, string> } };
		expect(bad.status).toBe(400);
		expect(bad.data.errors.file).toMatch(/^route\.gpx: /);
		const plan = await db.query.fuelPlans.findFirst({ where: eq(fuelPlans.flightId, flightId) });
		expect(plan!.legs).toHaveLength(5);
	});
});

describe('plan against actual', () => {
	it('finds the five waypoint passages and marks the leg to FENWAY as off plan', async () => {
		const report = (await debriefReport(flightId))!;
		const c = report.plan!.comparison;
		expect(report.plan!.passages.map((p) => p.wpt)).toEqual(['CAIRNS', 'SALTMR', 'BRAMBL', 'FENWAY', 'KESTRL']);
		expect(c.flownCount).toBe(5);
		expect(c.legs.filter((l) => l.offPlan).map((l) => l.planned.to)).toEqual(['FENWAY']);
		const fenway = c.legs[3];
		expect(fenway.fuelDiffPercent).toBeGreaterThan(c.tolerancePercent);
		// The leg after the refuel starts at the planned refuel amount, 88 US gal (to full, as at Saltmere).
		expect(c.legs[2].planned.onBoardStartL / GAL).toBeCloseTo(88, 9);
		// Actual fuel on board at each passage is the engine's, as the replay shows it.
		for (const l of c.legs) expect(l.actualOnBoardL).toBeGreaterThan(0);
		expect(report.route).toBe('Departure – CAIRNS – SALTMR – BRAMBL – FENWAY – KESTRL');
		expect(OFF_PLAN_WORDS).toBe('Fuel consumption different than planned'); // FAA-S-ACS-6 wording
	});

	it('lists the leaning moments the stored flight figures counted, each a step down in flow', async () => {
		const report = (await debriefReport(flightId))!;
		const [figures] = await db.select().from(flightFigures).where(eq(flightFigures.flightId, flightId));
		expect(report.leaning.length).toBe(figures.leaningMoments);
		for (const m of report.leaning) expect(m.toLph).toBeLessThan(m.fromLph);
	});
});

describe('notes, sign-off and publishing', () => {
	it('lets the author edit a note and no one else without the permission', async () => {
		await addNote({ id: flightId }, { body: 'first words', at: null }, club.pilot.id);
		const [n] = await db.select().from(flightNotes).where(eq(flightNotes.flightId, flightId));
		expect(await editNote({ id: flightId }, n.id, { body: 'stranger', at: null }, instructor.id, false)).toMatchObject({ ok: false });
		expect(await editNote({ id: flightId }, n.id, { body: 'better words', at: new Date('2026-06-20T09:00:00Z') }, club.pilot.id, false)).toEqual({ ok: true });
		const [after] = await db.select().from(flightNotes).where(eq(flightNotes.id, n.id));
		expect(after.body).toBe('better words');
		expect(after.editedAt).not.toBeNull();
	});

	it('hides a draft from the student, refuses publishing before sign-off, then mails the student', async () => {
		const asPilot = (await debriefLoad(event(club.pilot, DEBRIEF_ROUTE, params()) as never)) as { report: unknown; status: string };
		expect(asPilot.report).toBeNull();
		await expect(debriefActions.signOff(event(club.pilot, DEBRIEF_ROUTE, params(), form({})) as never)).rejects.toSatisfy((e) => isHttpError(e) && e.status === 403);
		expect(await publishDebrief(flightId, 'http://127.0.0.1:4173')).toMatchObject({ ok: false, message: expect.stringMatching(/Sign the debrief off/) });
		await signOff(flightId, instructor.id);
		expect(await publishDebrief(flightId, 'http://127.0.0.1:4173')).toEqual({ ok: true, mailedTo: club.pilot.email });
		const mail = await waitForMail(club.pilot.email);
		expect(mail.subject).toMatch(/Debrief of your flight in BD-TTT/);
		expect(mail.text).toContain(`/flights/${flightId}/debrief`);
		const after = (await debriefLoad(event(club.pilot, DEBRIEF_ROUTE, params()) as never)) as { report: { debrief: { signedOffBy: string } } };
		expect(after.report.debrief.signedOffBy).toBe('Ines Instructor');
	});
});

describe('share links', () => {
	it('opens signed out with a valid token stored only as its hash; revoked or expired links are 404', async () => {
		const { token } = await createShare(flightId, instructor.id, 14);
		const rows = await db.select().from(debriefShares).where(eq(debriefShares.flightId, flightId));
		expect(rows[0].tokenHash).toBe(hashToken(token));
		expect(JSON.stringify(rows)).not.toContain(token);
		const page = (await shareLoad(event(null, '/share/[token]', { token }) as never)) as { report: { flight: { id: string } } };
		expect(page.report.flight.id).toBe(flightId);
		expect(await revokeShare(flightId, rows[0].id)).toBe(true);
		await expect(shareLoad(event(null, '/share/[token]', { token }) as never)).rejects.toSatisfy((e) => isHttpError(e) && e.status === 404);
		const old = await createShare(flightId, instructor.id, 1);
		await db.update(debriefShares).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(debriefShares.tokenHash, hashToken(old.token)));
		expect(await flightOfShare(old.token)).toBeNull();
		expect(await flightOfShare('bds_not-a-real-token-at-all-000')).toBeNull();
		expect(await flightOfShare("'; drop table flights; --")).toBeNull();
	});

	it('refuses a share lifetime outside 1–90 days with the field named', async () => {
		const r = (await debriefActions.share(event(instructor, DEBRIEF_ROUTE, params(), form({ days: '365' })) as never)) as { status: number; data: { errors: Record<string, string> } };
		expect(r.status).toBe(400);
		expect(r.data.errors.days).toMatch(/between 1 and 90/);
	});
});
