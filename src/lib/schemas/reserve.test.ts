import { describe, expect, it } from 'vitest';
import { RESERVE_RULE_IDS, reserveRules } from '$lib/fuel';
import { reserveRuleLabel, UNKNOWN_RESERVE_RULE } from '$lib/format';
import { storedReserveRule } from './reserve';

describe('stored reserve rule', () => {
	it('reads each of our ids as itself', () => {
		for (const id of RESERVE_RULE_IDS) expect(storedReserveRule(id)).toBe(id);
	});

	it('reads anything else as null, the unknown rule', () => {
		for (const v of ['faa-night', '', 'FAA-91.151-VFR-DAY', null, undefined, 30]) expect(storedReserveRule(v)).toBeNull();
	});

	it('the list of ids and the rules as data agree, one rule per id', () => {
		expect(reserveRules.map((r) => r.id).sort()).toEqual([...RESERVE_RULE_IDS].sort());
	});

	it('an unknown rule is labelled as such, saying there is no reserve in the figures', () => {
		expect(reserveRuleLabel(null, null)).toBe(UNKNOWN_RESERVE_RULE);
		expect(UNKNOWN_RESERVE_RULE).toMatch(/no reserve/);
	});
});
