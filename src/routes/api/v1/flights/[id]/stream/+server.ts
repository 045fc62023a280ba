// A live flight's server-sent events for a member who may view it: ?after=<last seq held> resumes
// exactly after the client's cursor. GET for EventSource and curl, POST for sveltekit-sse's client.
// The viewer's right is asked again while the stream is open (lib/server/live/stream.ts).
import { flightGrant, grantHolds, requireFlightById } from '$lib/server/access';
import { apiHandler } from '$lib/server/problem';
import { liveHub, liveStream, parseAfter } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const { flight } = await requireFlightById(event, event.params.id, 'view');
	const grant = flightGrant(event, flight.id);
	return liveStream(liveHub(), flight.id, parseAfter(event.url.searchParams.get('after')), { holds: () => grantHolds(grant), userId: grant.userId });
});

export const POST = GET;
