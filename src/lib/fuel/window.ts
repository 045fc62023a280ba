// The largest value over a trailing time window, sample by sample (a monotonic queue): "the
// margin held for at least P seconds". The summary's thinnest airborne margin is the minimum of
// this over the flight, so a few seconds' projection (a take-off roll, a gust) never sets it.

export interface TrailingMax {
	spanS: number;
	t: Float64Array;
	v: Float64Array;
	head: number;
	tail: number;
	/** First sample time of the current unbroken run of values; NaN after a reset. */
	runStart: number;
}

export function createTrailingMax(spanS: number, capacity = 256): TrailingMax {
	return { spanS, t: new Float64Array(capacity), v: new Float64Array(capacity), head: 0, tail: 0, runStart: NaN };
}

/** Forget the run: the next value starts a new one (figures went away, or the aircraft landed). */
export function resetTrailingMax(w: TrailingMax): void {
	w.head = 0;
	w.tail = 0;
	w.runStart = NaN;
}

/**
 * Adds a sample; returns the largest value among the samples of the last spanS seconds once the
 * run covers spanS seconds, else NaN. Amortised O(1); allocates only when the queue must grow.
 */
export function pushTrailingMax(w: TrailingMax, t: number, v: number): number {
	if (w.runStart !== w.runStart) w.runStart = t;
	let tail = w.tail;
	while (tail > w.head && w.v[tail - 1] <= v) tail--;
	if (tail === w.t.length) {
		if (w.head > 0) {
			w.t.copyWithin(0, w.head, tail);
			w.v.copyWithin(0, w.head, tail);
			tail -= w.head;
			w.head = 0;
		} else {
			const nt = new Float64Array(w.t.length * 2);
			const nv = new Float64Array(w.v.length * 2);
			nt.set(w.t);
			nv.set(w.v);
			w.t = nt;
			w.v = nv;
		}
	}
	w.t[tail] = t;
	w.v[tail] = v;
	w.tail = tail + 1;
	const from = t - w.spanS;
	while (w.t[w.head] < from) w.head++;
	return w.runStart <= from ? w.v[w.head] : NaN;
}
