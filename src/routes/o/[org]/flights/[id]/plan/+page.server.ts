import { mayOnFlight, requireFlight } from '$lib/server/access';
import { planContext, removePlan, savePlan } from '$lib/server/plans';
import { workedPlanOf } from '$lib/plan-report';
import { legsFromCsv, legsFromGpx, MAX_PLAN_FILE_BYTES } from '$lib/plan-import';
import { failForm, formValues } from '$lib/schemas/form';
import { parsePlanForm, planFormValues, PLAN_LEG_FIELDS } from '$lib/schemas/plan';
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
		: { unit, start: '', taxi: '', climb: '', reserveRule: a.reserveRule, reserveMin: a.reserveCustomMin === null ? '' : String(a.reserveCustomMin), reserveFlow: show(a.baselineCruiseLph), tolerance: String(DEFAULT_TOLERANCE_PERCENT) };
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
		const body = await event.request.formData();
		const values = formValues(body);
		const file = body.get('file');
		if (!(file instanceof File) || file.size === 0) return failForm(400, { file: 'Choose a CSV of legs or a GPX route file.' }, values, 'import');
		if (file.size > MAX_PLAN_FILE_BYTES) return failForm(400, { file: `The file is larger than ${MAX_PLAN_FILE_BYTES / 1024} KB; a plan's legs fit in far less.` }, values, 'import');
		const text = await file.text();
		const gpx = /\.gpx$/i.test(file.name) || /^\s*(<\?xml|<gpx)/i.test(text);
		const result = gpx ? legsFromGpx(text) : legsFromCsv(text);
		if (!result.ok) return failForm(400, { file: `${file.name}: ${result.message}` }, values, 'import');
		const kept = Object.fromEntries(Object.entries(values).filter(([k]) => !k.startsWith('legs.')));
		result.rows.forEach((row, i) => {
			for (const f of PLAN_LEG_FIELDS) kept[`legs.${i}.${f}`] = row[f];
		});
		return { action: 'import', imported: result.rows.length, warnings: result.warnings, values: kept };
	},
	remove: async (event) => {
		const { flight } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const removed = await removePlan(flight.id);
		if (!removed) return failForm(404, { form: 'This flight has no plan to remove.' }, {}, 'remove');
		return { action: 'remove', removed: true };
	}
} satisfies Actions;
