// Fuel plans: the one home of their queries. A plan belongs to a flight (added before or after it
// is flown); its worked figures are computed from the stored inputs on every read, never stored,
// so there is nothing derived to keep in step when a plan changes.
import { eq } from 'drizzle-orm';
import type { ReserveRuleId } from '$lib/fuel';
import type { PlanInput } from '$lib/schemas/plan';
import type { FuelPlanWire } from '$lib/wire/plan';
import { db } from '../db';
import { aircraftOf } from '../aircraft/lookup';
import { fuelPlans, type Flight, type FuelPlanRow } from '../db/schema';

export function planWire(row: FuelPlanRow): FuelPlanWire {
	return {
		id: row.id,
		flightId: row.flightId,
		startOnBoardL: row.startOnBoardL,
		taxiL: row.taxiL,
		climbL: row.climbL,
		reserveRule: row.reserveRule as ReserveRuleId,
		reserveCustomMin: row.reserveCustomMin,
		reserveFlowLph: row.reserveFlowLph,
		tolerancePercent: row.tolerancePercent,
		legs: row.legs,
		updatedAt: row.updatedAt.toISOString()
	};
}

export async function planOfFlight(flightId: string): Promise<FuelPlanWire | null> {
	const row = await db.query.fuelPlans.findFirst({ where: eq(fuelPlans.flightId, flightId) });
	return row ? planWire(row) : null;
}

/** Saves the flight's plan, replacing the one it had (one plan per flight: a unique index). */
export async function savePlan(flight: Pick<Flight, 'id' | 'orgId' | 'aircraftId'>, input: PlanInput, userId: string): Promise<FuelPlanWire> {
	const values = { ...input, updatedAt: new Date() };
	const [row] = await db
		.insert(fuelPlans)
		.values({ ...values, orgId: flight.orgId, aircraftId: flight.aircraftId, flightId: flight.id, createdBy: userId })
		.onConflictDoUpdate({ target: fuelPlans.flightId, set: values })
		.returning();
	return planWire(row);
}

export async function removePlan(flightId: string): Promise<boolean> {
	const gone = await db.delete(fuelPlans).where(eq(fuelPlans.flightId, flightId)).returning({ id: fuelPlans.id });
	return gone.length > 0;
}

/** What the plan page needs beside the plan: the aircraft's units and reserve defaults. */
export async function planContext(flight: Pick<Flight, 'id' | 'orgId' | 'aircraftId'>) {
	const [plan, a] = await Promise.all([planOfFlight(flight.id), aircraftOf(flight)]);
	const { registration, displayUnit, densityKgPerL, reserveCustomMin, baselineCruiseLph } = a;
	return { plan, aircraft: { registration, displayUnit, densityKgPerL, reserveRule: a.reserveRule as ReserveRuleId, reserveCustomMin, baselineCruiseLph } };
}
