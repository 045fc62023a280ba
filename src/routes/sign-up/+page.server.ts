import { redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { generateIdFromEntropySize } from 'lucia';
import { db } from '$lib/server/db';
import { users } from '$lib/server/db/schema';
import { hashPassword, startSession } from '$lib/server/auth';
import { failForm, parseForm, withoutSecrets } from '$lib/schemas/form';
import { signUpSchema } from '$lib/schemas/account';
import { safeNext } from '$lib/server/redirects';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return {};
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, cookies, url }) => {
		const form = parseForm(signUpSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, withoutSecrets(form.values));
		const { name, email, password } = form.data;
		const existing = await db.query.users.findFirst({ where: eq(users.email, email), columns: { id: true } });
		if (existing) {
			return failForm(400, { email: 'An account with this e-mail address exists. Sign in instead.' }, withoutSecrets(form.values));
		}
		const id = generateIdFromEntropySize(10);
		const inserted = await db.insert(users).values({ id, name, email, passwordHash: await hashPassword(password) }).onConflictDoNothing().returning({ id: users.id });
		if (inserted.length === 0) {
			return failForm(400, { email: 'An account with this e-mail address exists. Sign in instead.' }, withoutSecrets(form.values));
		}
		await startSession(id, cookies);
		redirect(303, safeNext(url.searchParams.get('next'), '/orgs'));
	}
} satisfies Actions;
