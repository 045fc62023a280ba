// The shared start-of-flight declaration seen from its three callers (upload fields, the
// declaration form, a recorder's open call): same litres out, each caller's own words and limits.
import { describe, expect, it } from 'vitest';
import { declarationInputSchema } from '$lib/server/ingest/declaration';
import { openSchema } from '$lib/server/live/batch';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { DECLARATION_KINDS, UNCHANGED_DECLARATION, amountField, declarationKindOf, needsAmount, parseAmount, toDeclaration, type DeclarationKind } from './declaration';
import { declarationFormSchema, declarationFormValues } from './flight';

// A 40 US gal trainer shown in US gallons, avgas at 0.719 kg/L.
const tanks = { capacityL: 40 * LITRES_PER_US_GALLON, lowerLevelL: 28 * LITRES_PER_US_GALLON, densityKgPerL: 0.719, displayUnit: 'usgal' as const };

/** The same statement through each caller's schema, to the engine's Declaration. */
function throughEveryCaller(kind: DeclarationKind, amount: number | null, unit: 'usgal' | 'l' | 'lb') {
	const text = amount === null ? '' : String(amount).replace('.', ',');
	const upload = toDeclaration(declarationInputSchema.parse({ kind, amount: text, unit }), tanks);
	const form = declarationFormSchema(tanks.densityKgPerL).parse({ kind, amount: text, unit, previous: '' }).declaration;
	const open = openSchema.parse({ declaration: { kind, ...(amount === null ? {} : { amount }), unit } }).declaration!;
	return { upload, form, live: toDeclaration(open, tanks) };
}

describe('one declaration for uploads, forms and recorders', () => {
	it('reads a typed amount with a decimal point or comma; blank is no amount', () => {
		expect(parseAmount(' 12,5 ')).toBe(12.5);
		expect(parseAmount('12.5')).toBe(12.5);
		expect(parseAmount('   ')).toBeNull();
		expect(parseAmount(undefined)).toBeNull();
		expect(parseAmount(7)).toBe(7);
		expect(parseAmount('about 30')).toBeNaN();
	});

	it('gives the same litres whichever way the declaration arrives (1 US gal = 3.785411784 L, NIST Handbook 44)', () => {
		for (const [kind, amount, unit, litres] of [
			['onBoard', 30.5, 'usgal', 30.5 * 3.785411784],
			['added', 12.25, 'l', 12.25],
			['removed', 72, 'lb', (72 * 0.45359237) / 0.719]
		] as const) {
			const { upload, form, live } = throughEveryCaller(kind, amount, unit);
			expect(upload).toEqual({ kind, amountL: litres });
			expect(form).toEqual(upload);
			expect(live).toEqual(upload);
		}
		for (const kind of ['unchanged', 'full', 'lower'] as const) {
			const { upload, form, live } = throughEveryCaller(kind, null, 'usgal');
			expect(form).toEqual(upload);
			expect(live).toEqual(upload);
		}
		expect(throughEveryCaller('unchanged', null, 'l').upload).toEqual(UNCHANGED_DECLARATION);
	});

	it('asks for the amount of onBoard, added and removed, each caller in its own words', () => {
		expect(DECLARATION_KINDS.filter(needsAmount)).toEqual(['onBoard', 'added', 'removed']);
		const upload = declarationInputSchema.safeParse({ kind: 'removed', amount: '' });
		expect(upload.error?.issues.map((i) => [i.path, i.message])).toEqual([[['amount'], 'Enter the amount.']]);
		const form = declarationFormSchema(0.72).safeParse({ kind: 'removed', amount: '', unit: 'l', previous: '' });
		expect(form.error?.issues.map((i) => [i.path, i.message])).toEqual([[['amount'], 'Enter the amount removed.']]);
		const open = openSchema.safeParse({ declaration: { kind: 'removed' } });
		expect(open.error?.issues.map((i) => [i.path, i.message])).toEqual([[['declaration', 'amount'], 'declaration.amount is needed for removed.']]);
	});

	it('keeps each caller’s limits: no upper bound on an upload, the form and JSON at the maximum', () => {
		expect(declarationInputSchema.safeParse({ kind: 'onBoard', amount: '250000' }).success).toBe(true);
		const typed = amountField('text', { notANumber: 'number please', outOfRange: 'too much' }, 10);
		expect(typed.safeParse('10,0').data).toBe(10);
		expect(typed.safeParse('10,5').error?.issues[0].message).toBe('too much');
		expect(typed.safeParse('ten').error?.issues[0].message).toBe('number please');
		expect(openSchema.safeParse({ declaration: { kind: 'onBoard', amount: '30' } }).success).toBe(false);
		expect(openSchema.safeParse({ declaration: { kind: 'onBoard', amount: 100_001 } }).success).toBe(false);
	});

	it('shows a stored declaration as the kind it was stated as', () => {
		for (const kind of DECLARATION_KINDS) {
			const stored = toDeclaration({ kind, amount: needsAmount(kind) ? 5 : null }, tanks);
			expect(declarationKindOf(stored)).toBe(kind);
			expect(declarationFormValues(stored, null, 'usgal', tanks.densityKgPerL)).toMatchObject({ kind, amount: needsAmount(kind) ? '5' : '' });
		}
	});
});
