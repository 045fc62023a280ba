// Headers every response carries. The content security policy itself is SvelteKit's (kit.csp in
// svelte.config.js), which hashes or nonces its own inline scripts.
import type { Handle } from '@sveltejs/kit';

export const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const h = response.headers;
	h.set('referrer-policy', 'strict-origin-when-cross-origin');
	h.set('x-content-type-options', 'nosniff');
	h.set('x-frame-options', 'DENY');
	h.set('permissions-policy', 'camera=(), microphone=(), geolocation=(), payment=()');
	h.set('cross-origin-opener-policy', 'same-origin');
	if (event.url.protocol === 'https:') h.set('strict-transport-security', 'max-age=31536000; includeSubDomains');
	return response;
};
