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
	const t0 = performance.now();
	const { flight } = await requireFlightById(event, event.params.id, 'view');
	const query = parseQuery(samplesQuerySchema, event.url);
	if (!query.ok) return query.response;
	const loaded = await loadFlight(flight.id);
	if (!loaded) error(404, 'Flight not found.');
	const data = replayDataOf(loaded);
	const t1 = performance.now();
	// Samples of an open (live) flight grow; a correction changes the inputs: never cache.
	const headers = { 'cache-control': 'private, no-store', 'x-sample-count': String(data.count) };
	const res =
		query.data.format === 'binary'
			? // The fastest gzip level: the columns shrink about as well, in a fraction of the time.
				await maybeGzip(event.request, encodeBinary(data), { ...headers, 'content-type': BINARY_CONTENT_TYPE }, 1)
			: await maybeGzip(event.request, JSON.stringify(encodeJson(data)), { ...headers, 'content-type': 'application/json' });
	// The server's own time (W3C Server Timing): reading the flight, then encoding (and gzip).
	const t2 = performance.now();
	res.headers.set('server-timing', `load;dur=${(t1 - t0).toFixed(1)}, encode;dur=${(t2 - t1).toFixed(1)}, total;dur=${(t2 - t0).toFixed(1)}`);
	return res;
});
