import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { createOrganisation, listMemberships } from '$lib/server/services/organisations';
import { failForm, parseForm } from '$lib/schemas/form';
import { organisationSchema } from '$lib/schemas/organisation';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const user = requireUser(event);
	return { memberships: await listMemberships(user.id) };
}) satisfies PageServerLoad;

export const actions = {
	create: async (event) => {
		const user = requireUser(event);
		const form = parseForm(organisationSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values);
		const org = await createOrganisation(form.data.name, user.id);
		redirect(303, `/o/${org.slug}/aircraft/new`);
	}
} satisfies Actions;
