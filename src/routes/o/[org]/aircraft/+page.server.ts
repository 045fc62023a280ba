import { requireMember } from '$lib/server/access';
import { fleetView } from '$lib/server/aircraft/fleet';
import { listAircraft } from '$lib/server/services/aircraft';
import { fleetQuerySchema } from '$lib/schemas/fleet';
import type { PageServerLoad } from './$types';

// The fleet: one month (UTC) of every aircraft side by side from stored figures, and each aircraft's set-up.
export const load = (async (event) => {
	const { org, role, user } = await requireMember(event, event.params.org, 'viewFleet');
	const query = fleetQuerySchema().parse(Object.fromEntries(event.url.searchParams));
	const showArchived = query.archived === '1';
	const [fleet, aircraft] = await Promise.all([fleetView({ orgId: org.id, userId: user.id, role }, query), listAircraft(org.id, { includeArchived: showArchived })]);
	return { fleet, aircraft, showArchived, prefFuelUnit: user.prefFuelUnit };
}) satisfies PageServerLoad;
