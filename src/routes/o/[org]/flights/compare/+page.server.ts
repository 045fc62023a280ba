import { error } from '@sveltejs/kit';
import { requireFlight, requireMember } from '$lib/server/access';
import { compareFlights } from '$lib/server/flights/compare';
import { compareQuerySchema } from '$lib/schemas/history';
import type { PageServerLoad } from './$types';

// Two or more flights the member may view, overlaid on a clock since engine start.
export const load = (async (event) => {
	const { user } = await requireMember(event, event.params.org);
	const ids = compareQuerySchema.safeParse(event.url.searchParams.getAll('id'));
	if (!ids.success) error(400, `id: ${ids.error.issues[0].message}`);
	const flights = [];
	for (const id of ids.data) flights.push((await requireFlight(event, event.params.org, id, 'view')).flight);
	return { compare: await compareFlights(flights), prefFuelUnit: user.prefFuelUnit };
}) satisfies PageServerLoad;
