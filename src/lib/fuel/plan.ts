// A pre-flight fuel plan, worked out: time and fuel for each leg, fuel on board planned at each
// waypoint, and fuel on arrival against the reserve. The arithmetic is the navigation log's
// (FAA-H-8083-25, Navigation chapter): time = distance ÷ ground speed, fuel = flow × time.
// Canonical units: NM, knots, minutes for entered leg times, litres, litres per hour.

import { reserveAmount, type ReserveAmount, type ReserveSetting } from './reserve';

/**
 * One leg as planned, flown towards `to` (the waypoint id the recorder reports while flying it).
 * Either the ground speed or the time is given (the time wins when both are); either the flow or
 * the fuel (the fuel wins).
 */
export interface PlanLeg {
	to: string;
	distanceNm: number;
	gsKt: number | null;
	timeMin: number | null;
	flowLph: number | null;
	fuelL: number | null;
	/** Planned fuel on board at the start of this leg after a refuel at a stop; null = carried on. */
	refuelToL: number | null;
}

export interface FuelPlanInput {
	/** Fuel on board planned at engine start, litres. */
	startOnBoardL: number;
	/** Taxi and run-up allowance, litres, taken before the first leg. */
	taxiL: number;
	/** Climb allowance, litres, added to the first leg's fuel. */
	climbL: number;
	reserve: ReserveSetting;
	/** The normal-cruise flow the reserve is computed at, L/h (the aircraft's baseline). */
	reserveFlowLph: number | null;
	legs: readonly PlanLeg[];
}

export interface PlannedLeg {
	n: number;
	from: string | null;
	to: string;
	distanceNm: number;
	/** Hours. */
	timeH: number;
	gsKt: number;
	flowLph: number;
	/** Fuel for the leg, litres, the climb allowance included on the first leg. */
	fuelL: number;
	/** Planned on board at the start of the leg (after any refuel) and at the waypoint. */
	onBoardStartL: number;
	onBoardAtWptL: number;
	/** On board at the waypoint minus the reserve; NaN when the reserve is unknown. */
	marginL: number;
	/** Elapsed planned time at the waypoint, hours (legs only, no taxi). */
	elapsedH: number;
	/** Fuel used since engine start at the waypoint, litres (taxi included). */
	usedL: number;
}

export interface WorkedPlan {
	startOnBoardL: number;
	taxiL: number;
	legs: PlannedLeg[];
	totalDistanceNm: number;
	totalTimeH: number;
	/** Taxi + every leg's fuel, litres. */
	totalFuelL: number;
	onBoardAtArrivalL: number;
	reserve: ReserveAmount;
	/** Fuel on arrival minus the reserve; NaN when the reserve amount is unknown. */
	arrivalMarginL: number;
	/** True when the fuel on arrival covers the reserve; null when the reserve is unknown. */
	reserveKept: boolean | null;
}

/** Hours for a distance at a ground speed (FAA-H-8083-25: time = distance ÷ GS). */
export function legTimeH(distanceNm: number, gsKt: number): number {
	return gsKt > 0 ? distanceNm / gsKt : NaN;
}

/** Distance flown in a time at a ground speed (FAA-H-8083-25: distance = GS × time). */
export function legDistanceNm(timeH: number, gsKt: number): number {
	return timeH * gsKt;
}

/** Fuel for a time at a flow (FAA-H-8083-25: fuel = flow × time). */
export function legFuelL(timeH: number, flowLph: number): number {
	return timeH * flowLph;
}

/** The plan worked out leg by leg. A leg with neither speed nor time gets NaN figures, never a throw. */
export function workPlan(plan: FuelPlanInput): WorkedPlan {
	let onBoard = plan.startOnBoardL - plan.taxiL;
	let used = plan.taxiL;
	let elapsed = 0;
	let distance = 0;
	const reserve = reserveAmount(plan.reserve, plan.reserveFlowLph, null);
	const reserveL = reserve.amountL ?? NaN;
	const legs: PlannedLeg[] = plan.legs.map((leg, i) => {
		const timeH = leg.timeMin !== null ? leg.timeMin / 60 : leg.gsKt !== null ? legTimeH(leg.distanceNm, leg.gsKt) : NaN;
		const gsKt = leg.gsKt !== null && leg.timeMin === null ? leg.gsKt : timeH > 0 ? leg.distanceNm / timeH : NaN;
		const baseFuel = leg.fuelL !== null ? leg.fuelL : leg.flowLph !== null ? legFuelL(timeH, leg.flowLph) : NaN;
		const flowLph = leg.fuelL !== null ? (timeH > 0 ? leg.fuelL / timeH : NaN) : (leg.flowLph ?? NaN);
		const fuelL = baseFuel + (i === 0 ? plan.climbL : 0);
		if (leg.refuelToL !== null) onBoard = leg.refuelToL;
		const onBoardStartL = onBoard;
		onBoard -= fuelL;
		used += fuelL;
		elapsed += timeH;
		distance += leg.distanceNm;
		return {
			n: i + 1,
			from: i === 0 ? null : plan.legs[i - 1].to,
			to: leg.to,
			distanceNm: leg.distanceNm,
			timeH,
			gsKt,
			flowLph,
			fuelL,
			onBoardStartL,
			onBoardAtWptL: onBoard,
			marginL: onBoard - reserveL,
			elapsedH: elapsed,
			usedL: used
		};
	});
	const arrivalMarginL = onBoard - reserveL;
	return {
		startOnBoardL: plan.startOnBoardL,
		taxiL: plan.taxiL,
		legs,
		totalDistanceNm: distance,
		totalTimeH: elapsed,
		totalFuelL: used,
		onBoardAtArrivalL: onBoard,
		reserve,
		arrivalMarginL,
		reserveKept: Number.isFinite(arrivalMarginL) ? arrivalMarginL >= 0 : null
	};
}
