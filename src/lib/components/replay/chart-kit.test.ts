import { describe, expect, it } from 'vitest';
import { referenceLabelLayout } from './chart-kit';

const plot = { x: 50, y: 10, w: 600, h: 200 };
const text = { w: 140, h: 14 };

describe('reference-line labels', () => {
	it('never lets a line cross its own label, wherever the line is', () => {
		for (const right of [false, true]) {
			for (let y = plot.y; y <= plot.y + plot.h; y += 0.5) {
				const { plate, segments } = referenceLabelLayout(plot, y, text, right, 4);
				// The plate holds the words with room around them and stays inside the plot.
				expect(plate.w).toBeGreaterThanOrEqual(text.w);
				expect(plate.h).toBeGreaterThanOrEqual(text.h);
				expect(plate.x).toBeGreaterThanOrEqual(plot.x);
				expect(plate.x + plate.w).toBeLessThanOrEqual(plot.x + plot.w);
				expect(plate.y).toBeGreaterThanOrEqual(plot.y);
				expect(plate.y + plate.h).toBeLessThanOrEqual(plot.y + plot.h);
				// No piece of the line enters the plate's columns, so none crosses it at any height.
				for (const [a, b] of segments) {
					expect(b).toBeGreaterThan(a);
					expect(b <= plate.x || a >= plate.x + plate.w).toBe(true);
				}
			}
		}
	});

	it('still draws the rest of the line, on both sides of a label away from the edge', () => {
		const { plate, segments } = referenceLabelLayout(plot, 100, text, false, 4);
		const drawn = segments.reduce((s, [a, b]) => s + (b - a), 0);
		// Only the plate and its gaps are left out: at most the plate, a gap either side and its inset.
		expect(drawn).toBeGreaterThanOrEqual(plot.w - plate.w - 3 * 4);
		expect(drawn).toBeLessThan(plot.w - plate.w);
		expect(segments.at(-1)![1]).toBe(plot.x + plot.w);
	});

	it('centres the label on the line when there is room', () => {
		const { plate } = referenceLabelLayout(plot, 100, text, true, 4);
		expect(plate.y + plate.h / 2).toBeCloseTo(100, 9);
		expect(plate.x + plate.w).toBe(plot.x + plot.w - 4);
	});
});
