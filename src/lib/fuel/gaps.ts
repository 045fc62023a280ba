// Decides when the time between two samples is a recorder dropout rather than the normal
// sampling interval: longer than max(floor, factor × median interval).

/**
 * The median is taken over the first MEDIAN_INTERVALS intervals only and then frozen, so a live
 * flight sees the same threshold at every sample as a replay of the whole file does.
 */
export const MEDIAN_INTERVALS = 31;
/** Defaults from the product brief: at least 10 s, or 5 × the usual interval. */
export const DEFAULT_GAP_FLOOR_S = 10;
export const DEFAULT_GAP_FACTOR = 5;

export interface GapTracker {
	floorS: number;
	factor: number;
	/** Set when the caller fixed the threshold. */
	fixedS: number | null;
	intervals: Float64Array;
	count: number;
	thresholdS: number;
}

export function createGapTracker(
	floorS = DEFAULT_GAP_FLOOR_S,
	factor = DEFAULT_GAP_FACTOR,
	fixedS: number | null = null
): GapTracker {
	return {
		floorS,
		factor,
		fixedS,
		intervals: new Float64Array(MEDIAN_INTERVALS),
		count: 0,
		thresholdS: fixedS ?? floorS
	};
}

/**
 * Threshold in force for an interval of dtS seconds. The interval itself counts towards the
 * median, so the first interval of a slow recorder is not taken for a gap.
 */
export function gapThresholdFor(g: GapTracker, dtS: number): number {
	if (g.fixedS !== null || g.count >= MEDIAN_INTERVALS) return g.thresholdS;
	const n = g.count;
	// Insertion into the sorted prefix keeps the median a single read.
	let j = n;
	while (j > 0 && g.intervals[j - 1] > dtS) {
		g.intervals[j] = g.intervals[j - 1];
		j--;
	}
	g.intervals[j] = dtS;
	g.count = n + 1;
	// Lower middle for an even count: deterministic and never larger than the true median.
	const median = g.intervals[(g.count - 1) >> 1];
	const t = g.factor * median;
	g.thresholdS = t > g.floorS ? t : g.floorS;
	return g.thresholdS;
}
