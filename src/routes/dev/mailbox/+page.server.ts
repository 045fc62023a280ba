import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { listMailboxFor, mailboxEnabled } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

// Demo mode only: the messages the local SMTP sink received for the signed-in user. Outside demo
// mode the page does not exist, not even as a sign-in redirect.
export const load = (async (event) => {
	if (!mailboxEnabled()) error(404, 'Not found.');
	const user = requireUser(event);
	return { messages: await listMailboxFor(user.email) };
}) satisfies PageServerLoad;
