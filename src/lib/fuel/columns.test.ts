import { describe, expect, it } from 'vitest';
import { ColumnBuilder } from './columns';
import { WPT_NONE } from './types';

describe('ColumnBuilder', () => {
	it('turns rows into columns: ms to seconds, null to NaN, waypoint names to ids by first appearance', () => {
		const b = new ColumnBuilder(2);
		b.push(7, 1_747_213_200_123, 30.5, 100, 12.5, null, 'MARSH');
		b.push(8, 1_747_213_201_124, null, null, null, 4500, '');
		b.push(9, 1_747_213_202_125, 31, 101, 12.4, 4510, 'TALLY');
		b.push(10, 1_747_213_203_126, 31, 101, 12.3, null, 'MARSH');
		const c = b.columns();
		// The same double Date.getTime() / 1000 gives, so server and browser agree.
		expect(Array.from(c.t)).toEqual([1_747_213_200_123, 1_747_213_201_124, 1_747_213_202_125, 1_747_213_203_126].map((ms) => new Date(ms).getTime() / 1000));
		expect(Array.from(c.flow)).toEqual([30.5, NaN, 31, 31]);
		expect(Array.from(c.gs)).toEqual([100, NaN, 101, 101]);
		expect(Array.from(c.alt!)).toEqual([NaN, 4500, 4510, NaN]);
		expect(Array.from(c.wpt!)).toEqual([0, WPT_NONE, 1, 0]);
		expect(Array.from(b.seq())).toEqual([7, 8, 9, 10]);
		expect(b.waypoints()).toEqual(['MARSH', 'TALLY']);
		expect(b.length).toBe(4);
	});

	it('leaves out altitude and waypoints when no row had one', () => {
		const b = new ColumnBuilder();
		b.push(0, 1000, 1, 2, 3, null, null);
		b.push(1, 2000, 1, 2, 3, null, '');
		const c = b.columns();
		expect(c.alt).toBeUndefined();
		expect(c.wpt).toBeUndefined();
		expect(b.hasAlt).toBe(false);
		expect(b.hasWpt).toBe(false);
		expect(c.lat).toBeUndefined();
		expect(c.lon).toBeUndefined();
		expect(b.hasPos).toBe(false);
	});

	it('keeps positions only as pairs: a row with one coordinate has none', () => {
		const b = new ColumnBuilder(1);
		b.push(0, 0, 1, 1, 1, null, null, 47.2, -31.4);
		b.push(1, 1000, 1, 1, 1, null, null, 47.21, null);
		b.push(2, 2000, 1, 1, 1, null, null, null, null);
		b.push(3, 3000, 1, 1, 1, null, null, 47.23, -31.38);
		const c = b.columns();
		expect(b.hasPos).toBe(true);
		expect(Array.from(c.lat!)).toEqual([47.2, NaN, NaN, 47.23]);
		expect(Array.from(c.lon!)).toEqual([-31.4, NaN, NaN, -31.38]);
	});

	it('has no position columns when rows only ever carried half a position', () => {
		const b = new ColumnBuilder();
		b.push(0, 0, 1, 1, 1, null, null, 47.2, null);
		b.push(1, 1000, 1, 1, 1, null, null, null, -31.4);
		expect(b.hasPos).toBe(false);
		expect(b.columns().lat).toBeUndefined();
	});

	it('grows past its first capacity and keeps every row', () => {
		const b = new ColumnBuilder(1);
		for (let i = 0; i < 5000; i++) b.push(i, i * 1000, i, null, null, i % 2 ? i : null, `W${i % 3}`);
		const c = b.columns();
		expect(c.t.length).toBe(5000);
		expect(c.t[4999]).toBe(4999);
		expect(c.flow[1234]).toBe(1234);
		expect(c.alt![1235]).toBe(1235);
		expect(Number.isNaN(c.alt![1234])).toBe(true);
		expect(b.seq()[4999]).toBe(4999);
	});

	it('continues the waypoint numbering of a shared map across builders, as the live paths read run after run', () => {
		const ids = new Map<string, number>();
		const first = new ColumnBuilder(4, ids);
		first.push(0, 0, 1, 1, 1, null, 'B');
		first.push(1, 1000, 1, 1, 1, null, 'A');
		const second = new ColumnBuilder(4, ids);
		second.push(2, 2000, 1, 1, 1, null, 'A');
		second.push(3, 3000, 1, 1, 1, null, 'C');
		expect(Array.from(first.columns().wpt!)).toEqual([0, 1]);
		expect(Array.from(second.columns().wpt!)).toEqual([1, 2]);
		expect(second.waypoints()).toEqual(['B', 'A', 'C']);
	});
});
