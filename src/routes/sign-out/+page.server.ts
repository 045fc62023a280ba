import { redirect } from '@sveltejs/kit';
import { endSession } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

// Signing out changes state, so it is a POST only; a GET just goes home.
export const load = (async () => redirect(303, '/')) satisfies PageServerLoad;

export const actions = {
	default: async ({ locals, cookies }) => {
		if (locals.session) await endSession(locals.session.id, cookies);
		redirect(303, '/sign-in');
	}
} satisfies Actions;
