import { redirect } from '@sveltejs/kit';
import { startSignUp } from '$lib/server/services/accounts';
import { failForm, parseForm, withoutSecrets } from '$lib/schemas/form';
import { signUpSchema } from '$lib/schemas/account';
import { safeNext } from '$lib/server/redirects';
import { commonPasswordError } from '$lib/server/passwords';
import { mailboxEnabled } from '$lib/server/mail/mailbox';
import type { Actions, PageServerLoad } from './$types';

// Public by design. The answer never says whether the address already has an account.
export const load = (async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return { demo: mailboxEnabled() };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, url, getClientAddress }) => {
		const form = parseForm(signUpSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, withoutSecrets(form.values));
		const { name, email, password } = form.data;
		const weak = commonPasswordError(password);
		if (weak) return failForm(400, { password: weak }, withoutSecrets(form.values));
		const next = safeNext(url.searchParams.get('next'), '/orgs');
		const started = await startSignUp({ name, email, password, next }, getClientAddress(), url.origin);
		if (!started.ok) return failForm(429, { form: 'Too many sign-ups from your network address. Try again in an hour.' }, withoutSecrets(form.values));
		return { sent: true, values: { email } };
	}
} satisfies Actions;
