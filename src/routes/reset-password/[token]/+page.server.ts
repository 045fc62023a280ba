import { redirect } from '@sveltejs/kit';
import { startSession } from '$lib/server/auth';
import { failForm, parseForm } from '$lib/schemas/form';
import { resetPasswordSchema } from '$lib/schemas/account';
import { completePasswordReset, findResetUser } from '$lib/server/services/password-reset';
import { commonPasswordError } from '$lib/server/passwords';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ params }) => ({ valid: (await findResetUser(params.token)) !== null })) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, params, cookies }) => {
		const form = parseForm(resetPasswordSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, {});
		const weak = commonPasswordError(form.data.password);
		if (weak) return failForm(400, { password: weak }, {});
		const userId = await completePasswordReset(params.token, form.data.password);
		if (!userId) return failForm(400, { form: 'This link has expired or was used already. Ask for a new one.' }, {});
		await startSession(userId, cookies, request.headers.get('user-agent'));
		redirect(303, '/');
	}
} satisfies Actions;
