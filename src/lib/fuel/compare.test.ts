import { describe, expect, it } from 'vitest';
import { alignSinceEngineStart, compareStepS, phaseDifferences } from './compare';

describe('alignSinceEngineStart', () => {
	it('buckets by time since engine start: mean flow per bucket, fuel used at its last sample', () => {
		// Engine start at 100 s; samples each second at 36 L/h, so fuel used grows 0.01 L per second
		// (36 L/h ÷ 3600 s/h, the definition of a flow).
		const n = 40;
		const t = Float64Array.from({ length: n }, (_, i) => 90 + i);
		const flow = Float64Array.from(t, (x) => (x < 100 ? 0 : 36));
		const used = Float64Array.from(t, (x) => (x < 100 ? 0 : (x - 100) * 0.01));
		const a = alignSinceEngineStart(t, flow, used, 100, 10);
		expect(a.flowLph.length).toBe(3);
		expect([...a.flowLph]).toEqual([36, 36, 36]);
		expect(a.usedL[0]).toBeCloseTo(0.09, 12);
		expect(a.usedL[2]).toBeCloseTo(0.29, 12);
	});

	it('leaves a bucket without samples empty instead of inventing a value', () => {
		const t = Float64Array.from([0, 1, 35]);
		const a = alignSinceEngineStart(t, Float64Array.from([30, 30, 30]), Float64Array.from([0, 0.01, 0.3]), 0, 10);
		expect(a.flowLph[1]).toBeNaN();
		expect(a.flowLph[3]).toBe(30);
	});

	it('keeps a long flight to a few hundred points', () => {
		expect(compareStepS([3 * 3600])).toBe(18);
		expect(compareStepS([600, 1200])).toBe(10);
	});
});

describe('phaseDifferences', () => {
	it('gives each flight against the first, phase by phase', () => {
		const leaned = [{ phase: 'cruise' as const, timeS: 3600, fuelL: 30, averageFlowLph: 30 }];
		const rich = [{ phase: 'cruise' as const, timeS: 3600, fuelL: 33, averageFlowLph: 33 }];
		const [, , cruise] = phaseDifferences([leaned, rich]);
		expect(cruise.phase).toBe('cruise');
		expect(cruise.fuelDeltaL).toEqual([null, 3]);
		expect(cruise.flowDeltaPercent[1]).toBeCloseTo(10, 12);
		const [taxi] = phaseDifferences([leaned, rich]);
		expect(taxi.timeS).toEqual([null, null]);
	});
});
