// What every answer under /api/ keeps to, whichever route gave it: a 401 names the scheme it
// wants in WWW-Authenticate (RFC 9110 §11.6.1; bearer tokens, RFC 6750 §3), so a script knows to
// send its API token. The recorder API sets its own realm; others get Burndown's.
import type { Handle } from '@sveltejs/kit';

export const API_REALM = 'Bearer realm="burndown"';

export const apiConventions: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	if (!event.url.pathname.startsWith('/api/') || response.status !== 401 || response.headers.has('www-authenticate')) return response;
	try {
		response.headers.set('www-authenticate', API_REALM);
		return response;
	} catch {
		const copy = new Response(response.body, response);
		copy.headers.set('www-authenticate', API_REALM);
		return copy;
	}
};
