// SvelteKit's CSRF check covers form posts only; a JSON POST carrying the session cookie from
// another site would pass. Cookie-authenticated API writes must come from our own origin.
import { json, type Handle } from '@sveltejs/kit';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export const originGuard: Handle = async ({ event, resolve }) => {
	if (event.locals.authVia === 'session' && !SAFE.has(event.request.method) && event.url.pathname.startsWith('/api/')) {
		const origin = event.request.headers.get('origin');
		if (origin !== event.url.origin) {
			return json({ error: 'Cross-site request refused.', field: 'origin' }, { status: 403 });
		}
	}
	return resolve(event);
};
