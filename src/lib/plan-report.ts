// A stored plan against a computed flight: the plan worked out, the waypoint passages, and the
// per-leg comparison. Shared by the replay page (in the browser, so a draft correction shows at
// once) and the debrief, its print layout and its shared link (on the server).
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

export function planReport(plan: FuelPlanWire, computation: FlightComputation, columns: SampleColumns, waypoints: readonly string[]): PlanReport {
	const worked = workedPlanOf(plan);
	const passages = findPassages(columns, waypoints);
	const comparison = comparePlan(
		worked,
		passages,
		{ t: columns.t, gs: columns.gs, used: computation.used, onBoard: computation.onBoard, airborneGsKt: DEFAULT_OPTIONS.airborneGsKt },
		plan.tolerancePercent
	);
	return { worked, passages, comparison };
}
