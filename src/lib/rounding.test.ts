import { describe, expect, it } from 'vitest';
import { clean, round } from './rounding';
import { formatDuration, num as fixed, signedNum } from './format';

const signedDown = (x: number) => signedNum(x, 0, 'down');

describe('display rounding', () => {
	it('shows an exact boundary as itself, whatever the float noise', () => {
		// Issue: an exact 180 min showed as 179 min (truncation of 179.99999…).
		expect(fixed(180, 0)).toBe('180');
		expect(fixed(179.9999999, 0)).toBe('180');
		expect(fixed(179.9999999, 0, 'down')).toBe('180');
		expect(fixed(3 * 60 - 1e-12, 0, 'down')).toBe('180');
		expect(formatDuration(3 - 1e-12, { round: 'down' })).toBe('3:00');
		expect(formatDuration(179.9999999 / 60, { round: 'down' })).toBe('3:00');
		expect(formatDuration(3)).toBe('3:00');
		expect(clean(0.1 + 0.2)).toBe(0.3);
	});

	it('rounds to nearest with halves away from zero', () => {
		expect(fixed(1.005, 2)).toBe('1.01');
		expect(fixed(-2.5, 0)).toBe('-3');
		expect(fixed(2.449, 1)).toBe('2.4');
	});

	it('rounds margins down, never showing more than exists', () => {
		expect(fixed(179.6, 0, 'down')).toBe('179');
		expect(round(-6.8, 0, 'down')).toBe(-7);
		expect(signedDown(-6.8)).toBe('−7');
		expect(signedDown(19.99)).toBe('+19');
		expect(signedDown(0.4)).toBe('0');
		expect(signedDown(NaN)).toBe('—');
	});
});
