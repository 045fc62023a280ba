// The start-of-flight declaration as a recorder or tablet sends it in JSON (POST /live/open),
// turned into the engine's Declaration in litres. Same choices as the declaration form on the
// replay and live pages ($lib/schemas/flight): "unchanged" is "added 0" on top of the last flight.
import { z } from 'zod';
import type { Declaration } from '$lib/fuel';
import { MAX_AMOUNT } from '$lib/schemas/flight';
import { fuelUnits, toLitres, type FuelUnit } from '$lib/units';

export const declarationJsonSchema = z
	.object({
		kind: z.enum(['unchanged', 'onBoard', 'full', 'lower', 'added', 'removed'], 'declaration.kind must be unchanged, onBoard, full, lower, added or removed.'),
		amount: z.number().min(0).max(MAX_AMOUNT).optional(),
		/** Unit of amount; the aircraft's display unit when left out. */
		unit: z.enum(fuelUnits as [FuelUnit, ...FuelUnit[]]).optional()
	})
	.superRefine((d, ctx) => {
		if ((d.kind === 'onBoard' || d.kind === 'added' || d.kind === 'removed') && d.amount === undefined)
			ctx.addIssue({ code: 'custom', path: ['amount'], message: `declaration.amount is needed for ${d.kind}.` });
	});
export type DeclarationJson = z.output<typeof declarationJsonSchema>;

export function toDeclaration(d: DeclarationJson, aircraft: { displayUnit: FuelUnit; densityKgPerL: number }): Declaration {
	const litres = toLitres(d.amount ?? 0, d.unit ?? aircraft.displayUnit, aircraft.densityKgPerL);
	switch (d.kind) {
		case 'unchanged':
			return { kind: 'added', amountL: 0 };
		case 'onBoard':
		case 'added':
		case 'removed':
			return { kind: d.kind, amountL: litres };
		default:
			return { kind: d.kind };
	}
}

/** What a live flight assumes when nobody declared: unchanged since the aircraft's last flight. */
export const ASSUMED_DECLARATION: Declaration = { kind: 'added', amountL: 0 };
