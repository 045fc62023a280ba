import { can, mayOnFlight } from '$lib/permissions';
import { requireFlight, requireMember } from '$lib/server/access';
import { emptyTrash, restoreFlight, trashedFlights } from '$lib/server/flights/trash';
import { failForm } from '$lib/schemas/form';
import type { Actions, PageServerLoad } from './$types';

// The flights in the trash that this member may restore (those they could edit), and for an
// admin the means to empty it.
export const load = (async (event) => {
	const ctx = await requireMember(event, event.params.org);
	const rows = await trashedFlights(ctx.org.id);
	const mine = rows.filter((r) => mayOnFlight(ctx, r.flight, 'edit'));
	return {
		flights: mine.map((r) => ({ id: r.flight.id, title: r.flight.title, startedAt: r.flight.startedAt, deletedAt: r.flight.deletedAt, deletedBy: r.deletedByName })),
		total: rows.length,
		mayEmpty: can(ctx.role, 'emptyTrash')
	};
}) satisfies PageServerLoad;

export const actions = {
	restore: async (event) => {
		const id = String((await event.request.formData()).get('id') ?? '');
		const { flight } = await requireFlight(event, event.params.org, id, 'edit', 'trashed');
		const done = await restoreFlight(flight);
		if (!done.ok) return failForm(409, { [done.field]: done.message }, { id }, 'restore');
		return { action: 'restore', restored: flight.id };
	},
	empty: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'emptyTrash');
		return { action: 'empty', deleted: await emptyTrash(org.id) };
	}
} satisfies Actions;
