import { describe, expect, it } from 'vitest';
import { learnBaseline, type BaselineFlight, type PhaseFigures } from './baseline';
import { DEFAULT_HIGH_BURN_PERCENT, findHighBurn } from './high-burn';
import { LITRES_PER_US_GALLON } from '../units';

const phases = (p: { taxi?: [number, number]; climb?: [number, number]; cruise?: [number, number]; descent?: [number, number] }): PhaseFigures[] =>
	(Object.entries(p) as [PhaseFigures['phase'], [number, number]][]).map(([phase, [timeS, flow]]) => ({ phase, timeS, fuelL: (flow * timeS) / 3600, averageFlowLph: flow }));

const usualFlight = (id: string, scatter = 0): BaselineFlight => ({
	id,
	phases: phases({ taxi: [600, 9], climb: [600, 40 * (1 + scatter)], cruise: [3600, 31 * (1 + scatter)], descent: [600, 18 * (1 + scatter)] }),
	fuelPerEngineHourLph: 28
});
const baseline = learnBaseline([-0.02, -0.01, 0, 0.01, 0.02].map((s, k) => usualFlight(`f${k}`, s)));

describe('findHighBurn', () => {
	it('quantifies the extra fuel of a phase over usual: flow over usual × time in the phase', () => {
		// 2.4 US gal/h over usual for 1 h 45 min is 2.4 × 1.75 = 4.2 US gal (by definition of a flow).
		const usualUsgph = 31 / LITRES_PER_US_GALLON;
		const flowL = (usualUsgph + 2.4) * LITRES_PER_US_GALLON;
		const r = findHighBurn(phases({ cruise: [105 * 60, flowL] }), baseline);
		const cruise = r.phases.find((p) => p.phase === 'cruise')!;
		expect(cruise.overLph / LITRES_PER_US_GALLON).toBeCloseTo(2.4, 9);
		expect(cruise.extraL / LITRES_PER_US_GALLON).toBeCloseTo(4.2, 9);
		expect(r.marked).toBe(true);
		expect(r.extraL).toBeCloseTo(cruise.extraL, 12);
	});

	it('marks an unleaned cruise and not a leaned one (plausibility: leaning saves about 10 %, FAA AC 61-23C)', () => {
		// Leaned cruise = about 0.9 × full-rich cruise, so full rich is about 1 ÷ 0.9 = 111 % of the
		// leaned baseline: over our default threshold. A leaned flight within ±3 % is not marked.
		const rich = findHighBurn(phases({ taxi: [600, 9], climb: [600, 40], cruise: [3600, 31 / 0.9], descent: [600, 18] }), baseline, { leaningMoments: 0 });
		const cruise = rich.phases.find((p) => p.phase === 'cruise')!;
		expect(cruise.overPercent).toBeGreaterThan(DEFAULT_HIGH_BURN_PERCENT);
		expect(cruise.overPercent).toBeLessThan(15);
		expect(rich.marked).toBe(true);
		expect(rich.causes).toEqual(['mixtureNotLeaned']);
		for (const s of [-0.03, 0.03]) expect(findHighBurn(usualFlight('x', s).phases, baseline).marked).toBe(false);
		// A cruise over usual in which a leaning moment was found is not put down to the mixture.
		expect(findHighBurn(phases({ cruise: [3600, 31 / 0.9] }), baseline, { leaningMoments: 1 }).causes).not.toContain('mixtureNotLeaned');
	});

	it('puts every phase shifted by the same factor down to the sensor, not the pilot', () => {
		const r = findHighBurn(phases({ taxi: [600, 9 * 1.15], climb: [600, 40 * 1.15], cruise: [3600, 31 * 1.15], descent: [600, 18 * 1.15] }), baseline);
		expect(r.marked).toBe(true);
		expect(r.causes).toEqual(['sensorCalibration']);
	});

	it('names a long full-power climb and long ground running', () => {
		const r = findHighBurn(phases({ taxi: [1500, 9], climb: [1200, 48], cruise: [3600, 31], descent: [600, 18] }), baseline);
		expect(r.causes).toEqual(['longClimbFullPower', 'longGroundRunning']);
		expect(r.phases.find((p) => p.phase === 'climb')!.marked).toBe(true);
	});

	it('names computed fuel persistently below fuel pumped', () => {
		expect(findHighBurn(usualFlight('x').phases, baseline, { pumpedOverComputed: 1.08 }).causes).toContain('belowPumped');
		expect(findHighBurn(usualFlight('x').phases, baseline, { pumpedOverComputed: 1.02 }).causes).not.toContain('belowPumped');
	});

	it('follows a threshold set for the aircraft', () => {
		const f = phases({ cruise: [3600, 31 * 1.06] });
		expect(findHighBurn(f, baseline).marked).toBe(false);
		expect(findHighBurn(f, baseline, { thresholdPercent: 5 }).marked).toBe(true);
	});
});
