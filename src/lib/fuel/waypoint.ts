// Figures towards the next waypoint at one sample: time and fuel to get there, and specific
// range; endurance and minutes of fuel at a flow. Below a minimum ground speed there are no figures (NaN), never
// the Infinity a plain division would give.

/** Hours to the waypoint, NaN when ground speed is below minGsKt or the distance is unknown. */
export function timeToWaypointH(dtgNm: number, gsKt: number, minGsKt: number): number {
	return gsKt >= minGsKt && gsKt > 0 && dtgNm >= 0 ? dtgNm / gsKt : NaN;
}

/** Litres needed to reach the waypoint at the current flow (FAA-H-8083-25: fuel = flow × time). */
export function fuelToWaypointL(flowLph: number, hours: number): number {
	return flowLph * hours;
}

/**
 * Minutes an amount of fuel lasts at a flow; NaN with the engine stopped. Margins against the
 * reserve are given at normal-cruise flow (FlightComputation.arrivalMarginMin); this is for
 * figures labelled "at the present flow".
 */
export function minutesAtFlow(litres: number, flowLph: number, minFlowLph: number): number {
	return flowLph > minFlowLph ? (litres / flowLph) * 60 : NaN;
}

/** Hours of fuel left at the current flow; NaN with the engine stopped. */
export function enduranceH(onBoardL: number, flowLph: number, minFlowLph: number): number {
	return flowLph > minFlowLph ? onBoardL / flowLph : NaN;
}

/** Ground distance per litre, NM/L; NaN on the ground or with the engine stopped. */
export function specificRangeNmPerL(
	gsKt: number,
	flowLph: number,
	minGsKt: number,
	minFlowLph: number
): number {
	return gsKt >= minGsKt && flowLph > minFlowLph ? gsKt / flowLph : NaN;
}
