// The start-of-flight declaration as an upload states it (a kind, and an amount in the aircraft's
// display unit or a unit given) and its checks against the tanks, turned into the engine's
// Declaration in litres. "Unchanged since the last flight" is "added 0" to the engine, so it
// follows the previous flight's figure if that is ever corrected.
import { z } from 'zod';
import type { Declaration } from '$lib/fuel';
import { fromLitres, fuelUnitLabels, fuelUnits, toLitres, type FuelUnit } from '$lib/units';

export const declarationKinds = ['unchanged', 'full', 'lower', 'onBoard', 'added', 'removed'] as const;
export type DeclarationKind = (typeof declarationKinds)[number];

const amount = z
	.union([z.string(), z.number()])
	.optional()
	.transform((raw, ctx) => {
		if (raw === undefined || (typeof raw === 'string' && raw.trim() === '')) return null;
		const n = typeof raw === 'number' ? raw : Number(raw.trim().replace(',', '.'));
		if (!Number.isFinite(n) || n < 0) {
			ctx.addIssue({ code: 'custom', message: 'Enter the amount as a number, zero or more.' });
			return z.NEVER;
		}
		return n;
	});

export const declarationInputSchema = z
	.object({
		kind: z.enum(declarationKinds, 'Choose what was on board at engine start.'),
		amount,
		unit: z.enum(fuelUnits as [FuelUnit, ...FuelUnit[]], 'Choose a fuel unit.').optional()
	})
	.superRefine((d, ctx) => {
		if ((d.kind === 'onBoard' || d.kind === 'added' || d.kind === 'removed') && d.amount === null)
			ctx.addIssue({ code: 'custom', path: ['amount'], message: 'Enter the amount.' });
	});
export type DeclarationInput = z.output<typeof declarationInputSchema>;

interface Tanks {
	capacityL: number;
	lowerLevelL: number | null;
	densityKgPerL: number;
	displayUnit: FuelUnit;
}

/** The engine's declaration, in litres. */
export function toDeclaration(d: DeclarationInput, a: Tanks): Declaration {
	const litres = (x: number | null) => toLitres(x ?? 0, d.unit ?? a.displayUnit, a.densityKgPerL);
	switch (d.kind) {
		case 'unchanged':
			return { kind: 'added', amountL: 0 };
		case 'full':
			return { kind: 'full' };
		case 'lower':
			return { kind: 'lower' };
		case 'onBoard':
			return { kind: 'onBoard', amountL: litres(d.amount) };
		case 'added':
			return { kind: 'added', amountL: litres(d.amount) };
		case 'removed':
			return { kind: 'removed', amountL: litres(d.amount) };
	}
}

/**
 * Why the declaration cannot be right for these tanks, or null. `previousOnBoardL` is the fuel
 * after the flight before this one (null when unknown); added/removed/unchanged need it.
 */
export function declarationProblem(d: DeclarationInput, a: Tanks, previousOnBoardL: number | null): string | null {
	const unit = d.unit ?? a.displayUnit;
	const show = (l: number) => `${Math.round(fromLitres(l, unit, a.densityKgPerL) * 10) / 10} ${fuelUnitLabels[unit]}`;
	const amountL = d.amount === null ? 0 : toLitres(d.amount, unit, a.densityKgPerL);
	// Rounding in display units must not turn "full" typed as a number into "above capacity".
	const slack = 1e-6 * a.capacityL;
	switch (d.kind) {
		case 'lower':
			return a.lowerLevelL === null ? 'This aircraft has no lower fill level set; declare the amount on board instead.' : null;
		case 'onBoard':
			return amountL > a.capacityL + slack ? `${show(amountL)} is more than the usable capacity (${show(a.capacityL)}).` : null;
		case 'unchanged':
		case 'added':
		case 'removed': {
			if (previousOnBoardL === null)
				return 'The fuel on board after the previous flight is not known; declare the amount on board instead.';
			if (d.kind === 'added' && previousOnBoardL + amountL > a.capacityL + slack)
				return `${show(previousOnBoardL)} on board plus ${show(amountL)} added is more than the usable capacity (${show(a.capacityL)}).`;
			if (d.kind === 'removed' && amountL > previousOnBoardL + slack)
				return `Only ${show(previousOnBoardL)} was on board after the previous flight; ${show(amountL)} cannot have been removed.`;
			return null;
		}
		default:
			return null;
	}
}
