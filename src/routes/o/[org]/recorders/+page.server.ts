import { z } from 'zod';
import { requireMember } from '$lib/server/access';
import { listAircraft } from '$lib/server/services/aircraft';
import { listRecorders, registerRecorder, revokeRecorder, rotateRecorder, setFlyingToday } from '$lib/server/live/recorders';
import { utcDay } from '$lib/server/live/flights';
import { peopleChoices } from '$lib/server/flights/details';
import { flyingTodayFormSchema } from '$lib/schemas/flight';
import { idleCloseMinutes } from '$lib/server/live/config';
import { stopOpenHours } from '$lib/server/live/sweeper';
import { failForm, parseForm } from '$lib/schemas/form';
import { plainText } from '$lib/schemas/text';
import type { Actions, PageServerLoad } from './$types';

const registerSchema = z.object({
	aircraftId: z.uuid('Choose the aircraft the recorder is fitted to.'),
	name: plainText(80, { required: 'Give the recorder a name, e.g. "Panel recorder".' })
});
const idSchema = z.object({ id: z.uuid('That recorder is not in this organisation.') });

// The organisation's recorders with their last contact, and the aircraft a new one can go to.
export const load = (async (event) => {
	const { org } = await requireMember(event, event.params.org, 'manageRecorders');
	const [list, people, fleet] = await Promise.all([
		listRecorders(org.id),
		peopleChoices(org.id),
		listAircraft(org.id)
	]);
	return { recorders: list, pilots: people.pilots, today: utcDay(new Date()), fleet: fleet.map((a) => ({ id: a.id, registration: a.registration })), idleCloseMinutes: idleCloseMinutes(), stopOpenHours: stopOpenHours() };
}) satisfies PageServerLoad;

// The new token is in the action's answer only: it is never stored and never shown again.
export const actions = {
	register: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageRecorders');
		const form = parseForm(registerSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'register');
		const made = await registerRecorder(org.id, form.data.aircraftId, form.data.name);
		if ('error' in made) return failForm(400, { [made.field]: made.error }, form.values, 'register');
		return { action: 'register', recorderId: made.id, token: made.token, name: form.data.name };
	},
	rotate: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageRecorders');
		const form = parseForm(idSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'rotate');
		const token = await rotateRecorder(org.id, form.data.id);
		if (!token) return failForm(400, { id: 'That recorder is revoked or not in this organisation.' }, form.values, 'rotate');
		return { action: 'rotate', recorderId: form.data.id, token };
	},
	flyingToday: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageRecorders');
		const form = parseForm(flyingTodayFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'flyingToday');
		const done = await setFlyingToday(org.id, form.data.id, form.data.pilotId ?? null);
		if (!done.ok) return failForm(400, { [done.field]: done.error }, form.values, 'flyingToday');
		return { action: 'flyingToday', recorderId: form.data.id };
	},
	revoke: async (event) => {
		const { org } = await requireMember(event, event.params.org, 'manageRecorders');
		const form = parseForm(idSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'revoke');
		if (!(await revokeRecorder(org.id, form.data.id))) return failForm(400, { id: 'That recorder is already revoked or not in this organisation.' }, form.values, 'revoke');
		return { action: 'revoke', recorderId: form.data.id };
	}
} satisfies Actions;
