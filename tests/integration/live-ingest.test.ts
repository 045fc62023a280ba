// The recorder ingest API against the real database: batches stored once whatever the retries,
// out-of-order batches, malformed batches refused whole, tokens, opening, closing and the idle
// sweeper, CSV lines of our recorder format.
import { beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { aircraft, flights, recorders, samples as samplesTable } from '$lib/server/db/schema';
import { MAX_BATCH_SAMPLES } from '$lib/server/live/config';
import { sweepIdleFlights } from '$lib/server/live/sweeper';
import { call, liveWorld, samples, T0, type LiveWorld } from './live-fixtures';

const US_GAL = 3.785411784; // NIST Handbook 44, Appendix C

let w: LiveWorld;
beforeAll(async () => {
	w = await liveWorld();
});

async function storedSeqs(flightId: string): Promise<number[]> {
	const rows = await db.select({ seq: samplesTable.seq }).from(samplesTable).where(eq(samplesTable.flightId, flightId)).orderBy(samplesTable.seq);
	return rows.map((r) => r.seq);
}
async function flightCount(aircraftId: string): Promise<number> {
	return (await db.select({ n: count() }).from(flights).where(eq(flights.aircraftId, aircraftId)))[0].n;
}
async function closeOpen(token: string) {
	const r = await call('close', token, {});
	expect([200, 404]).toContain(r.status);
}

describe('storing batches', () => {
	it('stores the same batch sent three times once, and acknowledges it each time', async () => {
		const batch = { samples: samples(0, 10) };
		const first = await call('samples', w.tokenA, batch);
		expect(first.status).toBe(200);
		expect(first.body).toMatchObject({ ack: 9, highest: 9, stored: 10, duplicates: 0, opened: true, declarationConfirmed: false });
		const flightId = first.body.flightId;
		const again = await call('samples', w.tokenA, batch);
		const third = await call('samples', w.tokenA, { ...batch, flightId });
		for (const r of [again, third]) {
			expect(r.status).toBe(200);
			expect(r.body).toMatchObject({ flightId, ack: 9, stored: 0, duplicates: 10, opened: false });
		}
		expect(await storedSeqs(flightId)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
		const [f] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(f).toMatchObject({ sampleCount: 10, lastSeq: 9, status: 'open', source: 'live', recorderId: w.recorderA });
		await closeOpen(w.tokenA);
	});

	it('opens on the first batch with the last known fuel assumed and flagged', async () => {
		// The first test's flight closed, so the aircraft's last known fuel is what it left.
		const [a] = await db.select().from(aircraft).where(eq(aircraft.id, w.aircraftA));
		expect(a.lastOnBoardL).toBeLessThan(36 * US_GAL);
		const r = await call('samples', w.tokenA, { samples: samples(0, 3) });
		const [f] = await db.select().from(flights).where(eq(flights.id, r.body.flightId));
		expect(f.declaration).toEqual({ kind: 'added', amountL: 0 });
		expect(f.previousOnBoardL).toBe(a.lastOnBoardL);
		expect(f.declarationConfirmed).toBe(false);
		expect(f.startedAt.getTime()).toBe(T0);
		await closeOpen(w.tokenA);
	});

	it('accepts out-of-order batches and acknowledges only the contiguous run', async () => {
		const a = await call('samples', w.tokenA, { samples: samples(0, 5) });
		const flightId = a.body.flightId;
		expect(a.body.ack).toBe(4);
		const c = await call('samples', w.tokenA, { flightId, samples: samples(10, 5) });
		expect(c.body).toMatchObject({ ack: 4, highest: 14, stored: 5 });
		const d = await call('samples', w.tokenA, { flightId, samples: samples(20, 5) });
		expect(d.body).toMatchObject({ ack: 4, highest: 24 });
		const b = await call('samples', w.tokenA, { flightId, samples: samples(5, 5) });
		expect(b.body).toMatchObject({ ack: 14, highest: 24, stored: 5 });
		const e = await call('samples', w.tokenA, { flightId, samples: samples(15, 5) });
		expect(e.body).toMatchObject({ ack: 24, highest: 24 });
		expect(await storedSeqs(flightId)).toEqual(Array.from({ length: 25 }, (_, i) => i));
		await closeOpen(w.tokenA);
	});

	it('refuses a batch that does not fit between the stored samples in time', async () => {
		const a = await call('samples', w.tokenA, { samples: samples(0, 5) });
		const flightId = a.body.flightId;
		// seq 5 would be at T0 + 2 s, before seq 4 at T0 + 4 s.
		const bad = await call('samples', w.tokenA, { flightId, samples: samples(5, 3).map((s, i) => ({ ...s, t: new Date(T0 + (2 + i * 0.1) * 1000).toISOString() })) });
		expect(bad.status).toBe(400);
		expect(bad.body.problems[0]).toMatchObject({ index: 0, seq: 5, field: 't' });
		expect(await storedSeqs(flightId)).toEqual([0, 1, 2, 3, 4]);
		await closeOpen(w.tokenA);
	});

	it('answers 409 when sequence numbers come back with other samples (a new flight not opened)', async () => {
		const a = await call('samples', w.tokenA, { samples: samples(0, 5) });
		const later = samples(0, 5).map((s, i) => ({ ...s, t: new Date(T0 + 3_600_000 + i * 1000).toISOString() }));
		const r = await call('samples', w.tokenA, { samples: later });
		expect(r.status).toBe(409);
		expect(r.body.flightId).toBe(a.body.flightId);
		expect(r.body.detail).toMatch(/open/);
		expect(await storedSeqs(a.body.flightId)).toEqual([0, 1, 2, 3, 4]);
		await closeOpen(w.tokenA);
	});
});

describe('malformed batches store nothing', () => {
	it('names the sample and the field, and opens no flight', async () => {
		const before = await flightCount(w.aircraftA);
		const batch = samples(0, 6);
		(batch[3] as Record<string, unknown>).flow = -4;
		const r = await call('samples', w.tokenA, { samples: batch });
		expect(r.status).toBe(400);
		expect(r.body.detail).toMatch(/not stored/);
		expect(r.body.problems).toEqual([expect.objectContaining({ index: 3, seq: 3, field: 'samples[3].flow', message: expect.stringMatching(/negative/) })]);
		expect(await flightCount(w.aircraftA)).toBe(before);
	});

	it('reports each kind of fault with where it is', async () => {
		const cases: [unknown, RegExp, string][] = [
			[{ samples: [{ ...samples(0, 1)[0], seq: 1.5 }] }, /whole number/, 'samples[0].seq'],
			[{ samples: [{ ...samples(0, 1)[0], t: '2026-05-02 09:00:00' }] }, /time/i, 'samples[0].t'],
			[{ samples: [{ ...samples(0, 1)[0], gs: 900 }] }, /above the limit of 400 kt/, 'samples[0].gs'],
			[{ samples: [...samples(0, 2), ...samples(3, 1)] }, /consecutive/, 'samples[2].seq'],
			[{ samples: [...samples(0, 2), { ...samples(2, 1)[0], t: new Date(T0).toISOString() }] }, /backwards/, 'samples[2].t'],
			[{ samples: [] }, /at least one/, 'samples'],
			[{ samples: samples(0, MAX_BATCH_SAMPLES + 1) }, /at most 1000/, 'samples']
		];
		for (const [body, message, field] of cases) {
			const r = await call('samples', w.tokenA, body);
			expect(r.status, JSON.stringify(r.body)).toBe(400);
			expect(r.body.problems[0].field).toBe(field);
			expect(r.body.problems[0].message).toMatch(message);
		}
		const notJson = await call('samples', w.tokenA, '{"samples": [');
		expect(notJson.status).toBe(400);
		expect(notJson.body.field).toBe('body');
	});

	it('refuses a body over the size limit with 413', async () => {
		const r = await call('samples', w.tokenA, JSON.stringify({ samples: samples(0, 1), pad: 'x'.repeat(600 * 1024) }));
		expect(r.status).toBe(413);
	});

	it('refuses a CSV batch with the line number, column and value', async () => {
		const before = await flightCount(w.aircraftA);
		const csv = ['seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm', '0,2026-05-02T09:00:00Z,9.0,110,60', '1,2026-05-02T09:00:01Z,nine,110,60'].join('\n');
		const r = await call('samples', w.tokenA, csv, { csv: true });
		expect(r.status).toBe(400);
		expect(r.body.problems[0]).toMatchObject({ line: 3, field: 'fuel_flow_usgph', value: 'nine' });
		expect(await flightCount(w.aircraftA)).toBe(before);
	});
});

describe('CSV lines of our recorder format', () => {
	it('stores them like JSON samples, converting units', async () => {
		const csv = [
			'seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,altitude_ft',
			'0,2026-05-02T09:00:00Z,9.0,110,60.0,WPT-B,3500',
			'1,2026-05-02T09:00:01Z,9.0,110,59.97,WPT-B,3500',
			'2,2026-05-02T09:00:02Z,,110,59.94,WPT-B,3500'
		].join('\r\n');
		const r = await call('samples', w.tokenA, csv, { csv: true });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body).toMatchObject({ ack: 2, stored: 3 });
		const rows = await db.select().from(samplesTable).where(eq(samplesTable.flightId, r.body.flightId)).orderBy(samplesTable.seq);
		expect(rows[0].flow).toBeCloseTo(9 * US_GAL, 9);
		expect(rows[2].flow).toBeNull();
		expect(rows[1].t.toISOString()).toBe('2026-05-02T09:00:01.000Z');
		expect(rows[0]).toMatchObject({ wpt: 'WPT-B', alt: 3500, gs: 110 });
		const noSeq = await call('samples', w.tokenA, 'time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm\n2026-05-02T09:00:03Z,9,110,59', { csv: true, query: `?flightId=${r.body.flightId}` });
		expect(noSeq.status).toBe(400);
		expect(noSeq.body.problems[0].message).toMatch(/seq column/);
		await closeOpen(w.tokenA);
	});
});

describe('recorder tokens', () => {
	it('refuses missing, wrong and revoked tokens with 401', async () => {
		const body = { samples: samples(0, 2) };
		expect((await call('samples', null, body)).status).toBe(401);
		expect((await call('samples', 'bdr_not-a-real-token-at-all', body)).status).toBe(401);
		expect((await call('samples', w.admin.apiToken, body)).status).toBe(401);
		expect((await call('open', 'bdr_wrong', {})).status).toBe(401);
		expect((await call('close', 'bdr_wrong', {})).status).toBe(401);

		const [r] = await db.select().from(recorders).where(eq(recorders.aircraftId, w.aircraftB));
		await db.update(recorders).set({ revokedAt: new Date() }).where(eq(recorders.id, r.id));
		const before = await flightCount(w.aircraftB);
		const revoked = await call('samples', w.tokenB, body);
		expect(revoked.status).toBe(401);
		expect(await flightCount(w.aircraftB)).toBe(before);
		await db.update(recorders).set({ revokedAt: null }).where(eq(recorders.id, r.id));
	});

	it("writes only to its own aircraft's flights", async () => {
		const a = await call('samples', w.tokenA, { samples: samples(0, 3) });
		const intruder = await call('samples', w.tokenB, { flightId: a.body.flightId, samples: samples(3, 3) });
		expect(intruder.status).toBe(403);
		expect(await storedSeqs(a.body.flightId)).toEqual([0, 1, 2]);
		const close = await call('close', w.tokenB, { flightId: a.body.flightId });
		expect(close.status).toBe(403);
		const [f] = await db.select().from(flights).where(eq(flights.id, a.body.flightId));
		expect(f.status).toBe('open');
		await closeOpen(w.tokenA);
	});
});

describe('opening and closing', () => {
	it('opens with a declaration, closes into an ordinary flight with its summary', async () => {
		const open = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 }, title: 'Practice area', pilot: w.pilot.email });
		expect(open.status).toBe(201);
		expect(open.body).toMatchObject({ firstSeq: 0, declarationConfirmed: true });
		const flightId = open.body.flightId;
		const [opened] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(opened.declaration).toEqual({ kind: 'onBoard', amountL: 30 * US_GAL });
		expect(opened.pilotId).toBe(w.pilot.id);
		// A retried open (no samples yet) reuses the flight.
		const retry = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 } });
		expect(retry.body.flightId).toBe(flightId);

		// 600 s at 9 US gal/h burns 1.5 US gal (600 samples, 599 one-second intervals: 1.4975).
		for (let s = 0; s < 600; s += 200) expect((await call('samples', w.tokenA, { flightId, samples: samples(s, 200) })).status).toBe(200);
		const close = await call('close', w.tokenA, {});
		expect(close.body).toEqual({ flightId, closed: true });
		const [f] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(f.status).toBe('closed');
		expect(f.endedAt?.getTime()).toBe(T0 + 599_000);
		const summary = f.summary as { fuelUsedL: number; onBoardAtShutdownL: number; sampleCount: number };
		expect(summary.sampleCount).toBe(600);
		expect(summary.fuelUsedL).toBeCloseTo((9 * US_GAL * 599) / 3600, 6);
		const [a] = await db.select().from(aircraft).where(eq(aircraft.id, w.aircraftA));
		expect(a.lastOnBoardL).toBeCloseTo(30 * US_GAL - summary.fuelUsedL, 6);

		const late = await call('samples', w.tokenA, { flightId, samples: samples(600, 5) });
		expect(late.status).toBe(409);
		// An open with samples in the open flight closes it and starts a new one.
		const b = await call('samples', w.tokenA, { samples: samples(0, 2) });
		const next = await call('open', w.tokenA, { declaration: { kind: 'full' } });
		expect(next.body.closedFlightId).toBe(b.body.flightId);
		expect(next.body.flightId).not.toBe(b.body.flightId);
		await closeOpen(w.tokenA);
	});

	it('refuses an open request it cannot understand', async () => {
		const r = await call('open', w.tokenA, { declaration: { kind: 'onBoard' } });
		expect(r.status).toBe(400);
		expect(r.body.problems[0]).toMatchObject({ field: 'declaration.amount' });
		const stranger = await call('open', w.tokenA, { pilot: w.outsider.email });
		expect(stranger.status).toBe(400);
		expect(stranger.body.field).toBe('pilot');
	});

	it('closes flights idle for longer than the idle time, once', async () => {
		const r = await call('samples', w.tokenA, { samples: samples(0, 3) });
		const flightId = r.body.flightId;
		expect(await sweepIdleFlights(new Date(), 30)).not.toContain(flightId);
		await db.update(flights).set({ updatedAt: new Date(Date.now() - 31 * 60_000) }).where(eq(flights.id, flightId));
		const [first, second] = await Promise.all([sweepIdleFlights(new Date(), 30), sweepIdleFlights(new Date(), 30)]);
		expect([...first, ...second].filter((id) => id === flightId)).toHaveLength(1);
		const [f] = await db.select().from(flights).where(eq(flights.id, flightId));
		expect(f.status).toBe('closed');
		expect(f.summary).not.toBeNull();
	});
});

describe('hostile bytes store nothing', () => {
	const enc = new TextEncoder();
	const withBytes = (text: string, at: number, bytes: number[]) => {
		const b = enc.encode(text);
		return new Uint8Array([...b.slice(0, at), ...bytes, ...b.slice(at)]);
	};

	it('invalid UTF-8 in a JSON or CSV batch, or an open call, answers 400 naming the byte offset', async () => {
		const before = await flightCount(w.aircraftA);
		const json = JSON.stringify({ samples: samples(0, 3) });
		const at = json.indexOf('WPT-B') + 3;
		// A lone continuation byte, an overlong "/", a surrogate, a sequence cut short at the end.
		for (const [bytes, offset] of [[[0x80], at], [[0xc0, 0xaf], at], [[0xed, 0xa0, 0x80], at + 1]] as [number[], number][]) {
			const r = await call('samples', w.tokenA, withBytes(json, at, bytes));
			expect(r.status, JSON.stringify(r.body)).toBe(400);
			expect(r.body).toMatchObject({ field: 'body', offset });
			expect(r.body.detail).toMatch(/not valid UTF-8/);
		}
		const cut = enc.encode(json.slice(0, -2));
		const truncated = await call('samples', w.tokenA, new Uint8Array([...cut, 0xe2, 0x82]));
		expect(truncated).toMatchObject({ status: 400, body: { field: 'body', offset: cut.length } });
		const csv = ['seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm', '0,2026-05-02T09:00:00Z,9.0,110,60'].join('\n');
		const r = await call('samples', w.tokenA, withBytes(csv, csv.length - 2, [0xff]), { csv: true });
		expect(r).toMatchObject({ status: 400, body: { field: 'body', offset: enc.encode(csv).length - 2 } });
		const open = await call('open', w.tokenA, withBytes('{"title":"Morning"}', 12, [0xfe]));
		expect(open).toMatchObject({ status: 400, body: { field: 'body', offset: 12 } });
		expect(await flightCount(w.aircraftA)).toBe(before);
	});

	it('a NUL byte in a waypoint, a CSV line or a title answers 400 saying where', async () => {
		const before = await flightCount(w.aircraftA);
		const batch = samples(0, 4);
		batch[2].wpt = 'WPT\u0000B';
		const r = await call('samples', w.tokenA, { samples: batch });
		expect(r.status, JSON.stringify(r.body)).toBe(400);
		expect(r.body.problems[0]).toMatchObject({ index: 2, field: 'samples[2].wpt', message: expect.stringMatching(/NUL byte \(U\+0000\) at character 4/) });
		const csv = ['seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint', '0,2026-05-02T09:00:00Z,9.0,110,60,WPT-A', '1,2026-05-02T09:00:01Z,9.0,110,60,WP\u0000'].join('\n');
		const c = await call('samples', w.tokenA, csv, { csv: true });
		expect(c.status).toBe(400);
		expect(c.body.problems[0]).toMatchObject({ line: 3, field: 'body', message: expect.stringMatching(/line 3, character 37:/) });
		const open = await call('open', w.tokenA, { title: 'Morning\u0000 hop' });
		expect(open.status).toBe(400);
		expect(open.body.problems[0]).toMatchObject({ field: 'title', message: expect.stringMatching(/NUL byte/) });
		const rlo = await call('open', w.tokenA, { title: 'Morning \u202epoh' });
		expect(rlo.status).toBe(400);
		expect(await flightCount(w.aircraftA)).toBe(before);
	});
});

describe('a resent batch', () => {
	it('with the same sequence numbers and times but other values is a conflict naming the first differing seq', async () => {
		const first = await call('samples', w.tokenA, { samples: samples(0, 10) });
		expect(first.status).toBe(200);
		const flightId = first.body.flightId;
		// Exactly the same again: an idempotent duplicate.
		const same = await call('samples', w.tokenA, { flightId, samples: samples(0, 10) });
		expect(same).toMatchObject({ status: 200, body: { stored: 0, duplicates: 10, ack: 9 } });
		// Same seqs and times, seq 6 and 8 with another flow, and two new samples after them.
		const changed = samples(5, 7);
		changed[1].flow = 12 * US_GAL;
		changed[3].wpt = 'WPT-C';
		const r = await call('samples', w.tokenA, { flightId, samples: changed });
		expect(r.status, JSON.stringify(r.body)).toBe(409);
		expect(r.body).toMatchObject({ flightId, seq: 6, problems: [{ index: 1, seq: 6, field: 'flow' }] });
		expect(r.body.detail).toMatch(/seq 6 is stored already with the same time but other values \(flow\)/);
		// Nothing of it was stored: not the new samples 10 and 11 either.
		expect(await storedSeqs(flightId)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
		const [s6] = await db.select().from(samplesTable).where(eq(samplesTable.seq, 6)).limit(1);
		expect(s6.flow).toBeCloseTo(9 * US_GAL, 9);
		// A CSV resend of the same samples in another unit is still an exact duplicate.
		const csv = ['seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint', ...samples(0, 2).map((s) => `${s.seq},${s.t},9,110,${s.dtg},WPT-B`)].join('\n');
		const again = await call('samples', w.tokenA, csv, { csv: true, query: `?flightId=${flightId}` });
		expect(again.status, JSON.stringify(again.body)).toBe(200);
		expect(again.body).toMatchObject({ stored: 0, duplicates: 2 });
		await closeOpen(w.tokenA);
	});
});

describe('an archived aircraft', () => {
	it("its recorder can neither open a flight nor send samples; closing still works; restored, it records again", async () => {
		const open = await call('samples', w.tokenB, { samples: samples(0, 3) });
		expect(open.status).toBe(200);
		await db.update(aircraft).set({ archivedAt: new Date() }).where(eq(aircraft.id, w.aircraftB));
		const before = await flightCount(w.aircraftB);
		const more = await call('samples', w.tokenB, { samples: samples(3, 3) });
		expect(more.status).toBe(409);
		expect(more.body).toMatchObject({ field: 'aircraft', detail: expect.stringMatching(/BD-LVB is archived/) });
		const explicit = await call('open', w.tokenB, { title: 'after archiving' });
		expect(explicit.status).toBe(409);
		expect(explicit.body.field).toBe('aircraft');
		const csv = ['seq,time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm', '3,2026-05-02T09:00:03Z,9.0,110,60'].join('\n');
		expect((await call('samples', w.tokenB, csv, { csv: true })).status).toBe(409);
		expect(await flightCount(w.aircraftB)).toBe(before);
		expect(await storedSeqs(open.body.flightId)).toEqual([0, 1, 2]);
		expect((await call('close', w.tokenB, {})).status).toBe(200);
		await db.update(aircraft).set({ archivedAt: null }).where(eq(aircraft.id, w.aircraftB));
		expect((await call('open', w.tokenB, {})).status).toBe(201);
		await closeOpen(w.tokenB);
	});
});
