import { error } from '@sveltejs/kit';
import { debriefReport, flightOfShare } from '$lib/server/debriefs';
import type { PageServerLoad } from './$types';

// A shared debrief: read-only, no account. The token is the authorization (checked against its
// hash, expiry and revocation); an unknown, expired or revoked link is one and the same 404.
export const load = (async (event) => {
	const flightId = await flightOfShare(event.params.token);
	const report = flightId ? await debriefReport(flightId) : null;
	if (!report) error(404, 'This link is not valid: it may have expired or been revoked.');
	event.setHeaders({ 'cache-control': 'private, no-store', 'referrer-policy': 'no-referrer' });
	return { report };
}) satisfies PageServerLoad;
