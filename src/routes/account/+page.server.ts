import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { endAllSessions, endOtherSessions, listSessions } from '$lib/server/auth';
import { createApiToken, listApiTokens, revokeApiToken } from '$lib/server/accounts/api-tokens';
import { setPreferences } from '$lib/server/accounts/preferences';
import { failForm, parseForm } from '$lib/schemas/form';
import { apiTokenSchema, changePasswordSchema, preferencesSchema } from '$lib/schemas/account';
import { commonPasswordError } from '$lib/server/passwords';
import { changePassword } from '$lib/server/services/accounts';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const user = requireUser(event);
	const [tokens, sessions] = await Promise.all([listApiTokens(user.id), listSessions(user.id, event.locals.session?.id ?? null)]);
	// The list comes from the server so that server and browser render the same options.
	return { tokens, sessions, timeZones: Intl.supportedValuesOf('timeZone') };
}) satisfies PageServerLoad;

export const actions = {
	preferences: async (event) => {
		const user = requireUser(event);
		const form = parseForm(preferencesSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'preferences');
		await setPreferences(user.id, form.data);
		return { action: 'preferences', saved: true };
	},
	createToken: async (event) => {
		const user = requireUser(event);
		const form = parseForm(apiTokenSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'createToken');
		// Shown once: only the hash is stored.
		const token = await createApiToken(user.id, form.data);
		return { action: 'createToken', token };
	},
	changePassword: async (event) => {
		const user = requireUser(event);
		const form = parseForm(changePasswordSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, {}, 'changePassword');
		const weak = commonPasswordError(form.data.password);
		if (weak) return failForm(400, { password: weak }, {}, 'changePassword');
		const result = await changePassword(user, form.data.current, form.data.password, event.locals.session?.id ?? null, event.getClientAddress());
		if (typeof result === 'object') return failForm(429, { current: `Too many failed attempts for this account. Wait ${result.throttled} minutes and try again.` }, {}, 'changePassword');
		if (result === 'wrong-current') return failForm(400, { current: 'That is not your current password.' }, {}, 'changePassword');
		return { action: 'changePassword', changed: true };
	},
	signOutOthers: async (event) => {
		const user = requireUser(event);
		// A personal API token has no session of its own to keep: it ends them all.
		if (event.locals.session) await endOtherSessions(user.id, event.locals.session.id);
		else await endAllSessions(user.id, event.cookies);
		return { action: 'signOutOthers', done: true };
	},
	signOutEverywhere: async (event) => {
		const user = requireUser(event);
		await endAllSessions(user.id, event.cookies);
		redirect(303, '/sign-in');
	},
	revokeToken: async (event) => {
		const user = requireUser(event);
		const id = String((await event.request.formData()).get('id') ?? '');
		if (!z.uuid().safeParse(id).success) return failForm(400, { id: 'Unknown token.' }, {}, 'revokeToken');
		await revokeApiToken(user.id, id);
		return { action: 'revokeToken' };
	}
} satisfies Actions;
