// Personal answers are never kept by the browser or a shared cache: every page a signed-in user
// gets and every API answer carries Cache-Control: no-store (OWASP ASVS 5.0 V14.3, sensitive data
// not cached). Public static files (/_app/immutable, static/) are served before the hooks run and
// keep their long-lived caching.
import type { Handle } from '@sveltejs/kit';

export const NO_STORE = 'no-store';

export const cacheControl: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	if (event.locals.user || event.url.pathname.startsWith('/api/')) {
		try {
			response.headers.set('cache-control', NO_STORE);
		} catch {
			// A response with immutable headers (fetched elsewhere and passed through): copy it.
			const copy = new Response(response.body, response);
			copy.headers.set('cache-control', NO_STORE);
			return copy;
		}
	}
	return response;
};
