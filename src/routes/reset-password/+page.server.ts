import { failForm, parseForm } from '$lib/schemas/form';
import { resetRequestSchema } from '$lib/schemas/account';
import { requestPasswordReset } from '$lib/server/services/password-reset';
import type { Actions } from './$types';

export const actions = {
	default: async ({ request, url }) => {
		const form = parseForm(resetRequestSchema, await request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values);
		await requestPasswordReset(form.data.email, url.origin);
		return { sent: true, values: { email: form.data.email } };
	}
} satisfies Actions;
