import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { authorizedGuard } from './authorized-guard';
import { cacheControl } from './cache-control';
import { PUBLIC_ROUTES } from '../public-routes';

type Access = 'granted' | 'refused' | null;

function run(handle: typeof authorizedGuard, o: { routeId: string | null; url?: string; method?: string; user?: boolean; decide?: Access; status?: number; headers?: Record<string, string> }) {
	const url = new URL(o.url ?? 'http://127.0.0.1:4173/o/kestrel/members');
	const event = {
		url,
		route: { id: o.routeId },
		request: new Request(url, { method: o.method ?? 'GET' }),
		locals: { user: o.user ? { id: 'u1' } : null, session: null, authVia: null } as Record<string, unknown>
	};
	const resolve = async () => {
		// The route's own load / action / handler runs here and may call a helper.
		if (o.decide !== undefined) event.locals.access = o.decide;
		return new Response('the page', { status: o.status ?? 200, headers: o.headers });
	};
	return handle({ event, resolve } as never) as Promise<Response>;
}

describe('authorizedGuard', () => {
	const logged = vi.spyOn(console, 'error').mockImplementation(() => {});
	afterEach(() => logged.mockClear());

	it('refuses with 500 an answer of a non-public route where no helper decided, naming the route and action', async () => {
		const page = await run(authorizedGuard, { routeId: '/o/[org]/members' });
		expect(page.status).toBe(500);
		expect(await page.text()).toMatch(/No authorization check ran for GET \/o\/\[org\]\/members/);
		expect(logged).toHaveBeenCalledWith(expect.stringMatching(/^\[authorization\] GET \/o\/\[org\]\/members answered 200/));
		const action = await run(authorizedGuard, { routeId: '/o/[org]/members', url: 'http://127.0.0.1:4173/o/kestrel/members?/remove', method: 'POST', status: 400 });
		expect(action.status).toBe(500);
		expect(logged).toHaveBeenLastCalledWith(expect.stringMatching(/POST \/o\/\[org\]\/members \?\/remove answered 400/));
		const api = await run(authorizedGuard, { routeId: '/api/v1/flights/[id]/samples', url: 'http://127.0.0.1:4173/api/v1/flights/x/samples' });
		expect(api.status).toBe(500);
		expect(await api.json()).toEqual({ error: 'No authorization check ran for GET /api/v1/flights/[id]/samples.' });
	});

	it('lets through what a helper granted or refused, public routes, and requests no route matched', async () => {
		for (const [o, status] of [
			[{ routeId: '/o/[org]/members', decide: 'granted' as Access }, 200],
			[{ routeId: '/o/[org]/members', decide: 'refused' as Access, status: 303 }, 303],
			[{ routeId: '/api/v1/flights/[id]/samples', decide: 'refused' as Access, status: 401 }, 401],
			[{ routeId: '/sign-in' }, 200],
			[{ routeId: '/api/health' }, 200],
			[{ routeId: null, status: 404 }, 404],
			[{ routeId: '/o/[org]/members', status: 405 }, 405]
		] as const) {
			const r = await run(authorizedGuard, o);
			expect(r.status, JSON.stringify(o)).toBe(status);
		}
		expect(logged).not.toHaveBeenCalled();
	});

	it('lists only routes that exist', () => {
		const root = path.resolve('src/routes');
		for (const id of PUBLIC_ROUTES.keys()) expect(fs.existsSync(path.join(root, id)), id).toBe(true);
	});
});

describe('cacheControl', () => {
	it('marks signed-in pages and every API answer no-store, and leaves public pages alone', async () => {
		expect((await run(cacheControl, { routeId: '/o/[org]', user: true })).headers.get('cache-control')).toBe('no-store');
		expect((await run(cacheControl, { routeId: '/api/health', url: 'http://127.0.0.1:4173/api/health' })).headers.get('cache-control')).toBe('no-store');
		// A route's own weaker setting does not survive on a personal answer.
		const api = await run(cacheControl, { routeId: '/api/v1/flights/[id]/export', url: 'http://127.0.0.1:4173/api/v1/flights/x/export', user: true, headers: { 'cache-control': 'max-age=600' } });
		expect(api.headers.get('cache-control')).toBe('no-store');
		expect((await run(cacheControl, { routeId: '/sign-in', url: 'http://127.0.0.1:4173/sign-in' })).headers.get('cache-control')).toBeNull();
	});
});
