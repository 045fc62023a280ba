import { redirect } from '@sveltejs/kit';
import { requireMember } from '$lib/server/access';
import { createAircraft } from '$lib/server/services/aircraft';
import { failForm, parseForm } from '$lib/schemas/form';
import { aircraftFormSchema } from '$lib/schemas/aircraft';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	await requireMember(event, event.params.org, 'manageAircraft');
	return {};
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageAircraft');
		const form = parseForm(aircraftFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values);
		const saved = await createAircraft(org.id, form.data);
		if (!saved.ok) return failForm(400, { [saved.field]: saved.message }, form.values);
		redirect(303, `/o/${org.slug}/aircraft/${saved.aircraft.id}`);
	}
} satisfies Actions;
