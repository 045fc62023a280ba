import { redirect } from '@sveltejs/kit';
import { startSession } from '$lib/server/auth';
import { demoMode } from '$lib/server/config';
import { signInWithPassword } from '$lib/server/services/accounts';
import { failForm, parseForm, withoutSecrets } from '$lib/schemas/form';
import { signInSchema } from '$lib/schemas/account';
import { safeNext } from '$lib/server/redirects';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return { demo: demoMode() };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, cookies, getClientAddress, url }) => {
		const form = parseForm(signInSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, withoutSecrets(form.values));
		const { email, password } = form.data;
		const result = await signInWithPassword(email, password, getClientAddress());
		if (!result.ok && result.reason === 'throttled') {
			const who = result.scope === 'account' ? 'this account' : 'your network address';
			return failForm(429, { form: `Too many failed sign-ins for ${who}. Wait ${result.retryAfterMin} minutes and try again, or reset your password.` }, { email });
		}
		if (!result.ok) return failForm(400, { form: 'That e-mail address and password do not match an account.' }, { email });
		await startSession(result.userId, cookies, request.headers.get('user-agent'));
		redirect(303, safeNext(url.searchParams.get('next')));
	}
} satisfies Actions;
