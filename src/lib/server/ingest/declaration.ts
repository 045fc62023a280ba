// The start-of-flight declaration as an upload states it, in the page's fields or a script's
// query: the shared declaration ($lib/schemas/declaration) in the upload's words, with an amount
// in the aircraft's display unit or the unit given. The checks against the tanks are shared too.
import { z } from 'zod';
import { amountField, declarationSchema, fuelUnitSchema } from '$lib/schemas/declaration';

const NOT_AN_AMOUNT = 'Enter the amount as a number, zero or more.';

export const declarationInputSchema = declarationSchema(
	{
		amount: amountField('textOrNumber', { notANumber: NOT_AN_AMOUNT, outOfRange: NOT_AN_AMOUNT }),
		unit: fuelUnitSchema('Choose a fuel unit.').optional()
	},
	{ kind: 'Choose what was on board at engine start.', missingAmount: () => 'Enter the amount.' }
);
export type DeclarationInput = z.output<typeof declarationInputSchema>;
