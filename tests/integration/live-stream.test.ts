// The viewer side of live flights: the stream route's access checks, every sample delivered once
// and in order through reconnects, a server restart and a lost LISTEN connection, two app
// instances on one database, catch-up of a late viewer, and no server state left behind.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { LiveHub, liveHub, stopLive } from '$lib/server/live';
import { setLiveDeclaration } from '$lib/server/live/declare';
import { GET as streamGet } from '../../src/routes/api/v1/flights/[id]/stream/+server';
import { openLiveStream } from '../../src/routes/o/[org]/flights/[id]/live/stream-client';
import { call, liveWorld, range, samples, sleep, startInstance, viewer, type LiveWorld, type Member } from './live-fixtures';

let w: LiveWorld;
beforeAll(async () => {
	w = await liveWorld();
});
afterAll(async () => {
	await stopLive();
});

/** fetch() that runs the real stream route in this process, as `user`. */
function routeFetch(user: Member | null): typeof fetch {
	return (async (input: RequestInfo | URL, init?: RequestInit) => {
		const url = new URL(String(input));
		const id = url.pathname.split('/')[4];
		const event = {
			request: new Request(url, { headers: { ...(init?.headers as Record<string, string>), ...(user ? { authorization: `Bearer ${user.apiToken}` } : {}) } }),
			url,
			params: { id },
			locals: { user: user && { id: user.id, email: user.email, name: user.name, prefFuelUnit: null, timeZone: null }, session: null, authVia: user ? 'token' : null },
			route: { id: '/api/v1/flights/[id]/stream' }
		};
		let res: Response;
		try {
			res = await streamGet(event as never);
		} catch (e) {
			if (isHttpError(e)) return new Response(JSON.stringify(e.body), { status: e.status });
			throw e;
		}
		// Stand in for the network: aborting the request cancels the response stream.
		const pass = new TransformStream<Uint8Array, Uint8Array>();
		res.body!.pipeTo(pass.writable, { signal: init?.signal ?? undefined }).catch(() => {});
		return new Response(pass.readable, { status: res.status, headers: res.headers });
	}) as typeof fetch;
}

const routeUrl = (flightId: string) => `http://127.0.0.1:4173/api/v1/flights/${flightId}/stream`;

async function openFlight(): Promise<string> {
	// Flown by the instructor: a flight with no pilot yet is open to every pilot of the club to claim.
	const r = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 }, pilot: w.instructor.email });
	expect(r.status).toBe(201);
	return r.body.flightId;
}

async function send(flightId: string, from: number, count: number, via?: string): Promise<number> {
	const body = { flightId, samples: samples(from, count) };
	if (via) {
		const res = await fetch(`${via}/api/v1/live/samples`, { method: 'POST', headers: { authorization: `Bearer ${w.tokenA}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });
		expect(res.status).toBe(200);
		return ((await res.json()) as { ack: number }).ack;
	}
	const r = await call('samples', w.tokenA, body);
	expect(r.status).toBe(200);
	return r.body.ack;
}

describe('the stream route', () => {
	it('answers 401 without a member, 404 to another organisation, 403 to a pilot of others', async () => {
		const flightId = await openFlight();
		expect((await routeFetch(null)(routeUrl(flightId))).status).toBe(401);
		expect((await routeFetch(w.outsider)(routeUrl(flightId))).status).toBe(404);
		expect((await routeFetch(w.pilot)(routeUrl(flightId))).status).toBe(403);
		expect((await routeFetch(w.instructor)('http://127.0.0.1:4173/api/v1/flights/not-a-uuid/stream')).status).toBe(404);
		const ctrl = new AbortController();
		const ok = await routeFetch(w.instructor)(routeUrl(flightId), { signal: ctrl.signal });
		expect(ok.status).toBe(200);
		expect(ok.headers.get('content-type')).toBe('text/event-stream');
		const first = await ok.body!.getReader().read();
		// No id on hello: only samples events carry one (their last sequence), so a resume is exact.
		expect(new TextDecoder().decode(first.value)).toMatch(/^event: hello\ndata: /);
		ctrl.abort();
		const denied: string[] = [];
		const s = openLiveStream({ url: routeUrl(flightId), fetch: routeFetch(w.outsider), onStatus: (x) => denied.push(x) });
		await sleep(100);
		expect(denied).toContain('denied');
		s.close();
	});

	it('delivers every sample once and in order, through forced reconnects and out-of-order batches', async () => {
		const flightId = await openFlight();
		const seqs: number[] = [];
		const stream = openLiveStream({
			url: routeUrl(flightId),
			fetch: routeFetch(w.instructor),
			minRetryMs: 20,
			maxRetryMs: 100,
			onSamples: (run) => {
				for (let s = run.from; s <= run.to; s++) seqs.push(s);
			}
		});
		for (let b = 0; b < 300; b += 30) {
			// Each step: the later half before the earlier half, and a retry of the earlier one.
			await send(flightId, b + 15, 15);
			await send(flightId, b, 15);
			await send(flightId, b, 15);
			if (b % 90 === 0) stream.reconnect();
		}
		const deadline = Date.now() + 10_000;
		while (stream.cursor < 299 && Date.now() < deadline) await sleep(20);
		expect(seqs).toEqual(range(0, 299));
		expect(stream.connections).toBeGreaterThanOrEqual(3);
		expect(stream.repeated).toBe(0);
		stream.close();
	});
});

describe('a recorder that does not count from zero', () => {
	it('a viewer holding nothing gets the flight from its first sequence, before and after samples arrive', async () => {
		const r = await call('open', w.tokenA, { declaration: { kind: 'onBoard', amount: 30 }, firstSeq: 100_000 });
		expect(r.status).toBe(201);
		const flightId = r.body.flightId as string;
		const early: number[] = [];
		const late: number[] = [];
		const collect = (into: number[]) => (run: { from: number; to: number }) => {
			for (let s = run.from; s <= run.to; s++) into.push(s);
		};
		// One viewer opens before the first sample, one after some have arrived; both hold nothing.
		const first = openLiveStream({ url: routeUrl(flightId), fetch: routeFetch(w.instructor), onSamples: collect(early) });
		await sleep(100);
		await send(flightId, 100_000, 40);
		const second = openLiveStream({ url: routeUrl(flightId), fetch: routeFetch(w.instructor), onSamples: collect(late) });
		await send(flightId, 100_040, 40);
		const deadline = Date.now() + 10_000;
		while ((first.cursor < 100_079 || second.cursor < 100_079) && Date.now() < deadline) await sleep(20);
		expect(early).toEqual(range(100_000, 100_079));
		expect(late).toEqual(range(100_000, 100_079));
		first.close();
		second.close();
	});
});

describe('reconnects and restarts', () => {
	it('a viewer cut off mid-flight by a server restart receives exactly the missing samples', async () => {
		const flightId = await openFlight();
		const first = await startInstance(new LiveHub({ name: 'before restart' }));
		const v = viewer(`${first.url}/stream/${flightId}`);
		await send(flightId, 0, 100);
		await v.waitFor(99);
		// The instance dies: every connection cut, its hub and LISTEN connection gone.
		await first.stop();
		expect(await send(flightId, 100, 100)).toBe(199);
		await sleep(150);
		expect(v.stream.cursor).toBe(99);
		// A new process comes up on the same port; the client resumes from its own cursor.
		const second = await startInstance(new LiveHub({ name: 'after restart' }), first.port);
		await v.waitFor(199);
		await send(flightId, 200, 50);
		await v.waitFor(249);
		expect(v.seqs).toEqual(range(0, 249));
		// It asked the new server for what came after 99, and was sent nothing twice.
		expect(v.hellos.slice(0, 2)).toEqual([-1, 99]);
		expect(v.stream.repeated).toBe(0);
		expect(v.stream.skipped).toBe(0);
		expect(v.stream.connections).toBeGreaterThanOrEqual(2);
		expect(v.statuses).toContain('reconnecting');
		v.stream.close();
		await second.stop();
	});

	it('a page reloaded with its cursor gets only what it has not seen', async () => {
		const flightId = await openFlight();
		const inst = await startInstance(new LiveHub());
		await send(flightId, 0, 120);
		const v = viewer(`${inst.url}/stream/${flightId}`, 79);
		await v.waitFor(119);
		expect(v.seqs).toEqual(range(80, 119));
		expect(v.stream.repeated).toBe(0);
		v.stream.close();
		await inst.stop();
	});

	it('loses nothing when the LISTEN connection drops', async () => {
		const flightId = await openFlight();
		const hub = new LiveHub({ name: 'flaky' });
		const inst = await startInstance(hub);
		const v = viewer(`${inst.url}/stream/${flightId}`);
		await send(flightId, 0, 50);
		await v.waitFor(49);
		hub.simulateConnectionLoss();
		await send(flightId, 50, 50);
		await send(flightId, 100, 50);
		await v.waitFor(149);
		expect(v.seqs).toEqual(range(0, 149));
		expect(v.stream.repeated).toBe(0);
		expect(hub.stats().reconnects).toBeGreaterThanOrEqual(1);
		v.stream.close();
		await inst.stop();
	});
});

describe('two app instances on one database', () => {
	it('ingest through one, a viewer on the other gets every sample in order', async () => {
		const flightId = await openFlight();
		const a = await startInstance(new LiveHub({ name: 'A' }));
		const b = await startInstance(new LiveHub({ name: 'B' }));
		const onB = viewer(`${b.url}/stream/${flightId}`);
		const onA = viewer(`${a.url}/stream/${flightId}`);
		await sleep(100);
		let ack = -1;
		for (let s = 0; s < 500; s += 25) ack = await send(flightId, s, 25, a.url);
		expect(ack).toBe(499);
		await onB.waitFor(499);
		await onA.waitFor(499);
		expect(onB.seqs).toEqual(range(0, 499));
		expect(onA.seqs).toEqual(range(0, 499));
		expect([onA.stream.repeated, onB.stream.repeated, onA.stream.skipped, onB.stream.skipped]).toEqual([0, 0, 0, 0]);
		expect(b.hub.stats().notices).toBeGreaterThanOrEqual(20);

		// A declaration set during the flight reaches viewers on both instances.
		await setLiveDeclaration(flightId, { kind: 'onBoard', amountL: 100 }, null);
		const deadline = Date.now() + 5000;
		const has = (v: typeof onA) => v.metas.some((m) => m.declaration.kind === 'onBoard' && 'amountL' in m.declaration && m.declaration.amountL === 100);
		while (!(has(onA) && has(onB)) && Date.now() < deadline) await sleep(20);
		expect(has(onA) && has(onB)).toBe(true);
		onA.stream.close();
		onB.stream.close();
		await a.stop();
		await b.stop();
	});
});

describe('catch-up and clean-up', () => {
	it('a late viewer catches up from the start in pages, then follows live', async () => {
		const flightId = await openFlight();
		for (let s = 0; s < 5000; s += 1000) await send(flightId, s, 1000);
		const inst = await startInstance(new LiveHub());
		const early = viewer(`${inst.url}/stream/${flightId}`, 4900);
		await early.waitFor(4999);
		const late = viewer(`${inst.url}/stream/${flightId}`);
		await send(flightId, 5000, 10);
		await late.waitFor(5009);
		await early.waitFor(5009);
		expect(late.seqs).toEqual(range(0, 5009));
		expect(early.seqs).toEqual(range(4901, 5009));
		expect(late.stream.repeated + early.stream.repeated).toBe(0);
		late.stream.close();
		early.stream.close();
		await inst.stop();
	});

	it('ends the stream of a closed flight once the viewer holds all of it, and a live viewer with it', async () => {
		const flightId = await openFlight();
		await send(flightId, 0, 40);
		const hub = new LiveHub();
		const inst = await startInstance(hub);
		const following = viewer(`${inst.url}/stream/${flightId}`);
		await following.waitFor(39);
		expect((await call('close', w.tokenA, { flightId })).status).toBe(200);
		const late = viewer(`${inst.url}/stream/${flightId}`, 9);
		const deadline = Date.now() + 5000;
		while (!(following.statuses.includes('ended') && late.statuses.includes('ended')) && Date.now() < deadline) await sleep(20);
		expect(following.statuses.at(-1)).toBe('ended');
		expect(late.statuses.at(-1)).toBe('ended');
		expect(late.seqs).toEqual(range(10, 39));
		expect(following.metas.at(-1)?.flight.status).toBe('closed');
		expect(following.stream.connections + late.stream.connections).toBe(2);
		expect(hub.stats()).toMatchObject({ viewers: 0, flights: 0 });
		await inst.stop();
	});

	it('leaves no server-side state after many connect/disconnect cycles', async () => {
		const flightId = await openFlight();
		await send(flightId, 0, 10);
		const hub = new LiveHub();
		const inst = await startInstance(hub);
		const idle = async () => {
			const deadline = Date.now() + 5000;
			while ((hub.stats().viewers > 0 || hub.stats().flights > 0) && Date.now() < deadline) await sleep(20);
			return hub.stats();
		};
		for (let round = 0; round < 2; round++) {
			for (let i = 0; i < 50; i++) {
				const v = viewer(`${inst.url}/stream/${flightId}`);
				await v.waitFor(9);
				v.stream.close();
			}
			expect(await idle()).toMatchObject({ viewers: 0, flights: 0 });
		}
		// The process-wide hub of the route is cleaned up the same way.
		expect(liveHub().stats().viewers).toBe(0);
		await inst.stop();
	});
});

describe('a stream whose viewer loses access', () => {
	/** Opens the real route as `user` (by API token, or by a session of theirs) and reads it to its end. */
	async function openRaw(user: Member, session?: { id: string; expiresAt: Date; fresh: boolean; userId: string; createdAt: Date }) {
		const flightUrl = new URL(routeUrl(currentFlight));
		const event = {
			request: new Request(flightUrl, { headers: session ? {} : { authorization: `Bearer ${user.apiToken}` } }),
			url: flightUrl,
			params: { id: currentFlight },
			locals: { user: { id: user.id, email: user.email, name: user.name, prefFuelUnit: null, timeZone: null }, session: session ?? null, authVia: session ? 'session' : 'token' },
			route: { id: '/api/v1/flights/[id]/stream' }
		};
		const res = await streamGet(event as never);
		expect(res.status).toBe(200);
		const reader = res.body!.getReader();
		let text = '';
		let endedAt: number | null = null;
		const done = (async () => {
			for (;;) {
				const { done, value } = await reader.read();
				if (done) break;
				text += new TextDecoder().decode(value);
			}
			endedAt = Date.now();
		})();
		return {
			get text() {
				return text;
			},
			get endedAt() {
				return endedAt;
			},
			done,
			cancel: () => reader.cancel().catch(() => {})
		};
	}
	let currentFlight = '';
	const waitEnd = async (s: { endedAt: number | null }, withinMs: number) => {
		const deadline = Date.now() + withinMs;
		while (s.endedAt === null && Date.now() < deadline) await sleep(20);
		return s.endedAt;
	};
	const setPeriod = (seconds: string | undefined) => {
		if (seconds === undefined) delete process.env.LIVE_STREAM_RECHECK_SECONDS;
		else process.env.LIVE_STREAM_RECHECK_SECONDS = seconds;
	};
	afterAll(() => setPeriod(undefined));

	it('ends within the check period once the viewer may no longer see the flight, and stays open while they may', async () => {
		setPeriod('0.2');
		currentFlight = await openFlight();
		await send(currentFlight, 0, 5);
		// The pilot's own flight: they see it while it is theirs.
		const { flights } = await import('$lib/server/db/schema');
		const { db } = await import('$lib/server/db');
		const { eq } = await import('drizzle-orm');
		await db.update(flights).set({ pilotId: w.pilot.id }).where(eq(flights.id, currentFlight));
		const pilot = await openRaw(w.pilot);
		const instructor = await openRaw(w.instructor);
		await sleep(700); // several check periods
		expect(pilot.endedAt).toBeNull();
		expect(instructor.endedAt).toBeNull();
		// Reassigned to another pilot (no notice for this: only the periodic check sees it).
		await db.update(flights).set({ pilotId: w.admin.id }).where(eq(flights.id, currentFlight));
		const changedAt = Date.now();
		const ended = await waitEnd(pilot, 5000);
		expect(ended, 'the pilot stream ended').not.toBeNull();
		expect(ended! - changedAt).toBeLessThan(200 + 1000);
		// The instructor may still view it: their stream goes on and keeps delivering.
		await send(currentFlight, 5, 5);
		await sleep(300);
		expect(instructor.endedAt).toBeNull();
		expect(instructor.text).toMatch(/"to":9/);
		instructor.cancel();
		await instructor.done;
	});

	it('ends at once on sign-out, removal from the organisation and a revoked token, even with a long period', async () => {
		setPeriod('3600');
		currentFlight = await openFlight();
		await send(currentFlight, 0, 5);
		const { db } = await import('$lib/server/db');
		const { apiTokens, memberships } = await import('$lib/server/db/schema');
		const { and, eq } = await import('drizzle-orm');
		const { lucia } = await import('$lib/server/auth');

		// Sign-out: the session row is deleted.
		const session = await lucia.createSession(w.instructor.id, { createdAt: new Date() });
		const bySession = await openRaw(w.instructor, session as never);
		const byToken = await openRaw(w.instructor);
		await sleep(300);
		expect(bySession.endedAt).toBeNull();
		await lucia.invalidateSession(session.id);
		expect(await waitEnd(bySession, 3000), 'the signed-out stream ended').not.toBeNull();
		// The same user's token stream holds: only the ended session's stream closed.
		await sleep(200);
		expect(byToken.endedAt).toBeNull();
		await db.update(apiTokens).set({ revokedAt: new Date() }).where(eq(apiTokens.userId, w.instructor.id));
		expect(await waitEnd(byToken, 3000), 'the revoked token stream ended').not.toBeNull();

		// Removal from the organisation.
		const admin = await openRaw(w.admin);
		await sleep(200);
		expect(admin.endedAt).toBeNull();
		await db.delete(memberships).where(and(eq(memberships.userId, w.admin.id), eq(memberships.orgId, w.orgId)));
		expect(await waitEnd(admin, 3000), 'the removed member stream ended').not.toBeNull();
		// Reconnecting is refused by the route itself.
		expect((await routeFetch(w.admin)(routeUrl(currentFlight))).status).toBe(404);
		expect(liveHub().stats()).toMatchObject({ accessWatchers: 0 });
	});
});
