import { redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { users } from '$lib/server/db/schema';
import { dummyPasswordHash, startSession, verifyPassword } from '$lib/server/auth';
import { checkSignInThrottle, recordSignInAttempt } from '$lib/server/throttle';
import { failForm, parseForm, withoutSecrets } from '$lib/schemas/form';
import { signInSchema } from '$lib/schemas/account';
import { safeNext } from '$lib/server/redirects';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return { demo: process.env.BURNDOWN_DEMO === '1' };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, cookies, getClientAddress, url }) => {
		const form = parseForm(signInSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, withoutSecrets(form.values));
		const { email, password } = form.data;
		const address = getClientAddress();

		const verdict = await checkSignInThrottle(email, address);
		if (!verdict.allowed) {
			const who = verdict.scope === 'account' ? 'this account' : 'your network address';
			return failForm(429, { form: `Too many failed sign-ins for ${who}. Wait ${verdict.retryAfterMin} minutes and try again, or reset your password.` }, { email });
		}

		const user = await db.query.users.findFirst({ where: eq(users.email, email) });
		const ok = await verifyPassword(user?.passwordHash ?? (await dummyPasswordHash()), password);
		await recordSignInAttempt(email, address, ok && !!user);
		if (!user || !ok) return failForm(400, { form: 'That e-mail address and password do not match an account.' }, { email });

		await startSession(user.id, cookies);
		redirect(303, safeNext(url.searchParams.get('next')));
	}
} satisfies Actions;
