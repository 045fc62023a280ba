import { describe, expect, it } from 'vitest';
import { belowPumpedRatio, factorsToApply, reconcile, type ReconcileFlight, type ReconcileReceipt } from './reconcile';
import { LITRES_PER_US_GALLON } from '$lib/units';

const gal = (g: number) => g * LITRES_PER_US_GALLON;
const h = (hours: number) => Date.UTC(2026, 4, 1) / 1000 + hours * 3600;
const receipt = (id: string, at: number, amountL: number, filledToFull = true): ReconcileReceipt => ({ id, at, amountL, filledToFull });
const flight = (id: string, startedAt: number, fuelUsedL: number | null, extra: Partial<ReconcileFlight> = {}): ReconcileFlight => ({
	id,
	startedAt,
	fuelUsedL,
	meterFactor: 1,
	engineTimeS: 3600,
	gapCount: 0,
	gapTimeS: 0,
	...extra
});

describe('reconcile: fill-up to fill-up', () => {
	it('works the K-factor example over a window of two flights (ISO 1998-6 meter factor; API MPMS 12.2 K_new = K_old ÷ MF)', () => {
		// Closed form: flights of 12.0 and 18.0 US gal computed = 30.0 US gal; pumped at the second
		// fill 31.5 US gal (a 10.0 US gal top-up between plus 21.5 to full). MF = 31.5 ÷ 30.0 = 1.05,
		// K_new = 68,000 ÷ 1.05 = 64,761.9 pulses per US gal (the DOMAIN.md example).
		const receipts = [receipt('a', h(0), gal(40)), receipt('b', h(5), gal(10), false), receipt('c', h(10), gal(21.5))];
		const flights = [flight('before', h(-3), gal(9)), flight('f1', h(1), gal(12)), flight('f2', h(6), gal(18)), flight('after', h(11), gal(7))];
		const [w] = reconcile(receipts, flights, { kFactorOld: 68_000 });
		expect(w.fromReceiptId).toBe('a');
		expect(w.toReceiptId).toBe('c');
		expect(w.flightIds).toEqual(['f1', 'f2']);
		expect(w.receiptCount).toBe(2);
		expect(w.pumpedL).toBeCloseTo(gal(31.5), 9);
		expect(w.computedL).toBeCloseTo(gal(30), 9);
		expect(w.pumpedOverComputed).toBeCloseTo(1.05, 12);
		expect(w.proposal.ok).toBe(true);
		if (!w.proposal.ok) return;
		expect(w.proposal.meterFactor).toBeCloseTo(1.05, 12);
		expect(w.proposal.kFactorNew).toBeCloseTo(64_761.9, 1);
		expect(68_000 / w.proposal.meterFactor).toBeCloseTo(w.proposal.kFactorNew!, 6);
	});

	it('takes the indicated fuel without the meter factor each flight was computed with', () => {
		// Flights computed with MF 1.02: the sensor indicated computed ÷ 1.02; the new factor is
		// pumped ÷ indicated (ISO 1998-6), so MF_new = 1.02 × pumped ÷ computed.
		const receipts = [receipt('a', h(0), gal(40)), receipt('c', h(10), gal(31.5))];
		const flights = [flight('f1', h(1), gal(12), { meterFactor: 1.02 }), flight('f2', h(6), gal(18), { meterFactor: 1.02 })];
		const [w] = reconcile(receipts, flights, { kFactorOld: 68_000 });
		expect(w.indicatedL).toBeCloseTo(gal(30) / 1.02, 9);
		if (!w.proposal.ok) throw new Error('expected a proposal');
		expect(w.proposal.meterFactor).toBeCloseTo(1.02 * 1.05, 12);
		expect(w.pumpedOverComputed).toBeCloseTo(1.05, 12);
	});

	it('flags flights with gaps and flights without stored figures, and needs two fills to full', () => {
		const receipts = [receipt('a', h(0), gal(40)), receipt('p', h(2), gal(5), false), receipt('c', h(10), gal(20))];
		const flights = [flight('gappy', h(1), gal(10), { gapCount: 2, gapTimeS: 120 }), flight('open', h(3), null)];
		const [w] = reconcile(receipts, flights, {});
		expect(w.flightsWithGaps).toEqual(['gappy']);
		expect(w.gapTimeS).toBe(120);
		expect(w.flightsWithoutFigures).toEqual(['open']);
		if (!w.proposal.ok) throw new Error('expected a proposal');
		expect(w.proposal.kFactorNew).toBeNull();
		expect(reconcile([receipt('a', h(0), 10)], flights, {})).toEqual([]);
		expect(reconcile([receipt('a', h(0), 10, false), receipt('b', h(1), 10, false)], flights, {})).toEqual([]);
	});

	it('answers a window without computed fuel with a problem, not a factor', () => {
		const [w] = reconcile([receipt('a', h(0), 40), receipt('c', h(10), 20)], [], {});
		expect(w.computedL).toBe(0);
		expect(w.pumpedOverComputed).toBeNull();
		expect(w.proposal).toMatchObject({ ok: false, field: 'indicatedL' });
	});

	it('lists windows newest first; "computed below pumped" counts only when every recent window says so', () => {
		const receipts = [receipt('a', h(0), 40), receipt('b', h(10), 21), receipt('c', h(20), 21.2)];
		const flights = [flight('f1', h(1), 20), flight('f2', h(11), 20)];
		const ws = reconcile(receipts, flights, {});
		expect(ws.map((w) => w.toReceiptId)).toEqual(['c', 'b']);
		// 21 ÷ 20 and 21.2 ÷ 20: the smaller of the two is what persists.
		expect(belowPumpedRatio(ws)).toBeCloseTo(1.05, 12);
		expect(belowPumpedRatio([])).toBeNull();
	});

	it('turns a proposal into the factors to apply: a meter factor in Burndown, or a K-factor in the sensor', () => {
		const [w] = reconcile([receipt('a', h(0), gal(40)), receipt('c', h(10), gal(31.5))], [flight('f', h(1), gal(30))], { kFactorOld: 68_000 });
		if (!w.proposal.ok) throw new Error('expected a proposal');
		expect(factorsToApply(w.proposal, 'meterFactor', { meterFactor: 1, kFactor: 68_000 })).toEqual({ meterFactor: w.proposal.meterFactor, kFactor: 68_000 });
		expect(factorsToApply(w.proposal, 'kFactor', { meterFactor: 1, kFactor: 68_000 })).toEqual({ meterFactor: 1, kFactor: w.proposal.kFactorNew });
	});
});
