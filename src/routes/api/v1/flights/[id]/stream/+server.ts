// A live flight's server-sent events for a member who may view it. Each samples event's id is the
// last sequence it holds: a client reconnecting with the standard Last-Event-ID header (or, on a
// first connection, ?after=<last seq held>) resumes exactly after it. GET for EventSource and
// curl; POST answers the same. The viewer's right is asked again while the stream is open
// (lib/server/live/stream.ts).
import { flightGrant, grantHolds, requireFlightById } from '$lib/server/access';
import { apiHandler } from '$lib/server/problem';
import { liveHub, liveStream, resumeAfter } from '$lib/server/live';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const { flight } = await requireFlightById(event, event.params.id, 'view');
	const grant = flightGrant(event, flight.id);
	return liveStream(liveHub(), flight.id, resumeAfter(event.request, event.url), { holds: () => grantHolds(grant), userId: grant.userId });
});

export const POST = GET;
