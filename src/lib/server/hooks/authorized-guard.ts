// A safety net under the rule "every load, action and handler calls an authorization helper": an
// answer of a route that is not public, where no helper of access.ts decided (granted or refused),
// is replaced by a 500 and logged with the route and action, so a forgotten check fails loudly in
// tests and development instead of serving data. Public routes are listed in public-routes.ts.
//
// In production it does the same: failing closed (a broken page) is preferred over failing open
// (someone else's data). The handler has run by then, so the guard hides the answer but cannot
// undo a write; the access matrix (tests/e2e/access-matrix.spec.ts) walks every route and action
// so such a gap is found before release.
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { isPublicRoute } from '../public-routes';

/** What reached the handler, in words for the log: "POST /o/[org]/members ?/remove". */
export function describeRequest(event: Pick<RequestEvent, 'request' | 'route' | 'url'>): string {
	const action = [...event.url.searchParams.keys()].find((k) => k.startsWith('/'));
	return `${event.request.method} ${event.route.id}${action ? ` ?${action}` : ''}`;
}

export const authorizedGuard: Handle = async ({ event, resolve }) => {
	event.locals.access = null;
	const response = await resolve(event);
	const id = event.route.id;
	// No route matched (SvelteKit's own 404), a public route, or a helper decided.
	if (id === null || isPublicRoute(id) || event.locals.access) return response;
	// Answers that no handler produced: method not allowed, or a failure already on its way.
	if (response.status === 405 || response.status >= 500) return response;
	const what = describeRequest(event);
	console.error(`[authorization] ${what} answered ${response.status} without any authorization helper of src/lib/server/access.ts deciding; refused with 500. Call one in its load, action or handler, or list the route in src/lib/server/public-routes.ts.`);
	const body = `No authorization check ran for ${what}.`;
	const api = id.startsWith('/api/') || event.url.pathname.endsWith('/__data.json') || (event.request.headers.get('accept') ?? '').includes('application/json');
	return api
		? new Response(JSON.stringify({ error: body }), { status: 500, headers: { 'content-type': 'application/json' } })
		: new Response(`Something went wrong on our side. ${body}`, { status: 500, headers: { 'content-type': 'text/plain; charset=utf-8' } });
};
