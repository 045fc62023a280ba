import { error, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { acceptInvitation, findOpenInvitation } from '$lib/server/services/organisations';
import type { Actions, PageServerLoad } from './$types';

// Anyone with the link may see whom it invites; accepting needs an account (sign up or in first).
export const load = (async ({ params, locals }) => {
	const invitation = await findOpenInvitation(params.token);
	if (!invitation) error(404, 'This invitation has expired, was revoked, or was used already.');
	return {
		orgName: invitation.orgName,
		role: invitation.role,
		email: invitation.email,
		signedInAs: locals.user?.email ?? null
	};
}) satisfies PageServerLoad;

export const actions = {
	accept: async (event) => {
		const user = requireUser(event);
		const joined = await acceptInvitation(event.params.token, user.id);
		if (!joined) error(404, 'This invitation has expired, was revoked, or was used already.');
		redirect(303, `/o/${joined.orgSlug}`);
	}
} satisfies Actions;
