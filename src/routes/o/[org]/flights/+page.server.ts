import { requireMember } from '$lib/server/access';
import { flightListQuerySchema } from '$lib/schemas/flight';
import { listFilterOptions, listFlights } from '$lib/server/flights/list';
import type { PageServerLoad } from './$types';

// The flights the member may see, one page of them, with the filter choices and the query echoed.
export const load = (async (event) => {
	const { org, role, user } = await requireMember(event, event.params.org);
	const query = flightListQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	const viewer = { orgId: org.id, userId: user.id, role };
	const [list, options] = await Promise.all([listFlights(viewer, query), listFilterOptions(viewer)]);
	return { list, options, query, prefFuelUnit: user.prefFuelUnit };
}) satisfies PageServerLoad;
