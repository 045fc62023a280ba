import { requireAircraft } from '$lib/server/access';
import { aircraftHistory, saveBurnSettings, setUnusual } from '$lib/server/aircraft/history';
import { failForm, parseForm } from '$lib/schemas/form';
import { burnSettingsFormSchema, historyQuerySchema, unusualFormSchema } from '$lib/schemas/history';
import type { FlowUnit } from '$lib/units';
import type { Actions, PageServerLoad } from './$types';

const flowUnitOf = (unit: string) => `${unit}/h` as FlowUnit;

// The aircraft's fuel history: stored figures per flight and phase, the baseline, the marks.
export const load = (async (event) => {
	const { org, aircraft, role, user } = await requireAircraft(event, event.params.org, event.params.id, 'viewFleet');
	const query = historyQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	const history = await aircraftHistory({ orgId: org.id, userId: user.id, role }, aircraft.id, query);
	return { aircraft, history, query, prefFuelUnit: user.prefFuelUnit };
}) satisfies PageServerLoad;

export const actions = {
	settings: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'manageAircraft');
		const form = parseForm(burnSettingsFormSchema(flowUnitOf(aircraft.displayUnit), aircraft.densityKgPerL), await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'settings');
		await saveBurnSettings(aircraft.id, user.id, form.data);
		return { action: 'settings', saved: true };
	},
	unusual: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'manageAircraft');
		const form = parseForm(unusualFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'unusual');
		if (!(await setUnusual(aircraft.id, user.id, form.data))) return failForm(400, { flightId: 'That flight is not one of this aircraft’s.' }, form.values, 'unusual');
		return { action: 'unusual', saved: true };
	}
} satisfies Actions;
