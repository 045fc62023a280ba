import { sequence } from '@sveltejs/kit/hooks';
import type { HandleServerError } from '@sveltejs/kit';
import { apiConventions } from '$lib/server/hooks/api-conventions';
import { authenticate } from '$lib/server/hooks/authenticate';
import { authorizedGuard } from '$lib/server/hooks/authorized-guard';
import { cacheControl } from '$lib/server/hooks/cache-control';
import { originGuard } from '$lib/server/hooks/origin-guard';
import { securityHeaders } from '$lib/server/hooks/security-headers';
import { closeDb } from '$lib/server/db';

// authorizedGuard innermost: it judges what the route itself answered, not originGuard's refusals.
export const handle = sequence(securityHeaders, apiConventions, authenticate, cacheControl, originGuard, authorizedGuard);
// Live flights: starts the idle sweeper; the live module closes its LISTEN connection on shutdown.
export { init } from '$lib/server/live';

export const handleError: HandleServerError = ({ error, status, message }) => {
	if (status >= 500) console.error('[server]', error);
	return { message: status >= 500 ? 'Something went wrong on our side. Nothing was changed.' : message };
};

process.once('sveltekit:shutdown', () => {
	void closeDb();
});
