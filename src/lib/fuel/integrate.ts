// Fuel used between two samples: the trapezoid rule on flow, or the higher of the two flows
// across a recorder dropout (assume the worse case when nothing was recorded).

/**
 * Litres burnt over dtS seconds between flows fa and fb (L/h). A missing flow (NaN) on one side
 * takes the other side's value; with neither known nothing is counted.
 */
export function segmentLitres(fa: number, fb: number, dtS: number, gap: boolean): number {
	if (fa !== fa) fa = fb;
	if (fb !== fb) fb = fa;
	if (fa !== fa) return 0;
	return gap ? ((fa > fb ? fa : fb) * dtS) / 3600 : ((fa + fb) * dtS) / 7200;
}

/** The flow assumed across a dropout: the higher adjacent flow, 0 when neither is known. */
export function gapFillFlow(fa: number, fb: number): number {
	if (fa !== fa) return fb === fb ? fb : 0;
	if (fb !== fb) return fa;
	return fa > fb ? fa : fb;
}
