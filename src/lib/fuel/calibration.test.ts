import { describe, expect, it } from 'vitest';
import { calibrate } from './calibration';

describe('calibrate', () => {
	it('works the K-factor example: K 68,000, 30.0 indicated, 31.5 pumped → 64,761.9', () => {
		// DOMAIN.md, derived from the definitions: MF = actual ÷ indicated (ISO 1998-6);
		// K_new = K_old ÷ MF (API MPMS ch. 12.2) = K_old × indicated ÷ pumped.
		const r = calibrate({ indicatedL: 30, pumpedL: 31.5, kFactorOld: 68_000 });
		if (!r.ok) throw new Error(r.message);
		expect(r.kFactorNew).toBeCloseTo(64_761.9, 1);
		expect(r.meterFactor).toBeCloseTo(1.05, 12);
		expect(r.correctionPercent).toBeCloseTo(5, 9);
		expect(r.plausible).toBe(true);
		expect(r.thresholdBasis).toBe('our choice');
	});

	it('flags a correction beyond ±10 % as suspect', () => {
		const r = calibrate({ indicatedL: 100, pumpedL: 85 });
		if (!r.ok) throw new Error(r.message);
		expect(r.meterFactor).toBeCloseTo(0.85, 12);
		expect(r.correctionPercent).toBeCloseTo(-15, 9);
		expect(r.plausible).toBe(false);
		expect(r.kFactorNew).toBeNull();
		expect(r.notes[0]).toMatch(/same level/);
	});

	it('notes when too little fuel was used to judge', () => {
		const r = calibrate({ indicatedL: 8, pumpedL: 8.2 });
		expect(r.ok && r.notes.some((n) => /Little fuel/.test(n))).toBe(true);
	});

	it('says which field is wrong', () => {
		expect(calibrate({ indicatedL: 0, pumpedL: 30 })).toMatchObject({ ok: false, field: 'indicatedL' });
		expect(calibrate({ indicatedL: 30, pumpedL: NaN })).toMatchObject({ ok: false, field: 'pumpedL' });
		expect(calibrate({ indicatedL: 30, pumpedL: 31, kFactorOld: -1 })).toMatchObject({ ok: false, field: 'kFactorOld' });
	});
});
