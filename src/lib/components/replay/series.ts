// Array helpers behind the replay components: finding the sample at a time, runs of one phase,
// and min/max-per-pixel-column downsampling so a 10-hour 1 Hz flight draws a few thousand points
// while the figures keep reading the full-resolution arrays.

/** Index of the last sample at or before `time` (0 when `time` is before the first). */
export function indexAtOrBefore(t: ArrayLike<number>, time: number, n = t.length): number {
	if (n === 0) return -1;
	if (!(time >= t[0])) return 0;
	let lo = 0;
	let hi = n - 1;
	while (lo < hi) {
		const mid = (lo + hi + 1) >> 1;
		if (t[mid] <= time) lo = mid;
		else hi = mid - 1;
	}
	return lo;
}

/** Index of the sample closest in time to `time`. */
export function nearestIndex(t: ArrayLike<number>, time: number, n = t.length): number {
	const i = indexAtOrBefore(t, time, n);
	if (i < 0 || i >= n - 1) return i;
	return time - t[i] <= t[i + 1] - time ? i : i + 1;
}

export interface Run {
	value: number;
	start: number;
	end: number;
	startIndex: number;
	endIndex: number;
}

/** Consecutive samples with the same value of `codes` (e.g. the phase), as time spans. */
export function runsOf(codes: ArrayLike<number>, t: ArrayLike<number>, n = Math.min(codes.length, t.length)): Run[] {
	const runs: Run[] = [];
	let start = 0;
	for (let i = 1; i <= n; i++) {
		if (i === n || codes[i] !== codes[start]) {
			// A run lasts until the next one starts, so shaded spans leave no slivers between them.
			runs.push({ value: codes[start], start: t[start], end: t[Math.min(i, n - 1)], startIndex: start, endIndex: i - 1 });
			start = i;
		}
	}
	return runs;
}

export interface Downsampled {
	x: number[];
	ys: (number | null)[][];
}

/**
 * Reduces samples [i0, i1] to at most two points per bucket (pixel column): the first and last
 * time in the bucket, carrying each series' minimum and maximum in the order they occurred, so
 * spikes and dips survive. NaN becomes null (a break in the line). With fewer samples than two
 * per bucket the samples are returned as they are.
 */
export function downsampleMinMax(t: ArrayLike<number>, series: readonly ArrayLike<number>[], i0: number, i1: number, buckets: number): Downsampled {
	const count = i1 - i0 + 1;
	const x: number[] = [];
	const ys: (number | null)[][] = series.map(() => []);
	if (count <= 0) return { x, ys };
	const clean = (v: number) => (v === v && v !== Infinity && v !== -Infinity ? v : null);
	if (count <= buckets * 2 || buckets < 1) {
		for (let i = i0; i <= i1; i++) {
			x.push(t[i]);
			for (let s = 0; s < series.length; s++) ys[s].push(clean(series[s][i]));
		}
		return { x, ys };
	}
	const tStart = t[i0];
	const span = t[i1] - tStart || 1;
	let i = i0;
	for (let b = 0; b < buckets && i <= i1; b++) {
		const edge = b === buckets - 1 ? Infinity : tStart + (span * (b + 1)) / buckets;
		const first = i;
		while (i <= i1 && t[i] < edge) i++;
		const last = i - 1;
		if (last < first) continue;
		if (last === first) {
			x.push(t[first]);
			for (let s = 0; s < series.length; s++) ys[s].push(clean(series[s][first]));
			continue;
		}
		x.push(t[first], t[last]);
		for (let s = 0; s < series.length; s++) {
			const a = series[s];
			let lo = Infinity;
			let hi = -Infinity;
			let loAt = -1;
			let hiAt = -1;
			for (let k = first; k <= last; k++) {
				const v = a[k];
				if (v !== v || v === Infinity || v === -Infinity) continue;
				if (v < lo) {
					lo = v;
					loAt = k;
				}
				if (v > hi) {
					hi = v;
					hiAt = k;
				}
			}
			if (loAt < 0) ys[s].push(null, null);
			else if (loAt <= hiAt) ys[s].push(lo, hi);
			else ys[s].push(hi, lo);
		}
	}
	return { x, ys };
}
