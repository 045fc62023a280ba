import { error, redirect } from '@sveltejs/kit';
import { startSession } from '$lib/server/auth';
import { completeSignUp, findPendingSignUp } from '$lib/server/services/accounts';
import { failForm } from '$lib/schemas/form';
import type { Actions, PageServerLoad } from './$types';

// Public by design: the e-mailed link is the credential. Opening it shows a button; only the POST
// creates the account, so a mail scanner that follows links uses nothing up.
export const load = (async ({ params }) => {
	const pending = await findPendingSignUp(params.token);
	if (!pending) error(404, 'This link has expired or was used already. Sign up again, or sign in.');
	return { email: pending.email, name: pending.name };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ params, cookies, request }) => {
		const done = await completeSignUp(params.token);
		if (!done) return failForm(400, { form: 'This link has expired or was used already. Sign up again, or sign in.' }, {});
		await startSession(done.userId, cookies, request.headers.get('user-agent'));
		redirect(303, done.next);
	}
} satisfies Actions;
