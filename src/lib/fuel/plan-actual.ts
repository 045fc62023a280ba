// Planned against actual, leg by leg: the plan's time, fuel used and fuel on board at each
// waypoint beside what the flight did, the difference in units and percent, and the legs whose
// fuel differs by more than a tolerance — the practical test's "fuel consumption that is
// different than planned" (FAA Private Pilot ACS, FAA-S-ACS-6, Cross-Country Flight Planning).

import type { WaypointPassage } from './passage';
import type { PlannedLeg, WorkedPlan } from './plan';

/** Our default tolerance on a leg's fuel, percent of the planned fuel (our choice, settable per plan). */
export const DEFAULT_TOLERANCE_PERCENT = 10;

export interface ActualInput {
	t: ArrayLike<number>;
	gs: ArrayLike<number>;
	/** The engine's fuel used and fuel on board per sample, litres. */
	used: ArrayLike<number>;
	onBoard: ArrayLike<number>;
	/** At or above this ground speed the aircraft is flying (the engine's airborne threshold). */
	airborneGsKt: number;
}

export interface LegComparison {
	planned: PlannedLeg;
	/** Planned fuel to compare with: the leg's, plus the taxi allowance on the first leg. */
	plannedFuelL: number;
	/** The passage matched to the leg's waypoint; null when the flight never reported it. */
	passage: WaypointPassage | null;
	/** Hours from the leg's take-off or the previous passage to this passage. */
	actualTimeH: number;
	/** Litres used on the leg (taxi included on the first leg, as the plan counts it). */
	actualFuelL: number;
	actualOnBoardL: number;
	timeDiffH: number;
	fuelDiffL: number;
	/** Percent of the planned fuel; NaN when nothing was planned. */
	fuelDiffPercent: number;
	onBoardDiffL: number;
	/** Actual on board minus the reserve at the waypoint; NaN when the reserve is unknown. */
	actualMarginL: number;
	/** |fuel difference| above the tolerance: fuel consumption different than planned. */
	offPlan: boolean;
}

export interface PlanComparison {
	legs: LegComparison[];
	tolerancePercent: number;
	/** Planned fuel on board placed on the flight's own clock, for a line over the actual chart. */
	plannedLine: { t: number[]; onBoardL: number[] };
	offPlanCount: number;
	flownCount: number;
}

export const OFF_PLAN_WORDS = 'Fuel consumption different than planned';

const pct = (diff: number, base: number) => (base > 0 ? (diff / base) * 100 : NaN);

/** The last take-off in [from, to]: the first sample at airborne speed after the last one below it. */
function takeOffIn(a: ActualInput, from: number, to: number): number {
	let start = from;
	for (let k = from; k <= to; k++) if (!(a.gs[k] >= a.airborneGsKt)) start = k + 1;
	return Math.min(start, to);
}

/**
 * Matches the plan's legs in order to the passages (a waypoint reported again later matches the
 * next leg to it), then compares. Legs never reached get NaN actual figures and are not marked.
 */
export function comparePlan(plan: WorkedPlan, passages: readonly WaypointPassage[], a: ActualInput, tolerancePercent = DEFAULT_TOLERANCE_PERCENT): PlanComparison {
	const reserveL = plan.reserve.amountL ?? NaN;
	const line = { t: [] as number[], onBoardL: [] as number[] };
	let cursor = 0;
	let prevIndex = 0;
	const legs = plan.legs.map((p, i): LegComparison => {
		const plannedFuelL = p.fuelL + (i === 0 ? plan.taxiL : 0);
		let passage: WaypointPassage | null = null;
		for (let k = cursor; k < passages.length; k++)
			if (passages[k].wpt === p.to && passages[k].index >= prevIndex) {
				passage = passages[k];
				cursor = k + 1;
				break;
			}
		if (!passage) {
			return { planned: p, plannedFuelL, passage: null, actualTimeH: NaN, actualFuelL: NaN, actualOnBoardL: NaN, timeDiffH: NaN, fuelDiffL: NaN, fuelDiffPercent: NaN, onBoardDiffL: NaN, actualMarginL: NaN, offPlan: false };
		}
		const end = passage.index;
		const start = takeOffIn(a, prevIndex, end);
		const fuelFrom = i === 0 ? 0 : prevIndex;
		const usedDelta = a.used[end] - a.used[fuelFrom];
		// A "used" reset inside the leg makes the difference meaningless: say nothing rather than wrong.
		const actualFuelL = usedDelta >= 0 ? usedDelta : NaN;
		const actualTimeH = (a.t[end] - a.t[start]) / 3600;
		const actualOnBoardL = a.onBoard[end];
		if (i === 0) {
			line.t.push(a.t[0]);
			line.onBoardL.push(plan.startOnBoardL);
		}
		line.t.push(a.t[start]);
		line.onBoardL.push(p.onBoardStartL);
		line.t.push(a.t[end]);
		line.onBoardL.push(p.onBoardAtWptL);
		prevIndex = end;
		const fuelDiffL = actualFuelL - plannedFuelL;
		const fuelDiffPercent = pct(fuelDiffL, plannedFuelL);
		return {
			planned: p,
			plannedFuelL,
			passage,
			actualTimeH,
			actualFuelL,
			actualOnBoardL,
			timeDiffH: actualTimeH - p.timeH,
			fuelDiffL,
			fuelDiffPercent,
			onBoardDiffL: actualOnBoardL - p.onBoardAtWptL,
			actualMarginL: actualOnBoardL - reserveL,
			offPlan: Number.isFinite(fuelDiffPercent) && Math.abs(fuelDiffPercent) > tolerancePercent
		};
	});
	return {
		legs,
		tolerancePercent,
		plannedLine: line,
		offPlanCount: legs.filter((l) => l.offPlan).length,
		flownCount: legs.filter((l) => l.passage !== null).length
	};
}
