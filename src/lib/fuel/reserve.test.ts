import { describe, expect, it } from 'vitest';
import { RESERVE_CAUTION, reserveAmount, reserveRule, reserveRules, type ReserveRuleId } from './reserve';

describe('reserve rules', () => {
	it('holds the minutes of each rule with its citation', () => {
		const minutes = Object.fromEntries(reserveRules.map((r) => [r.id, r.minutes]));
		expect(minutes).toEqual({
			// 14 CFR 91.151(a)(1) and (a)(2): VFR airplanes, 30 min by day, 45 min at night.
			'faa-91.151-vfr-day': 30,
			'faa-91.151-vfr-night': 45,
			// 14 CFR 91.167(a): IFR, then 45 min at normal cruising speed.
			'faa-91.167-ifr': 45,
			// EASA Part-NCO NCO.OP.125 (aeroplanes): VFR day 30, VFR night 45, IFR 45 minutes.
			'easa-nco.op.125-vfr-day': 30,
			'easa-nco.op.125-vfr-night': 45,
			'easa-nco.op.125-ifr': 45,
			custom: null
		});
		expect(reserveRule('faa-91.151-vfr-night').citation).toBe('14 CFR 91.151(a)(2)');
		expect(reserveRule('faa-91.167-ifr').citation).toBe('14 CFR 91.167(a)');
		expect(reserveRule('easa-nco.op.125-ifr').citation).toMatch(/NCO\.OP\.125/);
		for (const r of reserveRules) expect(r.sourceText.length).toBeGreaterThan(20);
		expect(RESERVE_CAUTION).toMatch(/differ by country/);
	});

	it('refuses an unknown rule', () => {
		expect(() => reserveRule('faa-night' as ReserveRuleId)).toThrow(/Unknown reserve rule/);
	});
});

describe('reserveAmount', () => {
	it('is minutes × the baseline cruise flow when the aircraft has one', () => {
		const r = reserveAmount({ ruleId: 'faa-91.151-vfr-night' }, 32, 28);
		expect(r).toMatchObject({ minutes: 45, flowLph: 32, amountL: 24, basis: 'baseline' });
	});

	it('falls back to the measured cruise flow and says so', () => {
		const r = reserveAmount({ ruleId: 'easa-nco.op.125-vfr-day' }, null, 28);
		expect(r).toMatchObject({ minutes: 30, flowLph: 28, amountL: 14, basis: 'measured' });
		expect(r.note).toMatch(/measured/);
	});

	it('has no amount without any cruise flow', () => {
		expect(reserveAmount({ ruleId: 'faa-91.167-ifr' }, undefined, null)).toMatchObject({ amountL: null, basis: 'none' });
	});

	it('takes custom minutes', () => {
		expect(reserveAmount({ ruleId: 'custom', customMinutes: 60 }, 30, null)).toMatchObject({ amountL: 30, minutes: 60 });
		expect(reserveAmount({ ruleId: 'custom', customMinutes: -5 }, 30, null)).toMatchObject({ amountL: null, basis: 'none' });
		expect(reserveAmount({ ruleId: 'custom' }, 30, null).minutes).toBeNull();
	});
});
