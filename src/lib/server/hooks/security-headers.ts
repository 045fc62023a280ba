// Headers every response carries. The content security policy itself is SvelteKit's (kit.csp in
// svelte.config.js), which hashes or nonces its own inline scripts; with map tiles configured, their
// origin is added to its img-src here.
import type { Handle } from '@sveltejs/kit';
import { allowImageSource, mapTiles, tileImageSource } from '../map-tiles';

export const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const h = response.headers;
	h.set('referrer-policy', 'strict-origin-when-cross-origin');
	h.set('x-content-type-options', 'nosniff');
	h.set('x-frame-options', 'DENY');
	h.set('permissions-policy', 'camera=(), microphone=(), geolocation=(), payment=()');
	h.set('cross-origin-opener-policy', 'same-origin');
	const csp = h.get('content-security-policy');
	const tiles = csp ? mapTiles() : null;
	if (csp && tiles) h.set('content-security-policy', allowImageSource(csp, tileImageSource(tiles.url)));
	if (event.url.protocol === 'https:') h.set('strict-transport-security', 'max-age=31536000; includeSubDomains');
	return response;
};
