import { describe, expect, it } from 'vitest';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { declarationProblem, toDeclaration } from '$lib/schemas/declaration';
import { declarationInputSchema } from './declaration';

// A 40 US gal trainer with tabs at 28 US gal, shown in US gallons.
const tanks = { capacityL: 40 * LITRES_PER_US_GALLON, lowerLevelL: 28 * LITRES_PER_US_GALLON, densityKgPerL: 0.719, displayUnit: 'usgal' as const };
const input = (v: Record<string, unknown>) => declarationInputSchema.parse(v);

describe('start-of-flight declarations', () => {
	it('convert the display unit to litres (1 US gal = 3.785411784 L, NIST Handbook 44)', () => {
		expect(toDeclaration(input({ kind: 'onBoard', amount: '30' }), tanks)).toEqual({ kind: 'onBoard', amountL: 30 * 3.785411784 });
		expect(toDeclaration(input({ kind: 'added', amount: '12,5' }), tanks)).toEqual({ kind: 'added', amountL: 12.5 * 3.785411784 });
		expect(toDeclaration(input({ kind: 'removed', amount: 4, unit: 'l' }), tanks)).toEqual({ kind: 'removed', amountL: 4 });
		// A mass unit goes through the density: 72 lb of avgas at 0.719 kg/L.
		expect(toDeclaration(input({ kind: 'onBoard', amount: 72, unit: 'lb' }), tanks)).toEqual({ kind: 'onBoard', amountL: (72 * 0.45359237) / 0.719 });
		expect(toDeclaration(input({ kind: 'unchanged' }), tanks)).toEqual({ kind: 'added', amountL: 0 });
		expect(toDeclaration(input({ kind: 'full' }), tanks)).toEqual({ kind: 'full' });
	});

	it('need an amount for on board, added and removed, never a negative one', () => {
		expect(declarationInputSchema.safeParse({ kind: 'onBoard' }).success).toBe(false);
		expect(declarationInputSchema.safeParse({ kind: 'added', amount: '-2' }).success).toBe(false);
		expect(declarationInputSchema.safeParse({ kind: 'full' }).success).toBe(true);
	});

	it('are checked against the tanks and what was on board before', () => {
		const prev = 20 * LITRES_PER_US_GALLON;
		expect(declarationProblem(input({ kind: 'onBoard', amount: '40' }), tanks, null)).toBeNull();
		expect(declarationProblem(input({ kind: 'onBoard', amount: '40.1' }), tanks, null)).toMatch(/40.1 US gal is more than the usable capacity \(40 US gal\)/);
		expect(declarationProblem(input({ kind: 'added', amount: '20' }), tanks, prev)).toBeNull();
		expect(declarationProblem(input({ kind: 'added', amount: '21' }), tanks, prev)).toMatch(/20 US gal on board plus 21 US gal added/);
		expect(declarationProblem(input({ kind: 'removed', amount: '21' }), tanks, prev)).toMatch(/Only 20 US gal was on board/);
		expect(declarationProblem(input({ kind: 'unchanged' }), tanks, null)).toMatch(/not known/);
		expect(declarationProblem(input({ kind: 'lower' }), { ...tanks, lowerLevelL: null }, prev)).toMatch(/no lower fill level/);
	});
});
