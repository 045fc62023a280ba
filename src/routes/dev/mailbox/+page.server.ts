import { error } from '@sveltejs/kit';
import { listMailbox, mailboxEnabled } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

// Development and demo mode only: the messages the local SMTP sink received.
export const load = (async () => {
	if (!mailboxEnabled()) error(404, 'Not found.');
	return { messages: await listMailbox() };
}) satisfies PageServerLoad;
