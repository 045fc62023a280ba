// Reconciling fuel used as shown against fuel actually pumped at the next fill-up.
import { z } from 'zod';

const amount = (what: string) =>
	z
		.string()
		.trim()
		.transform((s) => Number(s.replace(',', '.')))
		.pipe(z.number({ error: `Enter ${what} as a number.` }).positive(`Enter ${what} above zero.`).max(5000, `Enter ${what} below 5000.`));

export const calibrationFormSchema = z.object({
	shown: amount('the fuel used Burndown showed'),
	pumped: amount('the fuel pumped'),
	apply: z.enum(['meterFactor', 'kFactor', 'none'], 'Choose how to apply the correction.'),
	note: z.string().trim().max(200, 'Use at most 200 characters.').default('')
});
export type CalibrationForm = z.output<typeof calibrationFormSchema>;
