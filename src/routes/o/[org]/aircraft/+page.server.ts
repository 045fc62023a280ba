import { requireMember } from '$lib/server/access';
import { listAircraft } from '$lib/server/services/aircraft';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { org } = await requireMember(event, event.params.org, 'viewFleet');
	const showArchived = event.url.searchParams.get('archived') === '1';
	return { aircraft: await listAircraft(org.id, { includeArchived: showArchived }), showArchived };
}) satisfies PageServerLoad;
