import { error, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { acceptInvitation, findOpenInvitation, invitationIsFor } from '$lib/server/services/organisations';
import type { Actions, PageServerLoad } from './$types';

// Anyone with the link may see whom it invites; accepting needs the account of the invited
// address (sign up or in first): holding the link is not enough.
export const load = (async ({ params, locals }) => {
	const invitation = await findOpenInvitation(params.token);
	if (!invitation) error(404, 'This invitation has expired, was revoked, or was used already.');
	return {
		orgName: invitation.orgName,
		role: invitation.role,
		email: invitation.email,
		signedInAs: locals.user?.email ?? null,
		mayAccept: locals.user ? invitationIsFor(invitation, locals.user) : false
	};
}) satisfies PageServerLoad;

export const actions = {
	accept: async (event) => {
		const user = requireUser(event);
		const joined = await acceptInvitation(event.params.token, user);
		if (joined === 'wrong-address') error(403, 'This invitation is for another e-mail address. Sign in with the invited address to accept it.');
		if (!joined) error(404, 'This invitation has expired, was revoked, or was used already.');
		redirect(303, `/o/${joined.orgSlug}`);
	}
} satisfies Actions;
