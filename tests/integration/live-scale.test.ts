// The live path at service scale, and resuming by the standard header: a raw HTTP client
// reconnecting with Last-Event-ID gets exactly what it missed; batches of many flights stored in
// grouped commits (fewer NOTIFYs than batches) reach viewers on two app instances complete, in
// order and once; batches that are not plain appends, or whose aircraft was archived, are handed
// back from a group and answered as if stored alone.
import http from 'node:http';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { aircraft, flights, recorders } from '$lib/server/db/schema';
import { hashToken, newToken } from '$lib/server/tokens';
import { LiveHub, stopLive } from '$lib/server/live';
import { NOTIFY_CHANNEL } from '$lib/server/live/protocol';
import { call, liveWorld, range, samples, sleep, startInstance, viewer, type LiveWorld } from './live-fixtures';

let w: LiveWorld;
let monitor: pg.Client;
let heard = 0;
beforeAll(async () => {
	w = await liveWorld();
	monitor = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await monitor.connect();
	await monitor.query(`LISTEN ${NOTIFY_CHANNEL}`);
	monitor.on('notification', (m) => {
		if (m.channel === NOTIFY_CHANNEL) heard++;
	});
});
afterAll(async () => {
	await monitor.end();
	await stopLive();
});

async function openFlight(token: string): Promise<string> {
	const r = await call('open', token, { declaration: { kind: 'onBoard', amount: 30 }, pilot: w.instructor.email });
	expect(r.status).toBe(201);
	return r.body.flightId;
}

async function send(token: string, flightId: string, from: number, count: number) {
	const r = await call('samples', token, { flightId, samples: samples(from, count) });
	expect(r.status, JSON.stringify(r.body)).toBe(200);
	return r.body as { ack: number; stored: number; duplicates: number };
}

// ---- a raw SSE client: node:http and a few lines of parsing, nothing of the app's --------------

interface RawEvent {
	id: string | null;
	event: string;
	data: string;
}

interface RawStream {
	events: RawEvent[];
	/** The id of the last event that carried one, as an EventSource keeps it. */
	lastId(): string | null;
	waitFor(pred: (e: RawEvent) => boolean, timeoutMs?: number): Promise<RawEvent>;
	close(): void;
}

function rawStream(url: string, headers: Record<string, string> = {}): Promise<RawStream> {
	return new Promise((resolve, reject) => {
		const events: RawEvent[] = [];
		let buffer = '';
		const req = http.get(url, { headers: { accept: 'text/event-stream', ...headers } }, (res) => {
			if (res.statusCode !== 200) return reject(new Error(`HTTP ${res.statusCode}`));
			res.setEncoding('utf8');
			res.on('data', (chunk: string) => {
				buffer += chunk;
				let end: number;
				while ((end = buffer.indexOf('\n\n')) >= 0) {
					const block = buffer.slice(0, end);
					buffer = buffer.slice(end + 2);
					const e: RawEvent = { id: null, event: 'message', data: '' };
					const data: string[] = [];
					for (const line of block.split('\n')) {
						const colon = line.indexOf(':');
						const field = line.slice(0, colon);
						const value = line.slice(colon + 1).replace(/^ /, '');
						if (field === 'id') e.id = value;
						else if (field === 'event') e.event = value;
						else if (field === 'data') data.push(value);
					}
					e.data = data.join('\n');
					events.push(e);
				}
			});
			res.on('error', () => {});
			resolve({
				events,
				lastId: () => [...events].reverse().find((e) => e.id !== null)?.id ?? null,
				async waitFor(pred, timeoutMs = 10_000) {
					const deadline = Date.now() + timeoutMs;
					for (;;) {
						const found = events.find(pred);
						if (found) return found;
						if (Date.now() > deadline) throw new Error(`no such event among ${events.length}`);
						await sleep(20);
					}
				},
				close: () => req.destroy()
			});
		});
		req.on('error', (e) => {
			if (!req.destroyed) reject(e);
		});
	});
}

const samplesOf = (events: RawEvent[]) => events.filter((e) => e.event === 'samples').map((e) => ({ id: e.id, run: JSON.parse(e.data) as { from: number; to: number } }));

describe('resuming with Last-Event-ID', () => {
	it('a raw HTTP client that reconnects with the header gets exactly what it missed', async () => {
		const flightId = await openFlight(w.tokenA);
		const inst = await startInstance(new LiveHub({ name: 'resume' }));
		try {
			const first = await rawStream(`${inst.url}/stream/${flightId}`);
			await first.waitFor((e) => e.event === 'meta');
			await send(w.tokenA, flightId, 0, 10);
			await send(w.tokenA, flightId, 10, 10);
			await first.waitFor((e) => e.event === 'samples' && JSON.parse(e.data).to === 19);
			// Every samples event's id is the last sequence it carries; hello and meta carry none.
			for (const s of samplesOf(first.events)) expect(s.id).toBe(String(s.run.to));
			expect(first.events.filter((e) => e.event !== 'samples').every((e) => e.id === null)).toBe(true);
			const lastId = first.lastId();
			expect(lastId).toBe('19');
			first.close();

			// Missed while away.
			await send(w.tokenA, flightId, 20, 15);
			await send(w.tokenA, flightId, 35, 5);

			// ?after=5 is older than the header: the header wins, as an EventSource reconnecting to its first URL needs.
			const again = await rawStream(`${inst.url}/stream/${flightId}?after=5`, { 'last-event-id': lastId! });
			const hello = await again.waitFor((e) => e.event === 'hello');
			expect(JSON.parse(hello.data).after).toBe(19);
			await again.waitFor((e) => e.event === 'samples' && JSON.parse(e.data).to === 39);
			await send(w.tokenA, flightId, 40, 5);
			await again.waitFor((e) => e.event === 'samples' && JSON.parse(e.data).to === 44);
			const seqs = samplesOf(again.events).flatMap((s) => range(s.run.from, s.run.to));
			expect(seqs).toEqual(range(20, 44));
			again.close();

			// Without the header, ?after is where a fresh client starts.
			const fresh = await rawStream(`${inst.url}/stream/${flightId}?after=41`);
			await fresh.waitFor((e) => e.event === 'samples');
			expect(samplesOf(fresh.events)[0].run.from).toBe(42);
			fresh.close();
		} finally {
			await inst.stop();
		}
	});

	it("the live page's client resumes through the same header", async () => {
		const flightId = await openFlight(w.tokenA);
		const inst = await startInstance(new LiveHub({ name: 'page' }));
		try {
			// Held up to 14 already (a reloaded page): the client asks with the header, not the query.
			const v = viewer(`${inst.url}/stream/${flightId}`, 14);
			await send(w.tokenA, flightId, 0, 30);
			await v.waitFor(29);
			v.stream.reconnect();
			await send(w.tokenA, flightId, 30, 10);
			await v.waitFor(39);
			expect(v.seqs).toEqual(range(15, 39));
			expect(v.hellos[0]).toBe(14);
			expect(v.hellos.at(-1)).toBeGreaterThanOrEqual(29);
			expect(v.stream.repeated).toBe(0);
			v.stream.close();
		} finally {
			await inst.stop();
		}
	});
});

// ---- many flights at once -----------------------------------------------------------------

let planesMade = 0;

async function fleet(n: number): Promise<{ token: string; aircraftId: string }[]> {
	const [a0] = await db.select().from(aircraft).where(eq(aircraft.id, w.aircraftA));
	const out: { token: string; aircraftId: string }[] = [];
	for (let i = 0; i < n; i++) {
		const { id: _id, createdAt: _c, updatedAt: _u, ...rest } = a0;
		const [a] = await db
			.insert(aircraft)
			.values({ ...rest, registration: `BD-F${String(planesMade++).padStart(3, '0')}` })
			.returning();
		const token = newToken('bdr_');
		await db.insert(recorders).values({ orgId: w.orgId, aircraftId: a.id, name: `fleet ${i}`, tokenHash: hashToken(token), tokenHint: token.slice(0, 12) });
		out.push({ token, aircraftId: a.id });
	}
	return out;
}

describe('grouped commits of many flights', () => {
	it('every sample of every flight reaches viewers on two instances once and in order, with fewer NOTIFYs than batches', async () => {
		const planes = await fleet(12);
		const ids = await Promise.all(planes.map((p) => openFlight(p.token)));
		const a = await startInstance(new LiveHub({ name: 'A' }));
		const b = await startInstance(new LiveHub({ name: 'B' }));
		try {
			const viewers = ids.flatMap((id) => [viewer(`${a.url}/stream/${id}`), viewer(`${b.url}/stream/${id}`)]);
			await sleep(200);
			const heard0 = heard;
			const rounds = 15;
			let batches = 0;
			for (let r = 0; r < rounds; r++) {
				// All flights at once, as recorders do: their batches meet in the same groups.
				const acks = await Promise.all(ids.map((id, i) => send(planes[i].token, id, r * 4, 4)));
				batches += acks.length;
				for (const ack of acks) expect(ack).toMatchObject({ ack: r * 4 + 3, stored: 4, duplicates: 0 });
			}
			const last = rounds * 4 - 1;
			for (const v of viewers) await v.waitFor(last);
			for (const v of viewers) {
				expect(v.seqs).toEqual(range(0, last));
				expect([v.stream.repeated, v.stream.skipped]).toEqual([0, 0]);
			}
			// Stored as acknowledged: the heads and counts in the table.
			const rows = await Promise.all(ids.map(async (id) => (await db.select().from(flights).where(eq(flights.id, id)))[0]));
			for (const f of rows) expect([f.lastSeq, f.sampleCount]).toEqual([last, last + 1]);
			// One NOTIFY served many flights (the monitor hears every one, the hubs' too).
			expect(heard - heard0).toBeLessThan(batches);
			// Each hub read the new samples of many flights per query.
			expect(a.hub.stats().runsRead).toBeGreaterThan(a.hub.stats().reads);
			for (const v of viewers) v.stream.close();
		} finally {
			await a.stop();
			await b.stop();
		}
	});

	it('retries, gaps and an archived aircraft in the same groups are answered as if each batch were stored alone', async () => {
		const planes = await fleet(4);
		const ids = await Promise.all(planes.map((p) => openFlight(p.token)));
		const inst = await startInstance(new LiveHub({ name: 'mixed' }));
		try {
			const vs = ids.map((id) => viewer(`${inst.url}/stream/${id}`));
			await Promise.all(ids.map((id, i) => send(planes[i].token, id, 0, 10)));
			await db.update(aircraft).set({ archivedAt: new Date() }).where(eq(aircraft.id, planes[3].aircraftId));
			const [plain, retry, ahead, archived] = await Promise.all([
				call('samples', planes[0].token, { flightId: ids[0], samples: samples(10, 10) }),
				call('samples', planes[1].token, { flightId: ids[1], samples: samples(0, 10) }),
				call('samples', planes[2].token, { flightId: ids[2], samples: samples(15, 5) }),
				call('samples', planes[3].token, { flightId: ids[3], samples: samples(10, 5) })
			]);
			expect(plain.body).toMatchObject({ ack: 19, stored: 10, duplicates: 0 });
			expect(retry.body).toMatchObject({ ack: 9, stored: 0, duplicates: 10 });
			expect(ahead.body).toMatchObject({ ack: 9, highest: 19, stored: 5 });
			expect(archived.status).toBe(409);
			expect(archived.body.field).toBe('aircraft');
			// The gap filled: the head jumps over what was stored ahead of it.
			expect((await send(planes[2].token, ids[2], 10, 5)).ack).toBe(19);
			await vs[0].waitFor(19);
			await vs[2].waitFor(19);
			expect(vs[0].seqs).toEqual(range(0, 19));
			expect(vs[1].seqs).toEqual(range(0, 9));
			expect(vs[2].seqs).toEqual(range(0, 19));
			expect(vs[3].seqs).toEqual(range(0, 9));
			const [f3] = await db.select().from(flights).where(eq(flights.id, ids[3]));
			expect(f3.lastSeq).toBe(9);
			for (const v of vs) v.stream.close();
		} finally {
			await inst.stop();
		}
	});
});
