import { describe, expect, it } from 'vitest';
import { computeFlight } from './compute';
import { columns, input, profile, series, T0 } from './test-fixtures';
import { FLAG_EVENT, type FuelEvent } from './types';

// One hour at 36 L/h (0.01 L/s), sampled every 10 s: 361 samples, index k at T0 + 10k.
const hour = columns(series(361, () => ({ flow: 36 }), T0, 10));
const run = (events: FuelEvent[], declared = 100) =>
	computeFlight(input(hour, { declaration: { kind: 'onBoard', amountL: declared }, events }));

describe('fuel events', () => {
	it('adds and removes fuel from the sample at or after the event', () => {
		const c = run([
			{ t: T0 + 1200, kind: 'added', amountL: 30 },
			{ t: T0 + 2405, kind: 'removed', amountL: 10 }
		]);
		expect(c.onBoard[119]).toBeCloseTo(100 - 11.9, 9);
		expect(c.onBoard[120]).toBeCloseTo(100 - 12 + 30, 9);
		expect(c.flags[120] & FLAG_EVENT).toBe(FLAG_EVENT);
		// 2405 falls between samples 240 and 241: applied at 241.
		expect(c.events[1].index).toBe(241);
		expect(c.onBoard[241]).toBeCloseTo(100 - 24.1 + 30 - 10, 9);
		expect(c.events.map((e) => e.deltaL)).toEqual([30, -10]);
	});

	it('fills to full and to the lower level from the fuel then on board', () => {
		const full = run([{ t: T0 + 600, kind: 'toFull' }]);
		expect(full.onBoard[60]).toBe(150);
		expect(full.events[0].deltaL).toBeCloseTo(56, 9);
		const lower = run([{ t: T0 + 3000, kind: 'toLower' }]);
		expect(lower.onBoard[300]).toBe(100);
		expect(lower.events[0].deltaL).toBeCloseTo(30, 9);
	});

	it('never takes fuel out when filling to the lower level', () => {
		const c = run([
			{ t: T0 + 600, kind: 'toFull' },
			{ t: T0 + 3000, kind: 'toLower' }
		]);
		expect(c.onBoard[300]).toBeCloseTo(150 - 24, 9);
		expect(c.events[1].deltaL).toBe(0);
		expect(c.warnings.map((w) => w.code)).toEqual(['alreadyAboveLevel']);
	});

	it('keeps fuel used running across events, and resets it only on request', () => {
		const c = run([
			{ t: T0 + 1800, kind: 'toFull' },
			{ t: T0 + 2400, kind: 'resetUsed' }
		]);
		expect(c.used[200]).toBeCloseTo(20, 9);
		expect(c.used[240]).toBe(0);
		expect(c.events[1].usedBeforeL).toBeCloseTo(24, 9);
		expect(c.used[360]).toBeCloseTo(12, 9);
		expect(c.stats.usedTotalL).toBeCloseTo(36, 9);
		expect(c.onBoard[360]).toBeCloseTo(150 - 18, 9);
	});

	it('caps fuel added at capacity and fuel removed at zero, with warnings', () => {
		const c = run([
			{ t: T0 + 600, kind: 'added', amountL: 100 },
			{ t: T0 + 1200, kind: 'removed', amountL: 500 }
		]);
		expect(c.onBoard[60]).toBe(150);
		expect(c.onBoard[120]).toBe(0);
		expect(c.warnings.map((w) => w.code)).toEqual(['eventAboveCapacity', 'eventBelowZero', 'onBoardBelowZero']);
		expect(c.warnings[0].index).toBe(60);
	});

	it('applies same-time events in the order given, and early events at the first sample', () => {
		const c = run([
			{ t: T0 + 600, kind: 'removed', amountL: 10 },
			{ t: T0 - 3600, kind: 'added', amountL: 20 },
			{ t: T0 + 600, kind: 'toFull' }
		]);
		expect(c.events.map((e) => [e.event.kind, e.index])).toEqual([
			['added', 0],
			['removed', 60],
			['toFull', 60]
		]);
		expect(c.onBoard[0]).toBe(120);
		expect(c.onBoard[60]).toBe(150);
	});

	it('leaves events after the last sample pending, with a warning', () => {
		const c = run([{ t: T0 + 7200, kind: 'added', amountL: 20 }]);
		expect(c.events[0].index).toBe(-1);
		expect(c.events[0].deltaL).toBe(0);
		expect(c.warnings.map((w) => w.code)).toEqual(['eventAfterLastSample']);
	});

	it('drops invalid events with a warning', () => {
		const c = computeFlight(
			input(hour, {
				profile: profile({ lowerLevelL: null }),
				events: [
					{ t: NaN, kind: 'added', amountL: 5 },
					{ t: T0, kind: 'added', amountL: -5 },
					{ t: T0, kind: 'added' },
					{ t: T0, kind: 'spilled' as FuelEvent['kind'] },
					{ t: T0, kind: 'toLower' }
				]
			})
		);
		expect(c.events).toEqual([]);
		expect(c.warnings.map((w) => w.code)).toEqual(['eventInvalid', 'eventInvalid', 'eventInvalid', 'eventInvalid', 'noLowerLevel']);
		expect(c.warnings[1].message).toMatch(/Fuel event 2/);
	});
});
