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
 * spikes and dips survive. NaN becomes null (a break in the line), and a break inside a bucket
 * survives the reduction: the bucket is split there, so a gap is never drawn as a line. (A sample
 * where any series is blank splits the bucket for all of them; the charts pass one series each.)
 * With fewer samples than two per bucket the samples are returned as they are.
 */
export function downsampleMinMax(t: ArrayLike<number>, series: readonly ArrayLike<number>[], i0: number, i1: number, buckets: number): Downsampled {
	const count = i1 - i0 + 1;
	const x: number[] = [];
	const ys: (number | null)[][] = series.map(() => []);
	if (count <= 0) return { x, ys };
	const clean = (v: number) => (v === v && v !== Infinity && v !== -Infinity ? v : null);
	const point = (k: number) => {
		x.push(t[k]);
		for (let s = 0; s < series.length; s++) ys[s].push(clean(series[s][k]));
	};
	if (count <= buckets * 2 || buckets < 1) {
		for (let i = i0; i <= i1; i++) point(i);
		return { x, ys };
	}
	const isBreak = (k: number) => {
		for (let s = 0; s < series.length; s++) {
			const v = series[s][k];
			if (v !== v || v === Infinity || v === -Infinity) return true;
		}
		return false;
	};
	const minMax = (first: number, last: number) => {
		x.push(t[first], t[last]);
		for (let s = 0; s < series.length; s++) {
			const a = series[s];
			let lo = Infinity;
			let hi = -Infinity;
			let loAt = -1;
			let hiAt = -1;
			for (let k = first; k <= last; k++) {
				const v = a[k];
				if (v < lo) {
					lo = v;
					loAt = k;
				}
				if (v > hi) {
					hi = v;
					hiAt = k;
				}
			}
			if (loAt <= hiAt) ys[s].push(lo, hi);
			else ys[s].push(hi, lo);
		}
	};
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
			point(first);
			continue;
		}
		// Runs of drawable samples, each reduced to its minimum and maximum, and the breaks
		// between them kept as nulls at their first and last time.
		let k = first;
		while (k <= last) {
			const r0 = k;
			const blank = isBreak(k);
			while (k + 1 <= last && isBreak(k + 1) === blank) k++;
			const r1 = k++;
			if (blank) {
				point(r0);
				if (r1 > r0) point(r1);
			} else if (r1 === r0) point(r0);
			else minMax(r0, r1);
		}
	}
	return { x, ys };
}

/** The samples either side of a stretch without readings (the engine's DataGap has these). */
export interface GapSpan {
	startIndex: number;
	endIndex: number;
}

/** A fuel event as applied by the engine: its own time, the sample it was applied at, and the fuel either side. */
export interface StepEvent {
	t: number;
	/** -1 while no sample at or after its time exists. */
	index: number;
	beforeL: number;
	afterL: number;
}

export interface PlotSeries {
	/** Non-decreasing times; a step repeats its time. */
	x: Float64Array;
	/** NaN is a break in the line (null for uPlot). */
	y: Float64Array;
}

/**
 * Where a fuel event is drawn: at its own time, kept between the sample before the one it was
 * applied at and that sample (the engine applies it at the first sample at or after its time, so
 * an event before the first sample is drawn at the first sample). NaN while not applied.
 */
export function eventTime(t: ArrayLike<number>, e: Pick<StepEvent, 't' | 'index'>): number {
	if (e.index < 0 || e.index >= t.length) return NaN;
	const hi = t[e.index];
	const lo = e.index > 0 ? t[e.index - 1] : hi;
	return Math.min(hi, Math.max(lo, e.t));
}

/**
 * One chart series as drawn, from one value per sample:
 * - across a gap (no samples for a while, or samples with blank readings) the line is broken, never
 *   a ramp between the readings either side: the samples inside the gap are left out and a break
 *   follows the last sample before it;
 * - at each fuel event a vertical step at the event's own time. Between two ordinary samples the
 *   fuel before and after the step is shifted by the burn still to come before the next sample
 *   (the engine charges that whole segment before applying the event), so the line keeps its
 *   slope; inside a gap the step shows the engine's figures as they are, and the line runs flat
 *   from it to the next sample (which holds the same fuel).
 */
export function plotSeries(t: ArrayLike<number>, y: ArrayLike<number>, n: number, gaps: readonly GapSpan[] = [], events: readonly StepEvent[] = []): PlotSeries {
	const hidden = new Uint8Array(n);
	const breakAfter = new Uint8Array(n);
	for (const g of gaps) {
		if (g.startIndex < 0 || g.endIndex >= n || g.endIndex <= g.startIndex) continue;
		breakAfter[g.startIndex] = 1;
		for (let k = g.startIndex + 1; k < g.endIndex; k++) hidden[k] = 1;
	}
	const applied = events.filter((e) => e.index >= 0 && e.index < n).sort((a, b) => a.index - b.index || a.t - b.t);
	const cap = n + 2 * applied.length + gaps.length + 1;
	const x = new Float64Array(cap);
	const v = new Float64Array(cap);
	let m = 0;
	const push = (px: number, py: number) => {
		// The same point twice draws nothing new; two breaks in a row are one.
		if (m > 0 && x[m - 1] === px && (v[m - 1] === py || (py !== py && v[m - 1] !== v[m - 1]))) return;
		if (py !== py && m > 0 && v[m - 1] !== v[m - 1]) return;
		x[m] = px;
		v[m] = py;
		m++;
	};
	let e = 0;
	for (let i = 0; i < n; i++) {
		if (e < applied.length && applied[e].index === i) {
			const first = applied[e];
			// An ordinary segment from the previous drawn sample: the burn between it and this one.
			const ordinary = i > 0 && !hidden[i - 1] && !breakAfter[i - 1] && !hidden[i];
			const burn = ordinary ? y[i - 1] - first.beforeL : 0;
			const t0 = i > 0 ? t[i - 1] : t[i];
			const dt = t[i] - t0;
			for (; e < applied.length && applied[e].index === i; e++) {
				const ev = applied[e];
				const at = eventTime(t, ev);
				const toCome = ordinary && dt > 0 ? burn * (1 - (at - t0) / dt) : 0;
				push(at, ev.beforeL + toCome);
				push(at, ev.afterL + toCome);
			}
		}
		if (hidden[i]) {
			push(t[i], NaN);
			continue;
		}
		push(t[i], y[i]);
		if (breakAfter[i]) push(t[i], NaN);
	}
	return { x: x.subarray(0, m), y: v.subarray(0, m) };
}
