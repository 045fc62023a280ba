// The start-of-flight fuel declaration, one definition for every way it arrives: the upload's
// fields, the declaration form on the replay and live pages, and a recorder's JSON open call.
// Each caller keeps its own wording; the kinds, the amount parsing, the conversion to the
// engine's Declaration in litres and the checks against the tanks are the ones here.
import { z } from 'zod';
import type { Declaration } from '$lib/fuel';
import { parseTypedNumber } from '$lib/csv/values';
import { fromLitres, fuelUnitLabels, fuelUnits, toLitres, type FuelUnit } from '$lib/units';

/** In the order the forms offer them. */
export const DECLARATION_KINDS = ['unchanged', 'onBoard', 'full', 'lower', 'added', 'removed'] as const;
export type DeclarationKind = (typeof DECLARATION_KINDS)[number];

export const declarationKindLabels: Record<DeclarationKind, string> = {
	unchanged: 'Unchanged since the last flight',
	onBoard: 'Amount on board (dipstick or gauge)',
	full: 'Filled to full',
	lower: 'Filled to the lower level (tabs)',
	added: 'Fuel added',
	removed: 'Fuel removed'
};

/** The kinds that need an amount. */
export type AmountKind = 'onBoard' | 'added' | 'removed';
export const needsAmount = (kind: DeclarationKind): kind is AmountKind => kind === 'onBoard' || kind === 'added' || kind === 'removed';

/** Generous upper bound on any typed amount; the engine clamps to the tank capacity and says so. */
export const MAX_AMOUNT = 100_000;

export const fuelUnitSchema = (message?: string) => z.enum(fuelUnits, message);

/**
 * An amount as typed, in the one number grammar ($lib/csv/values): blank is null, a decimal comma
 * is read as a point, anything else that is not a number is NaN (the schemas say so in their own
 * words).
 */
export function parseAmount(raw: string | number | null | undefined): number | null {
	if (raw === null || raw === undefined) return null;
	if (typeof raw === 'number') return raw;
	return parseTypedNumber(raw);
}

interface AmountWording {
	notANumber: string;
	/** Below zero, or above `max` when there is one. */
	outOfRange: string;
}

/**
 * An optional amount field: typed text (a form), or text or a number (the upload's fields and
 * scripts), or a JSON number checked by zod itself (a recorder's open call). Out: number or null
 * (the JSON form leaves a missing amount undefined, as zod does).
 */
export function amountField(from: 'text', wording: AmountWording, max?: number): z.ZodType<number | null, string | undefined>;
export function amountField(from: 'textOrNumber', wording: AmountWording, max?: number): z.ZodType<number | null, string | number | undefined>;
export function amountField(from: 'number', wording?: undefined, max?: number): z.ZodType<number | undefined, number | undefined>;
export function amountField(from: 'text' | 'textOrNumber' | 'number', wording?: AmountWording, max = Infinity): z.ZodType {
	if (from === 'number') return z.number().min(0).max(max).optional();
	const input = from === 'text' ? z.string().optional() : z.union([z.string(), z.number()]).optional();
	return input.transform((raw, ctx) => {
		const n = parseAmount(raw);
		if (n === null) return null;
		if (!Number.isFinite(n)) {
			ctx.addIssue({ code: 'custom', message: wording!.notANumber });
			return z.NEVER;
		}
		if (n < 0 || n > max) {
			ctx.addIssue({ code: 'custom', message: wording!.outOfRange });
			return z.NEVER;
		}
		return n;
	});
}

/** A declaration as stated: the amount in `unit`, or in the aircraft's display unit without one. */
export interface DeclarationStatement {
	kind: DeclarationKind;
	amount?: number | null;
	unit?: FuelUnit;
}

interface DeclarationWording {
	/** The kind is missing or not one of ours. */
	kind: string;
	/** An amount kind without an amount. */
	missingAmount: (kind: AmountKind) => string;
}

/**
 * The declaration's fields (kind, amount, unit, plus any the caller adds) with the one rule that
 * holds everywhere: onBoard, added and removed need an amount.
 */
export function declarationSchema<A extends z.ZodType<number | null | undefined>, U extends z.ZodType<FuelUnit | undefined>, X extends z.ZodRawShape = {}>(
	fields: { amount: A; unit: U },
	wording: DeclarationWording,
	extra?: X
) {
	return z.object({ kind: z.enum(DECLARATION_KINDS, wording.kind), amount: fields.amount, unit: fields.unit, ...(extra as X) }).superRefine((d, ctx) => {
		const { kind, amount } = d as { kind: DeclarationKind; amount: number | null | undefined };
		if (needsAmount(kind) && (amount === null || amount === undefined)) ctx.addIssue({ code: 'custom', path: ['amount'], message: wording.missingAmount(kind) });
	});
}

interface Tanks {
	capacityL: number;
	lowerLevelL: number | null;
	densityKgPerL: number;
	displayUnit: FuelUnit;
}

/**
 * The engine's declaration, in litres. "Unchanged since the last flight" is "added 0" to the
 * engine, so it follows the previous flight's figure if that is ever corrected.
 */
export function toDeclaration(d: DeclarationStatement, tanks: Pick<Tanks, 'displayUnit' | 'densityKgPerL'>): Declaration {
	const litres = toLitres(d.amount ?? 0, d.unit ?? tanks.displayUnit, tanks.densityKgPerL);
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

/** What "unchanged" is to the engine; also what a live flight assumes when nobody declared. */
export const UNCHANGED_DECLARATION: Declaration = { kind: 'added', amountL: 0 };

/** The kind a stored declaration was stated as (the inverse of toDeclaration's "added 0"). */
export const declarationKindOf = (d: Declaration): DeclarationKind => (d.kind === 'added' && d.amountL === 0 ? 'unchanged' : d.kind);

/**
 * Why the declaration cannot be right for these tanks, or null. `previousOnBoardL` is the fuel
 * after the flight before this one (null when unknown); added/removed/unchanged need it.
 */
export function declarationProblem(d: DeclarationStatement, a: Tanks, previousOnBoardL: number | null): string | null {
	const unit = d.unit ?? a.displayUnit;
	const show = (l: number) => `${Math.round(fromLitres(l, unit, a.densityKgPerL) * 10) / 10} ${fuelUnitLabels[unit]}`;
	const amountL = d.amount === null || d.amount === undefined ? 0 : toLitres(d.amount, unit, a.densityKgPerL);
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
