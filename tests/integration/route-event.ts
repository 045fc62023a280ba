// A request event for calling a route's load or form action directly, as SvelteKit would: the
// signed-in user (or none), the route id the authorization guard reads, and a form body for POST.
import type { RequestEvent } from '@sveltejs/kit';
import type { AuthUser } from '$lib/server/auth';

export function routeEvent(user: AuthUser | null, route: string, params: Record<string, string>, body?: FormData, search = ''): RequestEvent {
	const url = new URL(`http://127.0.0.1:4173/${search}`);
	return {
		locals: { user, session: null, authVia: user ? 'session' : null },
		params,
		url,
		route: { id: route },
		request: new Request(url, { method: body ? 'POST' : 'GET', body }),
		setHeaders: () => {}
	} as unknown as RequestEvent;
}

/** Form fields as a browser would post them. */
export function formOf(values: Record<string, string>): FormData {
	const fd = new FormData();
	for (const [k, x] of Object.entries(values)) fd.set(k, x);
	return fd;
}
