import { listMemberships } from '$lib/server/services/organisations';
import { mailboxEnabled } from '$lib/server/mail/mailbox';
import type { LayoutServerLoad } from './$types';

// The shell's data: who is signed in and the organisations for the switcher. Pages check their
// own access again; this layout grants nothing.
export const load = (async ({ locals }) => ({
	user: locals.user ? { id: locals.user.id, name: locals.user.name, email: locals.user.email, prefFuelUnit: locals.user.prefFuelUnit, timeZone: locals.user.timeZone } : null,
	orgs: locals.user ? await listMemberships(locals.user.id) : [],
	mailbox: mailboxEnabled()
})) satisfies LayoutServerLoad;
