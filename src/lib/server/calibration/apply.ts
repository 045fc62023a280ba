// Turning a reconciliation, or factors typed by hand, into a dated calibration entry: a preview
// first (the factors old → new and how many flights change), then the entry and the recompute of
// those flights in one transaction (factors.ts).
import { factorsToApply, type Factors } from '$lib/fuel';
import type { ApplyInput, HandFactorsInput } from '$lib/schemas/pump';
import type { Aircraft, Calibration } from '../db/schema';
import { entryInForce, flightsAffected, writeEntry, type AffectedRange } from './factors';
import { reconciliationOf } from './receipts';

export interface ApplyPreview {
	old: Factors;
	new: Factors;
	range: AffectedRange;
}

export type ApplyOutcome =
	| { ok: true; step: 'preview'; preview: ApplyPreview }
	| { ok: true; step: 'confirm'; preview: ApplyPreview; entry: Calibration }
	| { ok: false; field: string; message: string };

async function oldFactorsAt(a: Aircraft, at: Date): Promise<Factors> {
	const e = await entryInForce(a.id, at);
	return e ? { meterFactor: e.meterFactorNew, kFactor: e.kFactorNew } : { meterFactor: a.meterFactor, kFactor: a.kFactor };
}

/** The window's proposal, read again from the stored receipts and figures (never from the form). */
export async function applyReconciliation(a: Aircraft, input: ApplyInput, userId: string): Promise<ApplyOutcome> {
	const rec = await reconciliationOf(a);
	const w = rec.windows.find((x) => x.fromReceiptId === input.from && x.toReceiptId === input.to);
	if (!w) return { ok: false, field: 'from', message: 'There is no reconciliation between those two receipts of this aircraft.' };
	if (!w.proposal.ok) return { ok: false, field: 'from', message: w.proposal.message };
	if (input.as === 'kFactor' && w.proposal.kFactorNew === null)
		return { ok: false, field: 'as', message: 'No K-factor is recorded for the sensor, so no new one can be worked out: apply a meter factor, or set the K-factor by hand first.' };
	const old = await oldFactorsAt(a, input.inForceFrom);
	const next = factorsToApply(w.proposal, input.as, old);
	const preview: ApplyPreview = { old, new: next, range: await flightsAffected(a.id, input.inForceFrom) };
	if (input.step === 'preview') return { ok: true, step: 'preview', preview };
	const written = await writeEntry(
		a,
		{ source: 'reconciliation', inForceFrom: input.inForceFrom, factors: next, indicatedL: w.indicatedL, pumpedL: w.pumpedL, receiptFromId: w.fromReceiptId, receiptToId: w.toReceiptId, note: input.note },
		userId
	);
	if (!written.ok) return written;
	return { ok: true, step: 'confirm', preview: { old: { meterFactor: written.entry.meterFactorOld, kFactor: written.entry.kFactorOld }, new: next, range: written.range }, entry: written.entry };
}

export async function setFactorsByHand(a: Aircraft, input: HandFactorsInput, userId: string) {
	return writeEntry(a, { source: 'hand', inForceFrom: input.inForceFrom, factors: { meterFactor: input.meterFactor, kFactor: input.kFactor }, note: input.note }, userId);
}
