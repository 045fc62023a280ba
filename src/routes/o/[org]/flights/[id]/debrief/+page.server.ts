import { error } from '@sveltejs/kit';
import { requireFlight, type OrgContext } from '$lib/server/access';
import { createShare, debriefReport, mayReadDebrief, publishDebrief, revokeShare, saveDebriefText, sharesOf, signOff } from '$lib/server/debriefs';
import { can } from '$lib/permissions';
import { debriefTextFormSchema, shareFormSchema } from '$lib/schemas/debrief';
import { idFormSchema } from '$lib/schemas/flight';
import { failForm, parseForm } from '$lib/schemas/form';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** Writing a debrief is the instructor's (the role's annotate permission), not the flight's pilot's. */
async function requireDebriefWriter(event: RequestEvent) {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	if (!mayWrite(ctx)) error(403, 'Only an instructor writes a debrief.');
	return ctx;
}
const mayWrite = (ctx: OrgContext) => can(ctx.role, 'annotate');

// The debrief report; a draft shows only to instructors, the student sees it once published.
export const load = (async (event) => {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	const report = await debriefReport(ctx.flight.id);
	if (!report) error(404, 'Flight not found.');
	const writer = mayWrite(ctx);
	const visible = mayReadDebrief(report.debrief.status, writer);
	return {
		report: visible ? report : null,
		status: report.debrief.status,
		mayWrite: writer,
		shares: writer ? await sharesOf(ctx.flight.id) : [],
		flightId: ctx.flight.id,
		registration: report.aircraft.registration,
		startedAt: report.flight.startedAt
	};
}) satisfies PageServerLoad;

export const actions = {
	saveText: async (event) => {
		const { flight } = await requireDebriefWriter(event);
		const form = parseForm(debriefTextFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'saveText');
		await saveDebriefText(flight.id, form.data.summary);
		return { action: 'saveText', saved: true };
	},
	signOff: async (event) => {
		const { flight, user } = await requireDebriefWriter(event);
		await signOff(flight.id, user.id);
		return { action: 'signOff', saved: true };
	},
	publish: async (event) => {
		const { flight } = await requireDebriefWriter(event);
		const done = await publishDebrief(flight.id, event.url.origin);
		if (!done.ok) return failForm(400, { [done.field]: done.message }, {}, 'publish');
		return { action: 'publish', mailedTo: done.mailedTo };
	},
	share: async (event) => {
		const { flight, user } = await requireDebriefWriter(event);
		const form = parseForm(shareFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'share');
		const { token, expiresAt } = await createShare(flight.id, user.id, form.data.days);
		// Shown once: only the hash is stored.
		return { action: 'share', url: new URL(`/share/${token}`, event.url.origin).toString(), expiresAt };
	},
	revokeShare: async (event) => {
		const { flight } = await requireDebriefWriter(event);
		const form = parseForm(idFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'revokeShare');
		if (!(await revokeShare(flight.id, form.data.id))) return failForm(404, { id: 'That link is not on this debrief, or it is revoked already.' }, form.values, 'revokeShare');
		return { action: 'revokeShare', saved: true };
	}
} satisfies Actions;
