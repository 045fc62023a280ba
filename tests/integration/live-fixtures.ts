// Shared set-up for the live integration tests: an organisation with two aircraft and a recorder
// each, members with API tokens (to open streams), calls into the real route handlers, and a
// tiny HTTP server that serves a given hub's stream, standing in for one app instance.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import { db } from '$lib/server/db';
import { aircraft, apiTokens, memberships, organisations, recorders, users, watches, type Role } from '$lib/server/db/schema';
import { hashToken, newToken } from '$lib/server/tokens';
import { handleSamples, liveStream, resumeAfter, type LiveHub } from '$lib/server/live';
import { recorderOf } from '$lib/server/access';
import { openLiveStream, type LiveStream } from '../../src/routes/o/[org]/flights/[id]/live/stream-client';
import type { SamplesEvent, MetaEvent } from '$lib/wire/live';
import { POST as postSamples } from '../../src/routes/api/v1/live/samples/+server';
import { POST as postOpen } from '../../src/routes/api/v1/live/open/+server';
import { POST as postClose } from '../../src/routes/api/v1/live/close/+server';

const US_GAL = 3.785411784; // NIST Handbook 44, Appendix C

export interface Member {
	id: string;
	email: string;
	name: string;
	role: Role;
	apiToken: string;
}

export interface LiveWorld {
	orgId: string;
	slug: string;
	aircraftA: string;
	aircraftB: string;
	tokenA: string;
	tokenB: string;
	recorderA: string;
	admin: Member;
	instructor: Member;
	pilot: Member;
	outsider: Member;
}

let counter = 0;
const uniq = () => `${Date.now().toString(36)}${(counter++).toString(36)}${randomBytes(2).toString('hex')}`;

async function member(orgId: string | null, role: Role, label: string): Promise<Member> {
	const id = `lv-${label}-${uniq()}`;
	const email = `${id}@kestrel-test.example`;
	await db.insert(users).values({ id, email, name: label, passwordHash: 'not-used' });
	if (orgId) await db.insert(memberships).values({ orgId, userId: id, role });
	const apiToken = newToken('bdk_');
	await db.insert(apiTokens).values({ userId: id, name: 'test', tokenHash: hashToken(apiToken) });
	return { id, email, name: label, role, apiToken };
}

/** An invented club with two four-seaters; alarm thresholds in litres as the schema stores them. */
export async function liveWorld(): Promise<LiveWorld> {
	const slug = `lv-${uniq()}`;
	const [org] = await db.insert(organisations).values({ name: 'Larkspur Valley Aero Club', slug }).returning();
	const plane = (registration: string) => ({
		orgId: org.id,
		registration,
		type: 'Four-seat trainer',
		fuelType: 'avgas' as const,
		densityKgPerL: 0.719,
		capacityL: 40 * US_GAL,
		lowerLevelL: 28 * US_GAL,
		unusableL: 3 * US_GAL,
		displayUnit: 'usgal' as const,
		lowFuelL: 10 * US_GAL,
		lowEnduranceMin: 45,
		reserveRule: 'faa-91.151-vfr-day' as const,
		baselineCruiseLph: 8.2 * US_GAL,
		lastOnBoardL: 36 * US_GAL
	});
	const [a] = await db.insert(aircraft).values(plane('BD-LVA')).returning();
	const [b] = await db.insert(aircraft).values(plane('BD-LVB')).returning();
	const tokenA = newToken('bdr_');
	const tokenB = newToken('bdr_');
	const [ra] = await db.insert(recorders).values({ orgId: org.id, aircraftId: a.id, name: 'panel A', tokenHash: hashToken(tokenA), tokenHint: tokenA.slice(0, 12) }).returning();
	await db.insert(recorders).values({ orgId: org.id, aircraftId: b.id, name: 'panel B', tokenHash: hashToken(tokenB), tokenHint: tokenB.slice(0, 12) });
	return {
		orgId: org.id,
		slug,
		aircraftA: a.id,
		aircraftB: b.id,
		tokenA,
		tokenB,
		recorderA: ra.id,
		admin: await member(org.id, 'admin', 'admin'),
		instructor: await member(org.id, 'instructor', 'instructor'),
		pilot: await member(org.id, 'pilot', 'pilot'),
		outsider: await member(null, 'admin', 'outsider')
	};
}

export async function watch(userId: string, target: { aircraftId?: string; flightId?: string }): Promise<void> {
	await db.insert(watches).values({ userId, ...target });
}

// ---- samples ----------------------------------------------------------------------------

export const T0 = Date.UTC(2026, 4, 2, 9, 0, 0);

export interface SampleSpec {
	seq: number;
	/** Seconds after T0. */
	s?: number;
	/** US gal/h. */
	flowGph?: number;
	gs?: number;
	dtg?: number;
	wpt?: string | null;
}

/** Samples one a second from T0 + seq, cruising at 9 US gal/h (given in L/h on the wire). */
export function samples(from: number, count: number, over: Partial<SampleSpec> = {}) {
	return Array.from({ length: count }, (_, i) => {
		const seq = from + i;
		return {
			seq,
			t: new Date(T0 + (over.s ?? seq) * 1000).toISOString(),
			flow: (over.flowGph ?? 9) * US_GAL,
			gs: over.gs ?? 110,
			dtg: over.dtg ?? Math.max(0, 60 - seq * 0.03),
			wpt: over.wpt === undefined ? 'WPT-B' : over.wpt
		};
	});
}

// ---- the real routes ----------------------------------------------------------------------

const BASE = 'http://127.0.0.1:4173';

function requestEvent(path: string, init: RequestInit) {
	const url = new URL(path, BASE);
	const request = new Request(url, init);
	// The recorder routes read only the request and the URL.
	return { request, url, params: {}, locals: { user: null, session: null, authVia: null }, route: { id: url.pathname } } as never;
}

export async function call(route: 'samples' | 'open' | 'close', token: string | null, body: unknown, opts: { csv?: boolean; query?: string } = {}) {
	const handler = { samples: postSamples, open: postOpen, close: postClose }[route];
	const headers: Record<string, string> = { 'content-type': opts.csv ? 'text/csv' : 'application/json' };
	if (token) headers.authorization = `Bearer ${token}`;
	const response = await handler(requestEvent(`/api/v1/live/${route}${opts.query ?? ''}`, { method: 'POST', headers, body: typeof body === 'string' || body instanceof Uint8Array ? (body as BodyInit) : JSON.stringify(body) }));
	return { status: response.status, body: (await response.json()) as Record<string, any> };
}

// ---- one "app instance": a hub behind an HTTP server --------------------------------------

export interface Instance {
	url: string;
	port: number;
	hub: LiveHub;
	server: http.Server;
	stop(): Promise<void>;
}

/**
 * Serves GET /stream/<flightId> (Last-Event-ID or ?after=n, as the app route) from `hub` through the same liveStream() the app route
 * returns (access checks are the route's and are tested against the route itself), and the
 * recorder's POST /api/v1/live/samples through the same handler the app route calls.
 */
export async function startInstance(hub: LiveHub, port = 0): Promise<Instance> {
	const sockets = new Set<import('node:net').Socket>();
	const server = http.createServer(async (req, res) => {
		const url = new URL(req.url ?? '/', 'http://127.0.0.1');
		if (req.method === 'POST' && url.pathname === '/api/v1/live/samples') {
			const chunks: Buffer[] = [];
			for await (const c of req) chunks.push(c as Buffer);
			const request = new Request(url, { method: 'POST', headers: req.headers as Record<string, string>, body: Buffer.concat(chunks) });
			const answer = await handleSamples(request, url, await recorderOf(request));
			res.writeHead(answer.status, { 'content-type': 'application/json' }).end(await answer.text());
			return;
		}
		const m = /^\/stream\/([0-9a-f-]{36})$/.exec(url.pathname);
		if (!m) {
			res.writeHead(404).end();
			return;
		}
		const response = liveStream(hub, m[1], resumeAfter(new Request(url, { headers: req.headers as Record<string, string> }), url));
		res.writeHead(response.status, Object.fromEntries(response.headers));
		res.flushHeaders();
		const reader = response.body!.getReader();
		req.on('close', () => void reader.cancel().catch(() => {}));
		try {
			for (;;) {
				const { done, value } = await reader.read();
				if (done) break;
				res.write(value);
			}
		} catch {
			// the viewer left
		}
		res.end();
	});
	server.on('connection', (s) => {
		sockets.add(s);
		s.on('close', () => sockets.delete(s));
	});
	await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
	const actual = (server.address() as AddressInfo).port;
	return {
		url: `http://127.0.0.1:${actual}`,
		port: actual,
		hub,
		server,
		// A hard stop, as a killed process would: every open connection is cut.
		async stop() {
			for (const s of sockets) s.destroy();
			await new Promise<void>((resolve) => server.close(() => resolve()));
			await hub.stop();
		}
	};
}

/** A viewer using the live page's own stream client, recording every sequence it is given. */
export interface Viewer {
	stream: LiveStream;
	seqs: number[];
	metas: MetaEvent[];
	statuses: string[];
	/** The cursor each connection asked to resume after (from its hello event). */
	hellos: number[];
	waitFor(seq: number, timeoutMs?: number): Promise<void>;
}

export function viewer(url: string, after = -1, headers?: Record<string, string>): Viewer {
	const seqs: number[] = [];
	const metas: MetaEvent[] = [];
	const statuses: string[] = [];
	const hellos: number[] = [];
	const stream = openLiveStream({
		url,
		after,
		headers,
		minRetryMs: 50,
		maxRetryMs: 300,
		onSamples: (run: SamplesEvent) => {
			for (let s = run.from; s <= run.to; s++) seqs.push(s);
			if (run.tMs.length !== run.to - run.from + 1) throw new Error('run length does not match its range');
		},
		onMeta: (m) => metas.push(m),
		onStatus: (s) => statuses.push(s),
		onHello: (h) => hellos.push(h.after)
	});
	return {
		stream,
		seqs,
		metas,
		statuses,
		hellos,
		async waitFor(seq, timeoutMs = 10_000) {
			const deadline = Date.now() + timeoutMs;
			while (stream.cursor < seq) {
				if (Date.now() > deadline) throw new Error(`viewer at ${stream.cursor}, waited for ${seq}`);
				await new Promise((r) => setTimeout(r, 20));
			}
		}
	};
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** 0, 1, …, n − 1. */
export const range = (from: number, to: number) => Array.from({ length: to - from + 1 }, (_, i) => from + i);
