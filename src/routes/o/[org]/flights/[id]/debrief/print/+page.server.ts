import { error } from '@sveltejs/kit';
import { requireFlight } from '$lib/server/access';
import { debriefReport, mayReadDebrief } from '$lib/server/debriefs';
import { can } from '$lib/permissions';
import type { PageServerLoad } from './$types';

// The debrief alone, for printing or saving as PDF; the same visibility as the debrief page.
export const load = (async (event) => {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	const report = await debriefReport(ctx.flight.id);
	if (!report) error(404, 'Flight not found.');
	if (!mayReadDebrief(report.debrief.status, can(ctx.role, 'annotate'))) error(404, 'This debrief is not published yet.');
	return { report };
}) satisfies PageServerLoad;
