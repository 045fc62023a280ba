import { describe, expect, it } from 'vitest';
import { createTrailingMax, pushTrailingMax, resetTrailingMax } from './window';

describe('trailing maximum', () => {
	it('is the largest value of the last span once the run covers it, as a brute force says', () => {
		let seed = 3;
		const rand = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
		const w = createTrailingMax(10, 2);
		const ts: number[] = [];
		const vs: number[] = [];
		let t = 0;
		for (let k = 0; k < 2000; k++) {
			t += 0.5 + rand() * 2;
			const v = rand() * 100 - 50;
			ts.push(t);
			vs.push(v);
			const got = pushTrailingMax(w, t, v);
			if (t - ts[0] < 10) expect(got).toBeNaN();
			else {
				let max = -Infinity;
				for (let j = 0; j < ts.length; j++) if (ts[j] >= t - 10) max = Math.max(max, vs[j]);
				expect(got).toBe(max);
			}
		}
	});

	it('starts a new run after a reset', () => {
		const w = createTrailingMax(5);
		for (let t = 0; t <= 10; t++) pushTrailingMax(w, t, 1);
		resetTrailingMax(w);
		expect(pushTrailingMax(w, 11, -3)).toBeNaN();
		for (let t = 12; t < 16; t++) expect(pushTrailingMax(w, t, -3)).toBeNaN();
		expect(pushTrailingMax(w, 16, -4)).toBe(-3);
	});
});
