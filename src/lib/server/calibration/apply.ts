// Turning a reconciliation, or factors typed by hand, into a dated calibration entry: a preview
// first (the factors old → new and how many flights change), then the entry and the recompute of
// those flights in one transaction (factors.ts).
import { factorsToApply, type Factors } from '$lib/fuel';
import type { ApplyInput, HandFactorsInput } from '$lib/schemas/pump';
import type { Aircraft, Calibration } from '../db/schema';
import { entryInForce, flightsAffected, rangeProblem, writeEntry, type AffectedRange, type WriteResult } from './factors';
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
	return previewOrWrite(a, input, { source: 'reconciliation', inForceFrom: input.inForceFrom, inForceUntil: input.inForceUntil, factors: next, indicatedL: w.indicatedL, pumpedL: w.pumpedL, receiptFromId: w.fromReceiptId, receiptToId: w.toReceiptId, note: input.note }, old, userId);
}

/** Factors typed by hand over a date range: the same preview (how many flights change), then the entry. */
export async function setFactorsByHand(a: Aircraft, input: HandFactorsInput, userId: string): Promise<ApplyOutcome> {
	const old = await oldFactorsAt(a, input.inForceFrom);
	return previewOrWrite(a, input, { source: 'hand', inForceFrom: input.inForceFrom, inForceUntil: input.inForceUntil, factors: { meterFactor: input.meterFactor, kFactor: input.kFactor }, note: input.note }, old, userId);
}

async function previewOrWrite(a: Aircraft, input: { step: 'preview' | 'confirm' }, entry: Parameters<typeof writeEntry>[1], old: Factors, userId: string): Promise<ApplyOutcome> {
	const problem = rangeProblem(entry);
	if (problem) return problem;
	const preview: ApplyPreview = { old, new: entry.factors, range: await flightsAffected(a.id, entry.inForceFrom, entry.inForceUntil ?? null) };
	if (input.step === 'preview') return { ok: true, step: 'preview', preview };
	const written: WriteResult = await writeEntry(a, entry, userId);
	if (!written.ok) return written;
	return { ok: true, step: 'confirm', preview: { old: { meterFactor: written.entry.meterFactorOld, kFactor: written.entry.kFactorOld }, new: entry.factors, range: written.range }, entry: written.entry };
}
