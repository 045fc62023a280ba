import { requireMember } from '$lib/server/access';
import { overviewFlights } from '$lib/server/flights/overview';
import { listAircraft } from '$lib/server/services/aircraft';
import type { PageServerLoad } from './$types';

// Overview: flights in the air now, the latest flights the member may see, and the fleet.
export const load = (async (event) => {
	const { org, role, user } = await requireMember(event, event.params.org);
	const [{ live, recent }, fleet] = await Promise.all([overviewFlights({ orgId: org.id, userId: user.id, role }), listAircraft(org.id)]);
	return { live, recent, fleet };
}) satisfies PageServerLoad;
