// Reconciling fuel used as shown against fuel actually pumped at the next fill-up.
import { z } from 'zod';
import { parseTypedNumber } from '$lib/csv/values';
import { plainText } from './text';

const amount = (what: string) =>
	z
		.string()
		.trim()
		.transform((s) => parseTypedNumber(s) ?? NaN)
		.pipe(z.number({ error: `Enter ${what} as a number.` }).positive(`Enter ${what} above zero.`).max(5000, `Enter ${what} below 5000.`));

export const calibrationFormSchema = z.object({
	shown: amount('the fuel used Burndown showed'),
	pumped: amount('the fuel pumped'),
	apply: z.enum(['meterFactor', 'kFactor', 'none'], 'Choose how to apply the correction.'),
	note: plainText(200).default('')
});
export type CalibrationForm = z.output<typeof calibrationFormSchema>;
