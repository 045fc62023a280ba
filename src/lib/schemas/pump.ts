// The owner's forms for fuel pumped and calibration: a pump receipt (amount in any unit, stored in
// litres too), applying a reconciliation's factors from a date, and setting the factors by hand.
import { z } from 'zod';
import { fuelUnits, toLitres, type FuelUnit } from '$lib/units';
import { optionalNumber, requiredNumber } from './aircraft';
import { plainText } from './text';

const UTC_MINUTE = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;

/** A datetime-local field's "YYYY-MM-DDTHH:MM", read as UTC (every time on Burndown's pages is UTC). */
export const utcMinute = (what: string) =>
	z
		.string({ error: `Enter ${what}.` })
		.trim()
		.transform((raw, ctx) => {
			const m = UTC_MINUTE.exec(raw);
			const d = m ? new Date(`${m[1]}-${m[2]}-${m[3]}T${m[4]}:${m[5]}:${m[6] ?? '00'}Z`) : null;
			if (!d || Number.isNaN(d.getTime()) || d.toISOString().slice(0, 16) !== `${m![1]}-${m![2]}-${m![3]}T${m![4]}:${m![5]}`) {
				ctx.addIssue({ code: 'custom', message: `Enter ${what} as a date and time (UTC).` });
				return z.NEVER;
			}
			return d;
		});

/** The same, or blank for none. */
export const optionalUtcMinute = (what: string) =>
	z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), utcMinute(what).optional()).transform((d) => d ?? null);

/** The same time back into a datetime-local field's value. */
export const utcMinuteValue = (d: Date) => d.toISOString().slice(0, 16);

/** Most a light aircraft's tanks take at one fill (our bound: well above any piston single or twin). */
export const MAX_RECEIPT_AMOUNT = 5000;

export const receiptFormSchema = (densityKgPerL: number) =>
	z
		.object({
			at: utcMinute('when the fuel was pumped'),
			airfield: plainText(60).default(''),
			amount: requiredNumber(0.1, MAX_RECEIPT_AMOUNT, `the amount pumped (0.1 to ${MAX_RECEIPT_AMOUNT})`),
			unit: z.enum(fuelUnits, 'Choose the unit on the receipt.'),
			full: z.enum(['1', '0'], 'Say whether the tanks were filled to full.'),
			note: plainText(200, { multiline: true }).default('')
		})
		.transform((v) => ({
			at: v.at,
			airfield: v.airfield,
			amount: v.amount,
			unit: v.unit,
			amountL: toLitres(v.amount, v.unit, densityKgPerL),
			filledToFull: v.full === '1',
			note: v.note
		}));
export type ReceiptInput = z.output<ReturnType<typeof receiptFormSchema>>;

export const deleteReceiptFormSchema = z.object({ receiptId: z.uuid('Choose a receipt.') });

/** Applying a reconciliation: which window (its two fills to full), how, from when; preview first. */
export const applyFormSchema = z.object({
	from: z.uuid('Choose a reconciliation.'),
	to: z.uuid('Choose a reconciliation.'),
	as: z.enum(['meterFactor', 'kFactor'], 'Choose how to apply the correction.'),
	inForceFrom: utcMinute('the time the new factor is in force from'),
	inForceUntil: optionalUtcMinute('the time the range ends'),
	step: z.enum(['preview', 'confirm']).default('preview'),
	note: plainText(200).default('')
});
export type ApplyInput = z.output<typeof applyFormSchema>;

/** Factors typed by hand, in force from a time: written to the history like any other change. */
export const handFactorsFormSchema = z.object({
	meterFactor: requiredNumber(0.5, 1.5, 'the meter factor'),
	kFactor: optionalNumber(1, 10_000_000, 'the K-factor in pulses per unit'),
	inForceFrom: utcMinute('the time the factors are in force from'),
	inForceUntil: optionalUtcMinute('the time the range ends'),
	step: z.enum(['preview', 'confirm']).default('preview'),
	note: plainText(200).default('')
});
export type HandFactorsInput = z.output<typeof handFactorsFormSchema>;
