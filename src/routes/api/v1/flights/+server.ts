// GET /api/v1/flights: the flights the caller may view in their organisations (or in ?org=),
// newest engine start first, filtered by ?aircraft, ?pilot, ?from, ?to (UTC days), a page at a
// time (?limit, ?cursor). Trashed flights are never listed. Shapes: $lib/schemas/api.ts.
//
// POST /api/v1/flights: upload a recorder file for an aircraft given by id (multipart/form-data
// with the fields before the file, or text/csv with the fields in the query string). The same
// checks and answers as the upload page: handleUpload reads the fields, then checks membership
// and the upload permission with requireAircraft before reading the file. Answer shapes are in
// $lib/wire/upload.ts; the API page (/api-docs) and the README show examples.
import { flightListApiQuerySchema } from '$lib/schemas/api';
import { requireMember, requireUser } from '$lib/server/access';
import { cursorProblem, decodeCursor, encodeCursor, pageResponse } from '$lib/server/cursor';
import { listFlightsPage, membershipsOf } from '$lib/server/flights/api-list';
import { parseQuery } from '$lib/server/flights/http';
import { handleUpload } from '$lib/server/ingest/respond';
import { apiHandler } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const user = requireUser(event);
	const query = parseQuery(flightListApiQuerySchema, event.url);
	if (!query.ok) return query.response;
	const q = query.data;
	const memberOf = q.org ? [await requireMember(event, q.org)].map((m) => ({ orgId: m.org.id, role: m.role })) : await membershipsOf(user.id);
	const after = q.cursor ? decodeCursor('flights', q.cursor) : null;
	if (q.cursor && (!after || Number.isNaN(Date.parse(after.key)))) return cursorProblem(event.url);
	const { rows, more } = await listFlightsPage(user.id, memberOf, q, after);
	const items = rows.map((f) => {
		const api = `/api/v1/flights/${f.id}`;
		return { ...f, startedAt: f.startedAt.toISOString(), endedAt: f.endedAt?.toISOString() ?? null, url: `/o/${f.org}/flights/${f.id}`, samples: `${api}/samples`, export: `${api}/export` };
	});
	const last = rows.at(-1);
	return pageResponse(event.url, items, more && last ? encodeCursor('flights', last.startedAt.toISOString(), last.id) : null);
});

export const POST: RequestHandler = apiHandler('upload', (event) => handleUpload(event));
