// The versioned API as an integrator meets it: every error is an RFC 9457 problem
// (application/problem+json, `status` equal to the HTTP status, `instance` the path), the list
// endpoints page with an opaque cursor that gives every row exactly once, filter, and never show
// the trash, and personal tokens keep to their scope and expiry (403 / 401 problems).
import { beforeAll, describe, expect, it } from 'vitest';
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { aircraft, apiTokens, flights, memberships } from '$lib/server/db/schema';
import { createApiToken } from '$lib/server/accounts/api-tokens';
import { grantHolds } from '$lib/server/access';
import { hashToken } from '$lib/server/tokens';
import { apiConventions } from '$lib/server/hooks/api-conventions';
import { authenticate } from '$lib/server/hooks/authenticate';
import { aircraftPageSchema, flightPageSchema, problemSchema } from '$lib/schemas/api';
import { PROBLEM_CONTENT_TYPE } from '$lib/wire/problem';
import * as aircraftRoute from '../../src/routes/api/v1/aircraft/+server';
import * as flightsRoute from '../../src/routes/api/v1/flights/+server';
import * as samplesRoute from '../../src/routes/api/v1/flights/[id]/samples/+server';
import * as exportRoute from '../../src/routes/api/v1/flights/[id]/export/+server';
import * as streamRoute from '../../src/routes/api/v1/flights/[id]/stream/+server';
import * as liveOpen from '../../src/routes/api/v1/live/open/+server';
import * as liveSamples from '../../src/routes/api/v1/live/samples/+server';
import * as liveClose from '../../src/routes/api/v1/live/close/+server';
import * as fallbackRoute from '../../src/routes/api/[...rest]/+server';
import { actions as accountActions } from '../../src/routes/account/+page.server';
import { formOf, routeEvent } from './route-event';
import { makeClub, makeUser, steadyFile, upload, type Club } from './upload-fixture';

const ORIGIN = 'http://127.0.0.1:4173';
// Each route's handler takes its own typed event; these tests hand them the same plain one.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Route = (event: any) => Response | Promise<Response>;

/** A request through the API's own hooks (authentication by token, the API conventions), then the route. */
async function call(route: Route, routeId: string, path: string, o: { token?: string; method?: string; body?: BodyInit; headers?: Record<string, string>; params?: Record<string, string> } = {}) {
	const headers = new Headers(o.headers);
	if (o.token) headers.set('authorization', `Bearer ${o.token}`);
	const request = new Request(ORIGIN + path, { method: o.method ?? 'GET', headers, body: o.body });
	const event = {
		request,
		url: new URL(request.url),
		locals: {},
		route: { id: routeId },
		params: o.params ?? {},
		cookies: { get: () => undefined }
	} as unknown as RequestEvent;
	const inner: Handle = ({ event: e }) => Promise.resolve(route(e));
	const res = await apiConventions({ event, resolve: (e) => authenticate({ event: e, resolve: (e2) => inner({ event: e2, resolve: () => Promise.reject(new Error('unused')) }) }) });
	return res;
}

/** The answer as a problem, after checking it is one. */
async function expectProblem(res: Response, status: number, path: string) {
	expect(res.status).toBe(status);
	expect(res.headers.get('content-type')).toBe(PROBLEM_CONTENT_TYPE);
	const body = await res.json();
	const parsed = problemSchema.safeParse(body);
	expect(parsed.success, JSON.stringify(body)).toBe(true);
	expect(body.status).toBe(status);
	expect(body.instance).toBe(path);
	expect(body.type).toMatch(/^\/api-docs#problem-[a-z-]+$/);
	expect(body.detail.length).toBeGreaterThan(10);
	return body;
}

let club: Club;
let other: Club;
let readToken: string;
let uploadToken: string;
let viewerToken: string;
let outsiderToken: string;
let flightId: string;
const NONE = '00000000-0000-4000-8000-000000000000';

beforeAll(async () => {
	club = await makeClub('API Club');
	other = await makeClub('Other Club');
	readToken = await createApiToken(club.pilot.id, { name: 'reader', scope: 'read', expiresInDays: null });
	uploadToken = await createApiToken(club.pilot.id, { name: 'uploader', scope: 'upload', expiresInDays: 30 });
	viewerToken = await createApiToken(club.viewer.id, { name: 'viewer', scope: 'read', expiresInDays: null });
	outsiderToken = await createApiToken(other.pilot.id, { name: 'outsider', scope: 'upload', expiresInDays: null });
	const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 2, 1, 9), seconds: 600, flowUsgph: 8 }) });
	expect(res.status, JSON.stringify(res.body)).toBe(201);
	flightId = res.body.flightId;
});

describe('every /api/v1 error is a problem', () => {
	it('the flight endpoints: no credential 401 (with WWW-Authenticate), stranger 404, bad query 400', async () => {
		const endpoints: [Route, string, string][] = [
			[samplesRoute.GET, '/api/v1/flights/[id]/samples', 'samples'],
			[exportRoute.GET, '/api/v1/flights/[id]/export', 'export'],
			[streamRoute.GET, '/api/v1/flights/[id]/stream', 'stream']
		];
		for (const [route, id, leaf] of endpoints) {
			const path = `/api/v1/flights/${flightId}/${leaf}`;
			const anonymous = await call(route, id, path, { params: { id: flightId } });
			expect(anonymous.headers.get('www-authenticate')).toBe('Bearer realm="burndown"');
			await expectProblem(anonymous, 401, path);
			await expectProblem(await call(route, id, path, { token: outsiderToken, params: { id: flightId } }), 404, path);
			const missing = `/api/v1/flights/${NONE}/${leaf}`;
			await expectProblem(await call(route, id, missing, { token: readToken, params: { id: NONE } }), 404, missing);
		}
		const bad = await expectProblem(await call(samplesRoute.GET, '/api/v1/flights/[id]/samples', `/api/v1/flights/${flightId}/samples?format=xml`, { token: readToken, params: { id: flightId } }), 400, `/api/v1/flights/${flightId}/samples`);
		expect(bad.errors).toEqual([{ field: 'format', detail: 'format must be json or binary.' }]);
		const badUnit = await expectProblem(await call(exportRoute.GET, '/api/v1/flights/[id]/export', `/api/v1/flights/${flightId}/export?unit=pints`, { token: readToken, params: { id: flightId } }), 400, `/api/v1/flights/${flightId}/export`);
		expect(badUnit.errors[0].field).toBe('unit');
	});

	it('the upload: 401, 404 for an unknown aircraft, 400 naming the field, 403 for a viewer', async () => {
		const path = '/api/v1/flights';
		const csv = (aircraftId: string, extra = '') => `${path}?aircraftId=${aircraftId}&declaration=full${extra}`;
		const file = steadyFile({ start: Date.UTC(2026, 2, 2, 9), seconds: 60, flowUsgph: 8 });
		const post = (p: string, token?: string) => call(flightsRoute.POST, path, p, { token, method: 'POST', body: file, headers: { 'content-type': 'text/csv' } });
		expect((await expectProblem(await post(csv(club.trainer.id)), 401, path)).outcome).toBe('error');
		expect(await expectProblem(await post(csv(NONE), uploadToken), 404, path)).toMatchObject({ outcome: 'invalid', field: 'aircraftId' });
		const bad = await expectProblem(await post(`${path}?aircraftId=${club.trainer.id}&declaration=onBoard`, uploadToken), 400, path);
		expect(bad).toMatchObject({ outcome: 'invalid', field: 'amount', errors: [{ field: 'amount' }] });
		const viewerUpload = await createApiToken(club.viewer.id, { name: 'viewer upload', scope: 'upload', expiresInDays: null });
		await expectProblem(await post(csv(club.trainer.id), viewerUpload), 403, path);
	});

	it('the recorder API: 401 with its own realm, 400 and 415 naming what is wrong', async () => {
		for (const [route, leaf] of [[liveOpen.POST, 'open'], [liveSamples.POST, 'samples'], [liveClose.POST, 'close']] as const) {
			const path = `/api/v1/live/${leaf}`;
			const res = await call(route as Route, path, path, { method: 'POST', body: '{}', headers: { 'content-type': 'application/json', authorization: 'Bearer bdr_nope' } });
			expect(res.headers.get('www-authenticate')).toBe('Bearer realm="burndown-live"');
			await expectProblem(res, 401, path);
		}
	});

	it('an unknown API path: 404 naming it', async () => {
		const path = '/api/v1/no-such-thing';
		expect(await expectProblem(await call(fallbackRoute.fallback as Route, '/api/[...rest]', path, { method: 'DELETE' }), 404, path)).toMatchObject({ path });
	});

	it('the list endpoints: bad limit, bad date, bad cursor and a stranger organisation', async () => {
		const f = '/api/v1/flights';
		const a = '/api/v1/aircraft';
		const list = (route: Route, id: string, p: string) => call(route, id, p, { token: readToken });
		expect((await expectProblem(await list(flightsRoute.GET, f, `${f}?limit=0`), 400, f)).errors[0].field).toBe('limit');
		expect((await expectProblem(await list(flightsRoute.GET, f, `${f}?limit=201`), 400, f)).errors[0].field).toBe('limit');
		expect((await expectProblem(await list(flightsRoute.GET, f, `${f}?from=2026-13-01`), 400, f)).errors[0].field).toBe('from');
		for (const cursor of ['garbage', Buffer.from('["flights","x","y"]').toString('base64url'), Buffer.from(`["aircraft","BD-TST","${NONE}"]`).toString('base64url')]) {
			expect((await expectProblem(await list(flightsRoute.GET, f, `${f}?cursor=${cursor}`), 400, f)).errors).toEqual([{ field: 'cursor', detail: 'not a cursor of this list' }]);
		}
		await expectProblem(await list(aircraftRoute.GET, a, `${a}?cursor=garbage`), 400, a);
		await expectProblem(await list(aircraftRoute.GET, a, `${a}?archived=maybe`), 400, a);
		await expectProblem(await list(aircraftRoute.GET, a, `${a}?org=${other.slug}`), 404, a);
		await expectProblem(await list(flightsRoute.GET, f, `${f}?org=${other.slug}`), 404, f);
		await expectProblem(await call(flightsRoute.GET, f, f), 401, f);
	});
});

describe('personal API tokens: scope and expiry', () => {
	it('a read-only token reads but may not upload: 403 saying why', async () => {
		expect((await call(flightsRoute.GET, '/api/v1/flights', '/api/v1/flights', { token: readToken })).status).toBe(200);
		const path = '/api/v1/flights';
		const res = await call(flightsRoute.POST, path, `${path}?aircraftId=${club.trainer.id}&declaration=full`, {
			token: readToken,
			method: 'POST',
			body: steadyFile({ start: Date.UTC(2026, 2, 3, 9), seconds: 60, flowUsgph: 8 }),
			headers: { 'content-type': 'text/csv' }
		});
		const body = await expectProblem(res, 403, path);
		expect(body.detail).toMatch(/may only read .*scope "read and upload"/);
		const upload = await call(flightsRoute.POST, path, `${path}?aircraftId=${club.trainer.id}&declaration=full`, {
			token: uploadToken,
			method: 'POST',
			body: steadyFile({ start: Date.UTC(2026, 2, 3, 9), seconds: 60, flowUsgph: 8 }),
			headers: { 'content-type': 'text/csv' }
		});
		expect(upload.status, await upload.clone().text()).toBe(201);
		expect((await upload.json()).outcome).toBe('stored');
	});

	it('an expired token is refused with 401 saying it expired; a token expiring later still works', async () => {
		const token = await createApiToken(club.pilot.id, { name: 'short', scope: 'read', expiresInDays: 7 });
		const path = `/api/v1/flights/${flightId}/samples`;
		const route = '/api/v1/flights/[id]/samples';
		expect((await call(samplesRoute.GET, route, path, { token, params: { id: flightId } })).status).toBe(200);
		await db.update(apiTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(apiTokens.name, 'short'));
		const res = await call(samplesRoute.GET, route, path, { token, params: { id: flightId } });
		expect(res.headers.get('www-authenticate')).toBe('Bearer realm="burndown"');
		expect((await expectProblem(res, 401, path)).detail).toMatch(/expired at \d{4}-\d{2}-\d{2}T/);
	});

	it('the account page creates a token with the chosen scope and expiry, and refuses an unknown choice', async () => {
		const user = await makeUser('Tess Token');
		const create = (values: Record<string, string>) => accountActions.createToken(routeEvent(user, '/account', {}, formOf(values)) as never) as Promise<Record<string, unknown>>;
		const made = await create({ name: 'nightly export', scope: 'read', expiresInDays: '30' });
		expect(made.token).toMatch(/^bdk_/);
		const [row] = await db.select().from(apiTokens).where(eq(apiTokens.userId, user.id));
		expect(row.scope).toBe('read');
		expect(row.expiresAt!.getTime() - row.createdAt.getTime()).toBeGreaterThan(30 * 86_400_000 - 60_000);
		expect(row.expiresAt!.getTime() - row.createdAt.getTime()).toBeLessThan(30 * 86_400_000 + 60_000);
		const never = await create({ name: 'uploader', scope: 'upload', expiresInDays: '' });
		expect(never.token).toMatch(/^bdk_/);
		const refused = (await create({ name: 'odd', scope: 'admin', expiresInDays: '3' })) as unknown as { status: number; data: { errors: Record<string, string> } };
		expect(refused.status).toBe(400);
		expect(Object.keys(refused.data.errors).sort()).toEqual(['expiresInDays', 'scope']);
		expect((await db.select().from(apiTokens).where(eq(apiTokens.userId, user.id))).map((t) => [t.scope, t.expiresAt === null])).toEqual(
			expect.arrayContaining([
				['read', false],
				['upload', true]
			])
		);
	});

	it('a live stream opened with a token stops holding once the token expires', async () => {
		const token = await createApiToken(club.pilot.id, { name: 'stream', scope: 'read', expiresInDays: 7 });
		const grant = { userId: club.pilot.id, flightId, credential: { kind: 'token' as const, tokenHash: hashToken(token) } };
		expect(await grantHolds(grant)).toBe(true);
		await db.update(apiTokens).set({ expiresAt: new Date(Date.now() - 1) }).where(eq(apiTokens.tokenHash, hashToken(token)));
		expect(await grantHolds(grant)).toBe(false);
	});

	it('a token is a credential of the API only: on a page it signs nobody in', async () => {
		const request = new Request(`${ORIGIN}/o/${club.slug}/flights`, { headers: { authorization: `Bearer ${uploadToken}` } });
		const event = { request, url: new URL(request.url), locals: {}, route: { id: '/o/[org]/flights' }, params: {}, cookies: { get: () => undefined } } as unknown as RequestEvent;
		await authenticate({ event, resolve: () => Promise.resolve(new Response('')) });
		expect(event.locals.user).toBeNull();
	});
});

describe('the list endpoints', () => {
	let listClub: Club;
	let token: string;
	let pilotToken: string;
	const ids: string[] = [];
	let trashedId: string;
	beforeAll(async () => {
		listClub = await makeClub('List Club');
		const admin = await makeUser('Ada Admin');
		await db.insert(memberships).values({ orgId: listClub.orgId, userId: admin.id, role: 'admin' });
		token = await createApiToken(admin.id, { name: 'lists', scope: 'read', expiresInDays: null });
		pilotToken = await createApiToken(listClub.pilot.id, { name: 'pilot lists', scope: 'read', expiresInDays: null });
		// 23 flights over three aircraft; a few share an engine start (the cursor must keep them apart).
		const planes = [listClub.trainer, listClub.tourer, listClub.diesel];
		for (let i = 0; i < 23; i++) {
			const startedAt = new Date(Date.UTC(2026, 4, 1 + Math.floor(i / 2), 9, i % 3 === 0 ? 0 : i));
			const [row] = await db
				.insert(flights)
				.values({ orgId: listClub.orgId, aircraftId: planes[i % 3].id, pilotId: i % 2 ? listClub.pilot.id : admin.id, source: 'upload', status: 'closed', startedAt, declaration: { kind: 'full' } })
				.returning({ id: flights.id });
			ids.push(row.id);
		}
		const [t] = await db
			.insert(flights)
			.values({ orgId: listClub.orgId, aircraftId: listClub.trainer.id, pilotId: admin.id, source: 'upload', status: 'closed', startedAt: new Date(Date.UTC(2026, 4, 5, 9)), declaration: { kind: 'full' }, deletedAt: new Date() })
			.returning({ id: flights.id });
		trashedId = t.id;
	});

	/** Every page of a list, following `next` (and checking the Link header says the same). */
	async function walk(route: Route, routeId: string, first: string, t = token) {
		const seen: { id: string; startedAt?: string; aircraftId?: string; pilotId?: string | null; registration?: string }[] = [];
		let path: string | null = first;
		let pages = 0;
		while (path) {
			const res = await call(route, routeId, path, { token: t });
			expect(res.status, await res.clone().text()).toBe(200);
			const body = (routeId === '/api/v1/aircraft' ? aircraftPageSchema : flightPageSchema).parse(await res.json());
			if (body.next) expect(res.headers.get('link')).toBe(`<${body.next}>; rel="next"`);
			else expect(res.headers.get('link')).toBeNull();
			seen.push(...body.items);
			path = body.next;
			pages++;
			expect(pages).toBeLessThan(50);
		}
		return { seen, pages };
	}

	it('pages of 5 give every flight exactly once, newest first, never the trashed one', async () => {
		const { seen, pages } = await walk(flightsRoute.GET, '/api/v1/flights', `/api/v1/flights?org=${listClub.slug}&limit=5`);
		expect(pages).toBe(5);
		expect(seen.map((f) => f.id).sort()).toEqual([...ids].sort());
		expect(new Set(seen.map((f) => f.id)).size).toBe(23);
		expect(seen.some((f) => f.id === trashedId)).toBe(false);
		const times = seen.map((f) => Date.parse(f.startedAt!));
		expect(times).toEqual([...times].sort((x, y) => y - x));
	});

	it('a flight added between pages neither repeats nor hides what was there', async () => {
		const res = await call(flightsRoute.GET, '/api/v1/flights', `/api/v1/flights?org=${listClub.slug}&limit=10`, { token });
		const page1 = flightPageSchema.parse(await res.json());
		const [added] = await db
			.insert(flights)
			.values({ orgId: listClub.orgId, aircraftId: listClub.trainer.id, source: 'upload', status: 'closed', startedAt: new Date(Date.UTC(2026, 11, 1)), declaration: { kind: 'full' } })
			.returning({ id: flights.id });
		const rest = await walk(flightsRoute.GET, '/api/v1/flights', page1.next!);
		const all = [...page1.items.map((f) => f.id), ...rest.seen.map((f) => f.id)];
		expect(all.sort()).toEqual([...ids].sort());
		await db.delete(flights).where(eq(flights.id, added.id));
	});

	it('filters by aircraft, pilot and UTC days, and the pilot sees only their own flights', async () => {
		const byAircraft = await walk(flightsRoute.GET, '/api/v1/flights', `/api/v1/flights?aircraft=${listClub.tourer.id}&limit=3`);
		expect(byAircraft.seen.length).toBe(ids.filter((_, i) => i % 3 === 1).length);
		expect(byAircraft.seen.every((f) => f.aircraftId === listClub.tourer.id)).toBe(true);
		const byPilot = await walk(flightsRoute.GET, '/api/v1/flights', `/api/v1/flights?pilot=${listClub.pilot.id}`);
		expect(byPilot.seen.length).toBe(11);
		const days = await walk(flightsRoute.GET, '/api/v1/flights', `/api/v1/flights?org=${listClub.slug}&from=2026-05-03&to=2026-05-04`);
		// Flights 4 to 7 start on 3 and 4 May (two a day).
		expect(days.seen.map((f) => f.id).sort()).toEqual(ids.slice(4, 8).sort());
		const own = await walk(flightsRoute.GET, '/api/v1/flights', '/api/v1/flights', pilotToken);
		expect(own.seen.length).toBe(11);
		expect(own.seen.every((f) => f.pilotId === listClub.pilot.id)).toBe(true);
	});

	it('lists the aircraft of the organisation a page at a time, archived ones on request', async () => {
		await db.update(aircraft).set({ archivedAt: new Date() }).where(eq(aircraft.id, listClub.diesel.id));
		const current = await walk(aircraftRoute.GET, '/api/v1/aircraft', '/api/v1/aircraft?limit=1');
		expect(current.pages).toBe(2);
		expect(current.seen.map((a) => a.registration)).toEqual(['BD-TST', 'BD-TTT']);
		const all = await walk(aircraftRoute.GET, '/api/v1/aircraft', `/api/v1/aircraft?org=${listClub.slug}&archived=include&limit=2`);
		expect(all.seen.map((a) => a.registration)).toEqual(['BD-TST', 'BD-TTD', 'BD-TTT']);
		const archived = await walk(aircraftRoute.GET, '/api/v1/aircraft', '/api/v1/aircraft?archived=only');
		expect(archived.seen.map((a) => a.id)).toEqual([listClub.diesel.id]);
	});
});
