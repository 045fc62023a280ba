import { redirect } from '@sveltejs/kit';
import { listMemberships } from '$lib/server/services/organisations';
import type { PageServerLoad } from './$types';

// Home: signed-out visitors see the product; members go straight to their organisation.
export const load = (async ({ locals }) => {
	if (!locals.user) return {};
	const orgs = await listMemberships(locals.user.id);
	redirect(303, orgs.length === 1 ? `/o/${orgs[0].slug}` : '/orgs');
}) satisfies PageServerLoad;
