import fc from 'fast-check';
import { xyIntegration } from 'ml-spectra-processing';
import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { gapFillFlow, segmentLitres } from './integrate';
import { columns, input, profile, series, T0 } from './test-fixtures';

// The gap detector would treat long irregular steps as dropouts; these tests are about the
// integral alone, so it is switched off.
const noGaps = { gapThresholdS: Infinity };

/**
 * Epoch seconds in a Float64 resolve about 0.24 µs, so a fractional offset like 8.5 s is stored
 * slightly off. Closed forms are evaluated at the offsets the engine actually sees.
 */
const seen = (offsetS: number): number => T0 + offsetS - T0;

describe('segmentLitres', () => {
	it('is the trapezoid between two flows', () => {
		expect(segmentLitres(20, 40, 3600, false)).toBe(30);
		expect(segmentLitres(30, 30, 1800, false)).toBe(15);
	});
	it('takes the higher flow across a dropout', () => {
		expect(segmentLitres(20, 40, 3600, true)).toBe(40);
		expect(gapFillFlow(55, 12)).toBe(55);
	});
	it('uses the known side when one flow is missing, nothing when both are', () => {
		expect(segmentLitres(NaN, 36, 100, false)).toBe(1);
		expect(segmentLitres(36, NaN, 100, false)).toBe(1);
		expect(segmentLitres(NaN, NaN, 100, false)).toBe(0);
		expect(gapFillFlow(NaN, NaN)).toBe(0);
	});
});

describe('fuel used: closed-form integrals', () => {
	it('constant flow: 40 L/h for 2 h is 80 L', () => {
		const c = computeFlight(input(columns(series(7201, () => ({ flow: 40 })))));
		expect(c.used[7200]).toBeCloseTo(80, 9);
		expect(c.used[3600]).toBeCloseTo(40, 9);
		expect(c.onBoard[7200]).toBeCloseTo(150 - 80, 9);
	});

	it('applies the meter factor: 40 L/h indicated with factor 1.05 is 84 L in 2 h', () => {
		const c = computeFlight(input(columns(series(7201, () => ({ flow: 40 }))), { profile: profile({ meterFactor: 1.05 }) }));
		expect(c.used[7200]).toBeCloseTo(84, 9);
		expect(c.flow[0]).toBeCloseTo(42, 12);
	});

	it('linear ramp 0 → 60 L/h over an hour is 30 L, at irregular sampling', () => {
		// ∫₀^T (60 t/T) dt = 30 T with T = 1 h; the trapezoid rule is exact on a straight line.
		const times = [0, 1, 7, 8.5, 100, 101.25, 1000, 2222, 3000, 3599.9, 3600].map(seen);
		const c = computeFlight(
			input(columns(times.map((s) => ({ t: T0 + s, flow: (60 * s) / 3600 }))), { options: noGaps })
		);
		expect(c.used[times.length - 1]).toBeCloseTo(30, 10);
		// And at every sample: 30 (s/3600)² L.
		times.forEach((s, i) => expect(c.used[i]).toBeCloseTo(30 * (s / 3600) ** 2, 10));
	});

	it('piecewise-linear flow sampled at irregular intervals integrates exactly', () => {
		// Breakpoints (s, L/h); between them flow is a straight line a + b·s.
		const knots: [number, number][] = [
			[0, 0],
			[300, 18],
			[420, 60],
			[1500, 52],
			[1560, 32],
			[6000, 30],
			[6900, 16],
			[7200, 0]
		];
		const flowAt = (s: number): number => {
			for (let k = 1; k < knots.length; k++) {
				const [s0, f0] = knots[k - 1];
				const [s1, f1] = knots[k];
				if (s <= s1) return f0 + ((f1 - f0) * (s - s0)) / (s1 - s0);
			}
			return 0;
		};
		// Closed form per piece: ∫ (a + b s) ds = a Δs + b (s1² − s0²)/2, in L·s/h.
		const closedForm = (upTo: number): number => {
			let total = 0;
			for (let k = 1; k < knots.length; k++) {
				const [s0, f0] = knots[k - 1];
				const [s1, f1] = knots[k];
				const end = Math.min(s1, upTo);
				if (end <= s0) break;
				const b = (f1 - f0) / (s1 - s0);
				const a = f0 - b * s0;
				total += a * (end - s0) + (b * (end * end - s0 * s0)) / 2;
			}
			return total / 3600;
		};
		// Irregular sampling that includes every breakpoint.
		let seed = 7;
		const rand = (): number => ((seed = (seed * 16807) % 2147483647) / 2147483647);
		const stamps = new Set(knots.map(([s]) => s));
		for (let s = 0; s < 7200; s += 0.5 + rand() * 30) stamps.add(seen(s));
		const sorted = [...stamps].sort((x, y) => x - y);
		const c = computeFlight(input(columns(sorted.map((s) => ({ t: T0 + s, flow: flowAt(s) }))), { options: noGaps }));
		sorted.forEach((s, i) => expect(c.used[i]).toBeCloseTo(closedForm(s), 9));
		expect(c.used[sorted.length - 1]).toBeCloseTo(closedForm(7200), 9);
	});
});

describe('fuel used against a reference trapezoid', () => {
	it('equals ml-spectra-processing xyIntegration on random data', () => {
		// Reference: npm ml-spectra-processing xyIntegration (DOMAIN.md: x=y=[0,1,2,3] → 4.5).
		expect(xyIntegration({ x: [0, 1, 2, 3], y: [0, 1, 2, 3] })).toBe(4.5);
		fc.assert(
			fc.property(
				fc.array(
					fc.tuple(
						fc.double({ min: 0.01, max: 600, noNaN: true }),
						fc.double({ min: 0, max: 200, noNaN: true })
					),
					{ minLength: 2, maxLength: 300 }
				),
				(steps) => {
					// Both sides get the same epoch times, so both see the same intervals.
					const x: number[] = [];
					const y: number[] = [];
					let s = T0;
					for (const [dt, f] of steps) {
						s += dt;
						x.push(s);
						y.push(f);
					}
					const c = computeFlight(input(columns(x.map((t, i) => ({ t, flow: y[i] }))), { options: noGaps }));
					const reference = xyIntegration({ x, y }) / 3600;
					const ours = c.used[x.length - 1];
					expect(Math.abs(ours - reference)).toBeLessThanOrEqual(1e-12 * Math.max(1, reference));
				}
			),
			{ numRuns: 200 }
		);
	});
});
