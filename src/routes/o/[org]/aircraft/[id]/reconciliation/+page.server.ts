import { requireAircraft } from '$lib/server/access';
import { applyReconciliation, setFactorsByHand } from '$lib/server/calibration/apply';
import { calibrationHistory } from '$lib/server/calibration/factors';
import { addReceipt, deleteReceipt, reconciliationOf } from '$lib/server/calibration/receipts';
import { latestRecompute } from '$lib/server/flights/recompute-jobs';
import { failForm, parseForm } from '$lib/schemas/form';
import { applyFormSchema, deleteReceiptFormSchema, handFactorsFormSchema, receiptFormSchema } from '$lib/schemas/pump';
import type { Actions, PageServerLoad } from './$types';

// Fuel pumped and calibration: the aircraft's pump receipts, the reconciliation between fills to
// full, and its dated calibration history. The maintenance viewer reads; only calibrate writes.
export const load = (async (event) => {
	const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'viewFuelRecords');
	const [reconciliation, history, recompute] = await Promise.all([reconciliationOf(aircraft), calibrationHistory(aircraft.id), latestRecompute(aircraft.id)]);
	return { aircraft, reconciliation, history, recompute, prefFuelUnit: user.prefFuelUnit };
}) satisfies PageServerLoad;

export const actions = {
	receipt: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'calibrate');
		const form = parseForm(receiptFormSchema(aircraft.densityKgPerL), await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'receipt');
		await addReceipt(aircraft, form.data, user.id);
		return { action: 'receipt', saved: true };
	},
	deleteReceipt: async (event) => {
		const { aircraft } = await requireAircraft(event, event.params.org, event.params.id, 'calibrate');
		const form = parseForm(deleteReceiptFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'deleteReceipt');
		if (!(await deleteReceipt(aircraft.id, form.data.receiptId))) return failForm(400, { receiptId: 'That receipt is not one of this aircraft’s.' }, form.values, 'deleteReceipt');
		return { action: 'deleteReceipt', saved: true };
	},
	apply: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'calibrate');
		const form = parseForm(applyFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'apply');
		const outcome = await applyReconciliation(aircraft, form.data, user.id);
		if (!outcome.ok) return failForm(400, { [outcome.field]: outcome.message }, form.values, 'apply');
		return { action: 'apply', values: form.values, step: outcome.step, preview: outcome.preview };
	},
	factors: async (event) => {
		const { aircraft, user } = await requireAircraft(event, event.params.org, event.params.id, 'calibrate');
		const form = parseForm(handFactorsFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'factors');
		const outcome = await setFactorsByHand(aircraft, form.data, user.id);
		if (!outcome.ok) return failForm(400, { [outcome.field]: outcome.message }, form.values, 'factors');
		return { action: 'factors', values: form.values, step: outcome.step, preview: outcome.preview };
	}
} satisfies Actions;
