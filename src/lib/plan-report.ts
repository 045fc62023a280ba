// A stored plan against a computed flight: the plan worked out, the waypoint passages, and the
// per-leg comparison. Shared by the replay page (in the browser, so a draft correction shows at
// once), the live page (the legs passed so far), and the debrief, its print layout and its shared
// link (on the server).
import {
	comparePlan,
	DEFAULT_OPTIONS,
	findPassages,
	workPlan,
	type FlightComputation,
	type PlanComparison,
	type SampleColumns,
	type WaypointPassage,
	type WorkedPlan
} from '$lib/fuel';
import type { FuelPlanWire } from '$lib/wire/plan';

export interface PlanReport {
	worked: WorkedPlan;
	passages: WaypointPassage[];
	comparison: PlanComparison;
}

export function workedPlanOf(plan: FuelPlanWire): WorkedPlan {
	return workPlan({
		startOnBoardL: plan.startOnBoardL,
		taxiL: plan.taxiL,
		climbL: plan.climbL,
		reserve: { ruleId: plan.reserveRule, customMinutes: plan.reserveCustomMin ?? undefined },
		reserveFlowLph: plan.reserveFlowLph,
		legs: plan.legs
	});
}

/**
 * `inFlight`: the flight is still open, so the waypoint it reports now has not been passed yet
 * (its distance to go is still falling): that run's passage is left out until the id changes or
 * the flight closes. A replay and a live view of the same samples then agree on every leg passed.
 */
export function planReport(plan: FuelPlanWire, computation: FlightComputation, columns: SampleColumns, waypoints: readonly string[], o: { inFlight?: boolean } = {}): PlanReport {
	const worked = workedPlanOf(plan);
	const n = Math.min(computation.length, columns.t.length);
	const found = findPassages(columns, waypoints);
	const passages = o.inFlight ? found.filter((p) => p.runEnd < n - 1) : found;
	const comparison = comparePlan(
		worked,
		passages,
		{ t: columns.t, gs: columns.gs, used: computation.used, onBoard: computation.onBoard, airborneGsKt: DEFAULT_OPTIONS.airborneGsKt },
		plan.tolerancePercent
	);
	return { worked, passages, comparison };
}
