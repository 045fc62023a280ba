import { requireAircraft } from '$lib/server/access';
import { aircraftFormValues, setArchived, updateAircraft } from '$lib/server/services/aircraft';
import { isWatching, setWatching } from '$lib/server/live/watches';
import { failForm, parseForm } from '$lib/schemas/form';
import { aircraftFormSchema } from '$lib/schemas/aircraft';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'viewFleet');
	const watching = await isWatching(user.id, { aircraftId: aircraft.id });
	return { aircraft, values: aircraftFormValues(aircraft), watching };
}) satisfies PageServerLoad;

export const actions = {
	// Alarm e-mails for every live flight of this aircraft (src/lib/server/live).
	watch: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'viewFleet');
		const on = (await event.request.formData()).get('on') === '1';
		await setWatching(user.id, { aircraftId: aircraft.id }, on);
		return { action: 'watch', watching: on };
	},
	save: async (event) => {
		const { org, aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'manageAircraft');
		const form = parseForm(aircraftFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'save');
		const saved = await updateAircraft(org.id, aircraft.id, form.data, user.id);
		if (!saved.ok) return failForm(400, { [saved.field]: saved.message }, form.values, 'save');
		return { action: 'save', saved: true };
	},
	archive: async (event) => {
		const { org, aircraft } = await requireAircraft(event, event.params.org, event.params.id, 'manageAircraft');
		await setArchived(org.id, aircraft.id, aircraft.archivedAt === null);
		return { action: 'archive' };
	},
} satisfies Actions;
