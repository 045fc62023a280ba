// Live alarms against the real database and the test mail sink: one flight_alarms row and one
// e-mail per watcher per crossing, whatever the retries and concurrent duplicates; a second
// crossing after a refuel mails again; members who may not see the flight get nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flightAlarms, fuelEvents } from '$lib/server/db/schema';
import { setLiveDeclaration } from '$lib/server/live/declare';
import { mailTo } from '../helpers/mailbox';
import { call, liveWorld, samples, sleep, T0, watch, type LiveWorld } from './live-fixtures';

const US_GAL = 3.785411784; // NIST Handbook 44, Appendix C

let w: LiveWorld;
beforeAll(async () => {
	w = await liveWorld();
});

async function mailsSettled(address: string, expected: number, timeoutMs = 10_000) {
	const deadline = Date.now() + timeoutMs;
	let mails = await mailTo(address);
	while (mails.length < expected && Date.now() < deadline) {
		await sleep(100);
		mails = await mailTo(address);
	}
	// Give a duplicate the chance to show up before counting.
	await sleep(400);
	return mailTo(address);
}

describe('alarm e-mails', () => {
	it('sends one e-mail per crossing to each watcher who may see the flight', async () => {
		// 12 US gal on board, low-fuel alarm below 10 US gal, 9 US gal/h: 2 US gal are burnt
		// after 800 s, so the alarm is raised at the first sample after T0 + 800 s.
		// Flown by the instructor: a flight with no pilot yet is open to every pilot of the club to claim.
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 12 }, pilot: w.instructor.email });
		const flightId = open.body.flightId;
		await watch(w.admin.id, { aircraftId: w.aircraftA });
		await watch(w.instructor.id, { flightId });
		// A pilot sees only their own flights; an outsider's stale watch belongs to no member.
		await watch(w.pilot.id, { aircraftId: w.aircraftA });
		await watch(w.outsider.id, { aircraftId: w.aircraftA });

		for (let s = 0; s < 1200; s += 100) {
			const batch = { flightId, samples: samples(s, 100) };
			// The crossing batch arrives three times at once (two instances, a retry).
			const copies = s === 800 ? 3 : 2;
			const answers = await Promise.all(Array.from({ length: copies }, () => call('samples', w.tokenA, batch)));
			for (const a of answers) expect(a.status).toBe(200);
		}
		const rows = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(rows).toHaveLength(1);
		expect(rows[0].kind).toBe('lowFuel');
		expect(rows[0].raisedAt.getTime()).toBeGreaterThanOrEqual(T0 + 800_000);
		expect(rows[0].raisedAt.getTime()).toBeLessThanOrEqual(T0 + 801_000);
		expect(rows[0].clearedAt).toBeNull();

		const admin = await mailsSettled(w.admin.email, 1);
		const instructor = await mailsSettled(w.instructor.email, 1);
		expect(admin).toHaveLength(1);
		expect(instructor).toHaveLength(1);
		expect(await mailTo(w.pilot.email)).toHaveLength(0);
		expect(await mailTo(w.outsider.email)).toHaveLength(0);
		const mail = admin[0];
		expect(mail.subject).toBe('Burndown alarm: low fuel on board on BD-LVA');
		expect(mail.text).toMatch(/Low fuel on board on BD-LVA at 2026-05-02 09:13:2\d UTC \(below 10\.0 US gal\)/);
		expect(mail.text).toMatch(/Fuel on board: +9\.9 US gal/);
		expect(mail.text).toMatch(/Fuel flow: +9\.0 US gal\/h/);
		expect(mail.text).toContain(`/o/${w.slug}/flights/${flightId}/live`);
		expect(mail.text).toMatch(/advisory/);
		const [mailed] = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(mailed.emailedAt).not.toBeNull();

		// Fuel added at a stop (T0 + 1000 s, 5 US gal) clears it; the burn crosses 10 US gal
		// again 4.5 US gal later, at T0 + 2800 s: a second crossing, a second e-mail.
		await db.insert(fuelEvents).values({ flightId, t: new Date(T0 + 1_000_000), kind: 'added', amountL: 5 * US_GAL });
		for (let s = 1200; s < 3000; s += 300) {
			const batch = { flightId, samples: samples(s, 300) };
			expect((await call('samples', w.tokenA, batch)).status).toBe(200);
			expect((await call('samples', w.tokenA, batch)).status).toBe(200);
		}
		const after = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId)).orderBy(flightAlarms.raisedAt);
		expect(after).toHaveLength(2);
		expect(after[0].clearedAt?.getTime()).toBe(T0 + 1_000_000);
		expect(after[1].raisedAt.getTime()).toBeGreaterThanOrEqual(T0 + 2_800_000);
		expect(after[1].raisedAt.getTime()).toBeLessThanOrEqual(T0 + 2_801_000);
		expect(await mailsSettled(w.admin.email, 2)).toHaveLength(2);
		expect(await mailsSettled(w.instructor.email, 2)).toHaveLength(2);
		expect(await mailTo(w.pilot.email)).toHaveLength(0);
		await call('close', w.tokenA, {});
	});

	it('a corrected declaration that only moves the crossing is the same episode: nobody is mailed twice', async () => {
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 12 } });
		const flightId = open.body.flightId;
		const before = (await mailTo(w.admin.email)).length;
		// 12 US gal at 9 US gal/h: below 10 US gal after 800 s.
		for (let s = 0; s < 1000; s += 100) expect((await call('samples', w.tokenA, { flightId, samples: samples(s, 100) })).status).toBe(200);
		await mailsSettled(w.admin.email, before + 1);
		// The pilot corrects the start fuel to 11.5 US gal: the same low-fuel episode, raised 200 s earlier.
		await setLiveDeclaration(flightId, { kind: 'onBoard', amountL: 11.5 * US_GAL }, null);
		const rows = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(rows.filter((r) => r.kind === 'lowFuel' && r.clearedAt === null)).toHaveLength(1);
		expect(await mailsSettled(w.admin.email, before + 2, 1500)).toHaveLength(before + 1);
		await call('close', w.tokenA, {});
	});

	it('a corrected declaration that removes the danger clears the alarm and mails nobody', async () => {
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 9 } });
		const flightId = open.body.flightId;
		const before = (await mailTo(w.admin.email)).length;
		// Below 10 US gal from the first sample: raised at once.
		expect((await call('samples', w.tokenA, { flightId, samples: samples(0, 50) })).status).toBe(200);
		await mailsSettled(w.admin.email, before + 1);
		const [raised] = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(raised.clearedAt).toBeNull();
		// The pilot dipped the tanks: 30 US gal, not 9.
		await setLiveDeclaration(flightId, { kind: 'onBoard', amountL: 30 * US_GAL }, null);
		const [cleared] = await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId));
		expect(cleared.clearedAt).not.toBeNull();
		expect((await call('samples', w.tokenA, { flightId, samples: samples(50, 50) })).status).toBe(200);
		expect(await db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId))).toHaveLength(1);
		expect(await mailsSettled(w.admin.email, before + 1)).toHaveLength(before + 1);
		await call('close', w.tokenA, {});
	});
});
