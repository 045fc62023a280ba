import { describe, expect, it } from 'vitest';
import { checkProfile, resolveDeclaration } from './declaration';
import { profile } from './test-fixtures';
import type { Declaration } from './types';

const usable = checkProfile(profile()).profile; // capacity 150, lower level 100
const codes = (r: { warnings: { code: string }[] }): string[] => r.warnings.map((w) => w.code);

describe('resolveDeclaration', () => {
	it('takes a stated amount on board', () => {
		const r = resolveDeclaration({ kind: 'onBoard', amountL: 87.5 }, usable, null);
		expect(r.onBoardL).toBe(87.5);
		expect(r.warnings).toEqual([]);
	});

	it('fills to full and to the lower level', () => {
		expect(resolveDeclaration({ kind: 'full' }, usable, 20).onBoardL).toBe(150);
		expect(resolveDeclaration({ kind: 'lower' }, usable, 20).onBoardL).toBe(100);
	});

	it('adds to and removes from the previous flight’s fuel', () => {
		expect(resolveDeclaration({ kind: 'added', amountL: 40 }, usable, 55).onBoardL).toBe(95);
		expect(resolveDeclaration({ kind: 'removed', amountL: 15 }, usable, 55).onBoardL).toBe(40);
	});

	it('clamps above capacity and below zero, with a warning', () => {
		const over = resolveDeclaration({ kind: 'added', amountL: 120 }, usable, 55);
		expect(over.onBoardL).toBe(150);
		expect(codes(over)).toEqual(['declarationAboveCapacity']);
		expect(over.warnings[0].message).toMatch(/175 L.*150 L/);
		const stated = resolveDeclaration({ kind: 'onBoard', amountL: 151 }, usable, null);
		expect(stated.onBoardL).toBe(150);
		const under = resolveDeclaration({ kind: 'removed', amountL: 70 }, usable, 55);
		expect(under.onBoardL).toBe(0);
		expect(codes(under)).toEqual(['declarationBelowZero']);
	});

	it('counts from zero, and says so, when the previous fuel is unknown', () => {
		const r = resolveDeclaration({ kind: 'added', amountL: 60 }, usable, undefined);
		expect(r.onBoardL).toBe(60);
		expect(codes(r)).toContain('noPreviousOnBoard');
		expect(codes(resolveDeclaration({ kind: 'removed', amountL: 5 }, usable, NaN))).toContain('noPreviousOnBoard');
	});

	it('never takes fuel out when filling to the lower level', () => {
		const r = resolveDeclaration({ kind: 'lower' }, usable, 120);
		expect(r.onBoardL).toBe(120);
		expect(codes(r)).toEqual(['alreadyAboveLevel']);
	});

	it('warns when the aircraft has no lower level', () => {
		const noTabs = checkProfile(profile({ lowerLevelL: null })).profile;
		const r = resolveDeclaration({ kind: 'lower' }, noTabs, 30);
		expect(r.onBoardL).toBe(30);
		expect(codes(r)).toEqual(['noLowerLevel']);
	});

	it('treats a negative or missing amount as zero with a warning', () => {
		const neg = resolveDeclaration({ kind: 'onBoard', amountL: -5 }, usable, null);
		expect(neg.onBoardL).toBe(0);
		expect(codes(neg)).toEqual(['declarationInvalidAmount']);
		const nan = resolveDeclaration({ kind: 'added', amountL: NaN }, usable, 40);
		expect(nan.onBoardL).toBe(40);
		expect(codes(nan)).toEqual(['declarationInvalidAmount']);
		const bogus = resolveDeclaration({ kind: 'topped' } as unknown as Declaration, usable, 40);
		expect(bogus.onBoardL).toBe(0);
		expect(codes(bogus)).toEqual(['declarationInvalidAmount']);
	});
});

describe('checkProfile', () => {
	it('accepts a sound profile unchanged', () => {
		const r = checkProfile(profile({ meterFactor: 1.03, baselineCruiseFlowLph: 32 }));
		expect(r.warnings).toEqual([]);
		expect(r.profile).toEqual({ capacityL: 150, lowerLevelL: 100, meterFactor: 1.03, baselineCruiseFlowLph: 32 });
	});

	it('replaces unusable fields with neutral values and warns', () => {
		const r = checkProfile(profile({ capacityL: 0, lowerLevelL: 200, meterFactor: NaN, baselineCruiseFlowLph: -3 }));
		expect(r.profile.capacityL).toBe(Infinity);
		expect(r.profile.meterFactor).toBe(1);
		expect(r.profile.baselineCruiseFlowLph).toBeNull();
		expect(r.warnings).toHaveLength(3);
		expect(r.warnings.every((w) => w.code === 'invalidProfile')).toBe(true);
		const lower = checkProfile(profile({ lowerLevelL: 200 }));
		expect(lower.profile.lowerLevelL).toBeNull();
	});
});
