// A flight's samples in columns, with the aircraft's fuel setup, the declaration and the fuel
// events, so the browser runs the same engine as the server. ?format=json (default): arrays,
// times as integer ms after t0Ms; ?format=binary: the Float64 layout of $lib/wire/replay.ts.
import { error } from '@sveltejs/kit';
import { apiHandler } from '$lib/server/problem';
import { BINARY_CONTENT_TYPE, encodeBinary, encodeJson } from '$lib/wire/replay';
import { samplesQuerySchema } from '$lib/schemas/flight';
import { requireFlightById } from '$lib/server/access';
import { maybeGzip, parseQuery } from '$lib/server/flights/http';
import { loadFlight, replayDataOf } from '$lib/server/flights/load';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const { flight } = await requireFlightById(event, event.params.id, 'view');
	const query = parseQuery(samplesQuerySchema, event.url);
	if (!query.ok) return query.response;
	const loaded = await loadFlight(flight.id);
	if (!loaded) error(404, 'Flight not found.');
	const data = replayDataOf(loaded);
	// Samples of an open (live) flight grow; a correction changes the inputs: never cache.
	const headers = { 'cache-control': 'private, no-store', 'x-sample-count': String(data.count) };
	if (query.data.format === 'binary') {
		return maybeGzip(event.request, encodeBinary(data), { ...headers, 'content-type': BINARY_CONTENT_TYPE });
	}
	return maybeGzip(event.request, JSON.stringify(encodeJson(data)), { ...headers, 'content-type': 'application/json' });
});
