// GET /api/v1/aircraft: the aircraft of the caller's organisations (or of ?org=), by registration,
// a page at a time (?limit, ?cursor from the previous page's `next`). Shapes: $lib/schemas/api.ts.
import { aircraftListQuerySchema } from '$lib/schemas/api';
import { requireMember, requireUser } from '$lib/server/access';
import { listAircraftPage } from '$lib/server/aircraft/list';
import { cursorProblem, decodeCursor, encodeCursor, pageResponse } from '$lib/server/cursor';
import { parseQuery } from '$lib/server/flights/http';
import { apiHandler } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiHandler('read', async (event) => {
	const user = requireUser(event);
	const query = parseQuery(aircraftListQuerySchema, event.url);
	if (!query.ok) return query.response;
	const q = query.data;
	const org = q.org ? (await requireMember(event, q.org, 'viewFleet')).org : null;
	const after = q.cursor ? decodeCursor('aircraft', q.cursor) : null;
	if (q.cursor && !after) return cursorProblem(event.url);
	const { rows, more } = await listAircraftPage(user.id, q, after, org?.id);
	const items = rows.map((a) => ({
		id: a.id,
		org: a.org,
		registration: a.registration,
		type: a.type,
		fuelType: a.fuelType,
		displayUnit: a.displayUnit,
		usableCapacityL: a.capacityL,
		archived: a.archivedAt !== null,
		url: `/o/${a.org}/aircraft/${a.id}`
	}));
	const last = rows.at(-1);
	return pageResponse(event.url, items, more && last ? encodeCursor('aircraft', last.registration, last.id) : null);
});
