import { mayOnFlight, requireFlight } from '$lib/server/access';
import { planContext, removePlan, savePlan } from '$lib/server/plans';
import { workedPlanOf } from '$lib/plan-report';
import { importPlanFile } from '$lib/server/plans/import-form';
import { failForm, formValues } from '$lib/schemas/form';
import { parsePlanForm, planFormValues } from '$lib/schemas/plan';
import { DEFAULT_TOLERANCE_PERCENT } from '$lib/fuel';
import { fromLitres } from '$lib/units';
import type { Actions, PageServerLoad } from './$types';

// The flight's plan as form values in the member's fuel unit, and the plan worked out.
export const load = (async (event) => {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	const { plan, aircraft: a } = await planContext(ctx.flight);
	const unit = ctx.user.prefFuelUnit ?? a.displayUnit;
	const show = (l: number | null) => (l === null ? '' : String(Math.round(fromLitres(l, unit, a.densityKgPerL) * 100) / 100));
	const values = plan
		? planFormValues(plan, unit, a.densityKgPerL)
		: { unit, start: '', taxi: '', climb: '', reserveRule: a.reserveRule ?? '', reserveMin: a.reserveCustomMin === null ? '' : String(a.reserveCustomMin), reserveFlow: show(a.baselineCruiseLph), tolerance: String(DEFAULT_TOLERANCE_PERCENT) };
	return {
		flight: { id: ctx.flight.id, title: ctx.flight.title, startedAt: ctx.flight.startedAt },
		aircraft: { registration: a.registration, densityKgPerL: a.densityKgPerL },
		plan,
		worked: plan ? workedPlanOf(plan) : null,
		values,
		unit,
		mayEdit: mayOnFlight(ctx, ctx.flight, 'annotate')
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const { aircraft: a } = await planContext(flight);
		const form = parsePlanForm(formValues(await event.request.formData()), a.densityKgPerL);
		if (!form.ok) return failForm(400, form.errors, form.values, 'save');
		await savePlan(flight, form.data, user.id);
		return { action: 'save', saved: true };
	},
	// Fills the legs table from a file; nothing is stored until the form is saved.
	import: async (event) => {
		await requireFlight(event, event.params.org, event.params.id, 'annotate');
		return importPlanFile(await event.request.formData());
	},
	remove: async (event) => {
		const { flight } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const removed = await removePlan(flight.id);
		if (!removed) return failForm(404, { form: 'This flight has no plan to remove.' }, {}, 'remove');
		return { action: 'remove', removed: true };
	}
} satisfies Actions;
