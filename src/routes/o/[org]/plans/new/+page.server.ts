import { redirect } from '@sveltejs/kit';
import { DEFAULT_TOLERANCE_PERCENT } from '$lib/fuel';
import { requireMember } from '$lib/server/access';
import { createWaitingPlan, fleetOf, membersOf, WaitingPlanRefusal } from '$lib/server/plans';
import { importPlanFile } from '$lib/server/plans/import-form';
import { failForm, parseForm } from '$lib/schemas/form';
import { parsePlanForm, waitingPlanFormSchema } from '$lib/schemas/plan';
import { fromLitres } from '$lib/units';
import type { Actions, PageServerLoad } from './$types';

// A plan made before the flight: the aircraft, when it is expected to start, who flies, the plan.
export const load = (async (event) => {
	const { org, user } = await requireMember(event, event.params.org, 'annotate');
	const fleet = await fleetOf(org.id);
	const pilots = await membersOf(org.id);
	const chosen = fleet.find((a) => a.id === event.url.searchParams.get('aircraft')) ?? fleet[0] ?? null;
	const unit = user.prefFuelUnit ?? chosen?.displayUnit ?? 'usgal';
	const show = (l: number | null) => (l === null || !chosen ? '' : String(Math.round(fromLitres(l, unit, chosen.densityKgPerL) * 100) / 100));
	return {
		aircraft: fleet.map((a) => ({ id: a.id, registration: a.registration, type: a.type })),
		pilots,
		unit,
		values: {
			aircraft: chosen?.id ?? '',
			departure: '',
			pilot: '',
			unit,
			start: '',
			taxi: '',
			climb: '',
			reserveRule: chosen?.reserveRule ?? 'faa-91.151-vfr-day',
			reserveMin: chosen?.reserveCustomMin == null ? '' : String(chosen.reserveCustomMin),
			reserveFlow: show(chosen?.baselineCruiseLph ?? null),
			tolerance: String(DEFAULT_TOLERANCE_PERCENT)
		} as Record<string, string>
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { org, user } = await requireMember(event, event.params.org, 'annotate');
		const body = await event.request.formData();
		const head = parseForm(waitingPlanFormSchema, body);
		// The plan's amounts are typed in a unit of the chosen aircraft's fuel: its density converts
		// them. Without an aircraft the plan is parsed only for its errors (any density will do).
		const a = head.ok ? (await fleetOf(org.id)).find((x) => x.id === head.data.aircraft) : undefined;
		const plan = parsePlanForm(head.values, a?.densityKgPerL ?? 1);
		const errors = { ...(head.ok ? {} : head.errors), ...(plan.ok ? {} : plan.errors) };
		if (head.ok && !a) errors.aircraft = 'Choose an active aircraft of this organisation.';
		if (!head.ok || !plan.ok || !a) return failForm(400, errors, { ...head.values, ...plan.values }, 'save');
		try {
			await createWaitingPlan(org.id, head.data, plan.data, user.id);
		} catch (e) {
			if (e instanceof WaitingPlanRefusal) return failForm(400, { [e.field]: e.message }, plan.values, 'save');
			throw e;
		}
		redirect(303, `/o/${org.slug}/students?waiting=saved#waiting`);
	},
	// Fills the legs table from a file; nothing is stored until the form is saved.
	import: async (event) => {
		await requireMember(event, event.params.org, 'annotate');
		return importPlanFile(await event.request.formData());
	}
} satisfies Actions;
