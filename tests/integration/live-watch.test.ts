// The live watch against the real database, routes and mail sink: a flight at a planned stop
// (engine stopped on the ground) stays open for the configured hours and the next leg joins it;
// an acknowledgement is shared — stored with who and when, pushed to every viewer, on the replay
// page's data — and refused to a read-only viewer; alarm e-mails go once per episode per watcher,
// none within the quiet period, and the count the banner shows is the watchers actually e-mailed.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { alarmAcks, alarmMails, flightAlarms, flights, fuelEvents, memberships, users } from '$lib/server/db/schema';
import { LiveHub } from '$lib/server/live';
import { ALARM_MAIL_QUIET_S } from '$lib/server/live/alarms';
import { stopOpenHours, sweepIdleFlights } from '$lib/server/live/sweeper';
import { setLiveDeclaration } from '$lib/server/live/declare';
import type { AuthUser } from '$lib/server/auth';
import { actions as liveActions } from '../../src/routes/o/[org]/flights/[id]/live/+page.server';
import { load as replayLoad } from '../../src/routes/o/[org]/flights/[id]/+page.server';
import { mailTo } from '../helpers/mailbox';
import { call, liveWorld, samples, sleep, startInstance, T0, viewer, watch, type Instance, type LiveWorld, type Member } from './live-fixtures';
import { formOf, routeEvent } from './route-event';

const US_GAL = 3.785411784; // NIST Handbook 44, Appendix C
const LIVE_ROUTE = '/o/[org]/flights/[id]/live';
const REPLAY_ROUTE = '/o/[org]/flights/[id]';

let w: LiveWorld;
let instance: Instance;
let readOnly: AuthUser;
const asUser = (m: Member): AuthUser => ({ id: m.id, email: m.email, name: m.name, prefFuelUnit: null }) as AuthUser;

beforeAll(async () => {
	w = await liveWorld();
	instance = await startInstance(new LiveHub({ name: 'watch' }));
	const id = `lv-viewer-${Date.now().toString(36)}`;
	await db.insert(users).values({ id, email: `${id}@kestrel-test.example`, name: 'Vera Viewer', passwordHash: 'not-used' });
	await db.insert(memberships).values({ orgId: w.orgId, userId: id, role: 'viewer' });
	readOnly = { id, email: `${id}@kestrel-test.example`, name: 'Vera Viewer', prefFuelUnit: null } as AuthUser;
});
afterAll(async () => {
	await instance?.stop();
});

const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000);
const status = async (id: string) => (await db.select({ s: flights.status }).from(flights).where(eq(flights.id, id)))[0].s;
/** The samples from `from` on, `shiftS` seconds later than samples() puts them. */
const later = (from: number, count: number, shiftS: number, over: Parameters<typeof samples>[2] = {}) =>
	samples(from, count, over).map((x) => ({ ...x, t: new Date(T0 + (x.seq + shiftS) * 1000).toISOString() }));

async function mailsSettled(address: string, expected: number, timeoutMs = 10_000) {
	const deadline = Date.now() + timeoutMs;
	while ((await mailTo(address)).length < expected && Date.now() < deadline) await sleep(100);
	// Give a duplicate the chance to show up before counting.
	await sleep(400);
	return mailTo(address);
}

describe('a planned stop', () => {
	it('keeps a flight whose engine stopped on the ground open for the configured hours, and the next leg joins it', async () => {
		expect(stopOpenHours()).toBe(4);
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 }, pilot: w.instructor.email });
		const flightId = open.body.flightId as string;
		expect((await call('samples', w.tokenA, { flightId, samples: samples(0, 300) })).status).toBe(200);
		// Landed, taxied in, engine off: flow and ground speed zero.
		expect((await call('samples', w.tokenA, { flightId, samples: samples(300, 60, { flowGph: 0, gs: 0 }) })).status).toBe(200);

		// The other aircraft lost its link with the engine running, 31 minutes ago.
		const other = await call('samples', w.tokenB, { samples: samples(0, 30) });
		const otherId = other.body.flightId as string;
		await db.update(flights).set({ updatedAt: new Date(Date.now() - 31 * 60_000) }).where(eq(flights.id, otherId));
		// Two hours on the ground: longer than the 30-minute idle time, within the 4 h stop.
		await db.update(flights).set({ updatedAt: hoursAgo(2) }).where(eq(flights.id, flightId));
		const swept = await sweepIdleFlights(new Date());
		expect(swept).toContain(otherId);
		expect(swept).not.toContain(flightId);
		expect(await status(flightId)).toBe('open');

		// The next leg two hours later goes into the same flight.
		const next = await call('samples', w.tokenA, { samples: later(360, 120, 7200) });
		expect(next.status).toBe(200);
		expect(next.body.flightId).toBe(flightId);
		expect(next.body.ack).toBe(479);

		// Engine off again; past the stop limit the flight closes like any other, into its summary.
		expect((await call('samples', w.tokenA, { flightId, samples: later(480, 30, 7200, { flowGph: 0, gs: 0 }) })).status).toBe(200);
		await db.update(flights).set({ updatedAt: hoursAgo(4.1) }).where(eq(flights.id, flightId));
		expect(await sweepIdleFlights(new Date())).toContain(flightId);
		const [f] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(f.status).toBe('closed');
		expect(f.summary).not.toBeNull();
	});

	it('takes the limit from LIVE_STOP_OPEN_HOURS', async () => {
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 }, pilot: w.instructor.email });
		const flightId = open.body.flightId as string;
		expect((await call('samples', w.tokenA, { flightId, samples: samples(0, 30, { flowGph: 0, gs: 0 }) })).status).toBe(200);
		await db.update(flights).set({ updatedAt: hoursAgo(1.5) }).where(eq(flights.id, flightId));
		expect(await sweepIdleFlights(new Date())).not.toContain(flightId);
		process.env.LIVE_STOP_OPEN_HOURS = '1';
		try {
			expect(stopOpenHours()).toBe(1);
			expect(await sweepIdleFlights(new Date())).toContain(flightId);
		} finally {
			delete process.env.LIVE_STOP_OPEN_HOURS;
		}
	});
});

describe('a shared acknowledgement', () => {
	it('is stored with who and when, pushed to every viewer, shown on the replay page, and refused to a read-only viewer', async () => {
		// 12 US gal on board, low-fuel alarm below 10 US gal, 9 US gal/h: raised after 800 s.
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 12 }, pilot: w.pilot.email });
		const flightId = open.body.flightId as string;
		const one = viewer(`${instance.url}/stream/${flightId}`);
		const two = viewer(`${instance.url}/stream/${flightId}`);
		expect((await call('samples', w.tokenA, { flightId, samples: samples(0, 900) })).status).toBe(200);
		await one.waitFor(899);
		await two.waitFor(899);
		const [alarm] = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(alarm.kind).toBe('lowFuel');

		const ack = (user: AuthUser, alarmId: string) => liveActions.ack(routeEvent(user, LIVE_ROUTE, { org: w.slug, id: flightId }, formOf({ alarmId })) as never);
		// A read-only viewer sees the alarm but may not acknowledge it: 403, nothing stored.
		await expect(ack(readOnly, alarm.id)).rejects.toSatisfy((e: unknown) => isHttpError(e) && e.status === 403);
		expect(await db.select().from(alarmAcks).where(eq(alarmAcks.alarmId, alarm.id))).toHaveLength(0);

		const before = Date.now();
		expect(await ack(asUser(w.pilot), alarm.id)).toEqual({ action: 'ack', alarmId: alarm.id });
		const stored = await db.select().from(alarmAcks).where(eq(alarmAcks.alarmId, alarm.id));
		expect(stored.map((s) => s.userId)).toEqual([w.pilot.id]);
		expect(stored[0].at.getTime()).toBeGreaterThanOrEqual(before - 1000);

		// Both viewers hear who acknowledged it, and when.
		const ackedIn = async (v: ReturnType<typeof viewer>) => {
			const deadline = Date.now() + 5000;
			for (;;) {
				const last = v.metas.at(-1)?.alarms.find((a) => a.id === alarm.id);
				if (last && last.acks.length > 0) return last.acks;
				if (Date.now() > deadline) throw new Error('no acknowledgement pushed');
				await sleep(50);
			}
		};
		for (const v of [one, two]) {
			const acks = await ackedIn(v);
			expect(acks).toHaveLength(1);
			expect(acks[0].by).toBe('pilot');
			expect(Math.abs(acks[0].at * 1000 - stored[0].at.getTime())).toBeLessThan(1);
		}
		// Acknowledging again changes nothing; another alarm id is not on this flight.
		await ack(asUser(w.pilot), alarm.id);
		expect(await db.select().from(alarmAcks).where(eq(alarmAcks.alarmId, alarm.id))).toHaveLength(1);
		const wrong = (await ack(asUser(w.instructor), '00000000-0000-4000-8000-000000000000')) as { status: number };
		expect(wrong.status).toBe(404);

		// A corrected start fuel moves the crossing: the same episode keeps its acknowledgement.
		await setLiveDeclaration(flightId, { kind: 'onBoard', amountL: 11.9 * US_GAL }, null);
		const rows = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		const current = rows.find((r) => r.clearedAt === null)!;
		expect(current.id).not.toBe(alarm.id);
		expect((await db.select().from(alarmAcks).where(eq(alarmAcks.alarmId, current.id))).map((a) => a.userId)).toEqual([w.pilot.id]);

		await call('close', w.tokenA, { flightId });
		// The replay page's timeline gets who acknowledged, for the viewer too.
		const page = (await replayLoad(routeEvent(readOnly, REPLAY_ROUTE, { org: w.slug, id: flightId }) as never)) as { alarmAcks: { by: string; kind: string }[] };
		expect(page.alarmAcks.map((a) => [a.kind, a.by])).toContainEqual(['lowFuel', 'pilot']);
		one.stream.close();
		two.stream.close();
	});
});

describe('alarm e-mails per watcher', () => {
	it('counts the watchers e-mailed, says none when nobody watches, and keeps the quiet period', async () => {
		expect(ALARM_MAIL_QUIET_S).toBe(15 * 60);
		// Nobody watches aircraft B: the alarm is raised, the e-mail step runs, nobody is e-mailed.
		const lonely = await call('open', w.tokenB, { declaration: { kind: 'onBoard', amount: 9 }, pilot: w.instructor.email });
		const lonelyId = lonely.body.flightId as string;
		expect((await call('samples', w.tokenB, { flightId: lonelyId, samples: samples(0, 60) })).status).toBe(200);
		const settled = async (id: string) => {
			const deadline = Date.now() + 5000;
			for (;;) {
				const rows = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, id)).orderBy(flightAlarms.raisedAt);
				if (rows.length > 0 && rows.every((r) => r.emailedAt !== null)) return rows;
				if (Date.now() > deadline) return rows;
				await sleep(50);
			}
		};
		const [quiet] = await settled(lonelyId);
		expect(quiet.emailedAt).not.toBeNull();
		expect(quiet.mailedCount).toBe(0);
		await call('close', w.tokenB, { flightId: lonelyId });

		// Two watchers of aircraft A, 9 US gal from the start: below 10 US gal at once.
		const flightId = (await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 9 }, pilot: w.instructor.email })).body.flightId as string;
		await watch(w.admin.id, { aircraftId: w.aircraftA });
		await watch(w.instructor.id, { flightId });
		const adminBefore = (await mailTo(w.admin.email)).length;
		const instructorBefore = (await mailTo(w.instructor.email)).length;
		expect((await call('samples', w.tokenA, { flightId, samples: samples(0, 60) })).status).toBe(200);
		expect(await mailsSettled(w.admin.email, adminBefore + 1)).toHaveLength(adminBefore + 1);
		expect(await mailsSettled(w.instructor.email, instructorBefore + 1)).toHaveLength(instructorBefore + 1);
		const [first] = (await settled(flightId)).filter((r) => r.kind === 'lowFuel');
		expect(first.mailedCount).toBe(2);
		expect(await db.select().from(alarmMails).where(eq(alarmMails.alarmId, first.id))).toHaveLength(2);

		// 3 US gal added at 100 s clear it (11.75 US gal); at 9 US gal/h the next crossing of
		// 10 US gal comes 700 s later, less than the quiet period after the first: stored and
		// shown, nobody e-mailed again.
		await db.insert(fuelEvents).values({ flightId, t: new Date(T0 + 100_000), kind: 'added', amountL: 3 * US_GAL });
		expect((await call('samples', w.tokenA, { flightId, samples: samples(60, 940) })).status).toBe(200);
		const rows = await settled(flightId);
		const episodes = rows.filter((r) => r.kind === 'lowFuel');
		expect(episodes.length).toBeGreaterThanOrEqual(2);
		const second = episodes.at(-1)!;
		expect(second.raisedAt.getTime() - first.raisedAt.getTime()).toBeLessThan(ALARM_MAIL_QUIET_S * 1000);
		expect(second.emailedAt).not.toBeNull();
		expect(second.mailedCount).toBe(0);
		// Other kinds of alarm (arrival below the reserve) may mail on their own: count low-fuel ones.
		const lowFuelMails = async (address: string) => (await mailsSettled(address, 0, 1500)).filter((m) => /low fuel on board/.test(m.subject));
		expect(await lowFuelMails(w.admin.email)).toHaveLength(1);
		expect(await lowFuelMails(w.instructor.email)).toHaveLength(1);
		await call('close', w.tokenA, { flightId });
	});
});
