import { failForm, parseForm } from '$lib/schemas/form';
import { resetRequestSchema } from '$lib/schemas/account';
import { requestPasswordReset } from '$lib/server/services/password-reset';
import type { Actions } from './$types';

// Public by design: anyone may ask; the answer is the same whether or not the account exists.
export const actions = {
	default: async ({ request, url, getClientAddress }) => {
		const form = parseForm(resetRequestSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values);
		await requestPasswordReset(form.data.email, getClientAddress(), url.origin);
		return { sent: true, values: { email: form.data.email } };
	}
} satisfies Actions;
