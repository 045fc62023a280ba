// Calls a route's load or form action the way SvelteKit would, with a fake cookie jar, so account
// rules are tested at the route boundary without a browser or a server.
import { isRedirect, type Cookies } from '@sveltejs/kit';
import type { AuthSession, AuthUser } from '$lib/server/auth';

export const ORIGIN = 'http://127.0.0.1:4173';

export class CookieJar {
	values = new Map<string, string>();
	get(name: string) {
		return this.values.get(name);
	}
	getAll() {
		return [...this.values].map(([name, value]) => ({ name, value }));
	}
	set(name: string, value: string, opts: { maxAge?: number } = {}) {
		if (value === '' || opts.maxAge === 0) this.values.delete(name);
		else this.values.set(name, value);
	}
	delete(name: string) {
		this.values.delete(name);
	}
	serialize() {
		return '';
	}
}

export interface FakeEventOptions {
	path: string;
	form?: Record<string, string>;
	params?: Record<string, string>;
	user?: AuthUser | null;
	session?: AuthSession | null;
	cookies?: CookieJar;
	address?: string;
	routeId?: string;
}

export function fakeEvent({ path, form, params = {}, user = null, session = null, cookies = new CookieJar(), address = '192.0.2.1', routeId }: FakeEventOptions) {
	const url = new URL(path, ORIGIN);
	const body = form ? new URLSearchParams(form) : undefined;
	const request = new Request(url, body ? { method: 'POST', body, headers: { 'content-type': 'application/x-www-form-urlencoded', origin: ORIGIN } } : undefined);
	return {
		request,
		url,
		params,
		cookies: cookies as unknown as Cookies,
		locals: { user, session, authVia: user ? 'session' : null },
		route: { id: routeId ?? url.pathname },
		getClientAddress: () => address,
		setHeaders: () => {},
		fetch,
		platform: undefined,
		isDataRequest: false,
		isSubRequest: false
	};
}

/** Runs a load or action: its value, a redirect's location, or an error's status. */
export async function run(fn: () => unknown): Promise<{ value?: any; redirect?: string; status?: number; thrown?: unknown }> {
	try {
		const value: any = await fn();
		if (value && typeof value === 'object' && 'status' in value && 'data' in value) return { value: value.data, status: value.status };
		return { value, status: 200 };
	} catch (thrown: any) {
		if (isRedirect(thrown)) return { redirect: thrown.location, status: thrown.status };
		if (thrown && typeof thrown.status === 'number') return { status: thrown.status, thrown };
		throw thrown;
	}
}
