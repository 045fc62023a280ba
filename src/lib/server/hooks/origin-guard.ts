// SvelteKit's CSRF check covers form posts only; a JSON POST carrying the session cookie from
// another site would pass. Cookie-authenticated API writes must come from our own origin.
import type { Handle } from '@sveltejs/kit';
import { problem } from '../problem';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export const originGuard: Handle = async ({ event, resolve }) => {
	if (event.locals.authVia === 'session' && !SAFE.has(event.request.method) && event.url.pathname.startsWith('/api/')) {
		const origin = event.request.headers.get('origin');
		if (origin !== event.url.origin) {
			return problem(403, 'Cross-site request refused: a write with the session cookie must come from this site (or send an API token).', { instance: event.url.pathname, errors: [{ field: 'origin', detail: 'not this site' }] });
		}
	}
	return resolve(event);
};
