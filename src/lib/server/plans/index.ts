// Fuel plans: the one home of their queries. A plan belongs to a flight, added after it is flown,
// or made before it and waiting (no flight yet, an expected departure) until the upload or live
// flight of its aircraft that starts nearest that time takes it. Its worked figures are computed
// from the stored inputs on every read, never stored, so nothing derived follows a plan change.
import { and, asc, eq, gte, isNull, lte, sql } from 'drizzle-orm';
import type { ReserveRuleId } from '$lib/fuel';
import type { PlanInput, WaitingPlanHeader } from '$lib/schemas/plan';
import { WAITING_PLAN_WINDOW_MS, type FuelPlanWire, type WaitingPlanView } from '$lib/wire/plan';
import { db, type Db } from '../db';
import { aircraftOf } from '../aircraft/lookup';
import { aircraft, flights, fuelPlans, memberships, users, type Flight, type FuelPlanRow } from '../db/schema';
import { alias } from 'drizzle-orm/pg-core';

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
		expectedDepartureAt: row.expectedDepartureAt?.toISOString() ?? null,
		pilotId: row.pilotId,
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
	return { plan, aircraft: { registration, displayUnit, densityKgPerL, reserveRule: a.reserveRule, reserveCustomMin, baselineCruiseLph } };
}

// ---- plans made before the flight ----------------------------------------------------------

/** Why a waiting plan was refused, field by field (the form shows each beside its input). */
export class WaitingPlanRefusal extends Error {
	constructor(
		readonly field: 'aircraft' | 'pilot',
		message: string
	) {
		super(message);
	}
}

/**
 * Stores a plan made before the flight. The aircraft must be an active one of the organisation
 * and the pilot a member of it; the density for the plan's units was the caller's (the aircraft's).
 */
export async function createWaitingPlan(orgId: string, header: WaitingPlanHeader, input: PlanInput, userId: string): Promise<FuelPlanWire> {
	const a = await db.query.aircraft.findFirst({ where: and(eq(aircraft.id, header.aircraft), eq(aircraft.orgId, orgId)), columns: { id: true, archivedAt: true } });
	if (!a) throw new WaitingPlanRefusal('aircraft', 'That aircraft is not in this organisation.');
	if (a.archivedAt) throw new WaitingPlanRefusal('aircraft', 'That aircraft is archived: it takes no new flights.');
	if (header.pilot) {
		const m = await db.query.memberships.findFirst({ where: and(eq(memberships.orgId, orgId), eq(memberships.userId, header.pilot)), columns: { userId: true } });
		if (!m) throw new WaitingPlanRefusal('pilot', 'That pilot is not a member of this organisation.');
	}
	const [row] = await db
		.insert(fuelPlans)
		.values({ ...input, orgId, aircraftId: a.id, flightId: null, expectedDepartureAt: header.departure, pilotId: header.pilot, createdBy: userId })
		.returning();
	return planWire(row);
}

const creators = alias(users, 'creators');

/** The organisation's plans still waiting for their flight, soonest first. */
export async function waitingPlansOf(orgId: string, now = new Date()): Promise<WaitingPlanView[]> {
	const rows = await db
		.select({
			id: fuelPlans.id,
			aircraftId: fuelPlans.aircraftId,
			registration: aircraft.registration,
			expectedDepartureAt: fuelPlans.expectedDepartureAt,
			pilot: users.name,
			createdBy: creators.name,
			legs: fuelPlans.legs
		})
		.from(fuelPlans)
		.innerJoin(aircraft, eq(aircraft.id, fuelPlans.aircraftId))
		.leftJoin(users, eq(users.id, fuelPlans.pilotId))
		.leftJoin(creators, eq(creators.id, fuelPlans.createdBy))
		.where(and(eq(fuelPlans.orgId, orgId), isNull(fuelPlans.flightId)))
		.orderBy(asc(fuelPlans.expectedDepartureAt));
	return rows.map((r) => ({
		id: r.id,
		aircraftId: r.aircraftId,
		registration: r.registration,
		// The check constraint makes a waiting plan without a departure impossible.
		expectedDepartureAt: r.expectedDepartureAt!,
		pilot: r.pilot,
		createdBy: r.createdBy,
		route: r.legs.map((l) => l.to),
		windowPassed: r.expectedDepartureAt!.getTime() + WAITING_PLAN_WINDOW_MS < now.getTime()
	}));
}

/** Removes a plan of the organisation that is still waiting; false when there is none such. */
export async function removeWaitingPlan(orgId: string, planId: string): Promise<boolean> {
	const gone = await db
		.delete(fuelPlans)
		.where(and(eq(fuelPlans.id, planId), eq(fuelPlans.orgId, orgId), isNull(fuelPlans.flightId)))
		.returning({ id: fuelPlans.id });
	return gone.length > 0;
}

/** What attaching needs of the transaction it runs in (the pool's client or an upload's own). */
type PlanTx = Pick<Db, 'select' | 'update'>;

/**
 * Called inside the transaction that creates a flight (an upload, a live flight): the waiting plan
 * of the flight's aircraft whose expected departure is nearest the flight's start, within
 * WAITING_PLAN_WINDOW_MS either way, becomes the flight's plan. The flight takes the plan's pilot
 * (the plan says who flies; an upload otherwise names its uploader) and, when it names no
 * instructor, the plan's author, so it appears among that instructor's students' flights.
 * Returns the plan's id, or null when none was waiting.
 */
export async function attachWaitingPlan(tx: PlanTx, flight: Pick<Flight, 'id' | 'aircraftId' | 'startedAt'>): Promise<string | null> {
	const at = flight.startedAt;
	const from = new Date(at.getTime() - WAITING_PLAN_WINDOW_MS);
	const to = new Date(at.getTime() + WAITING_PLAN_WINDOW_MS);
	// A plan has one flight: the row lock makes a second flight arriving at once wait, then see it taken.
	const [plan] = await tx
		.select({ id: fuelPlans.id, pilotId: fuelPlans.pilotId, createdBy: fuelPlans.createdBy })
		.from(fuelPlans)
		.where(and(eq(fuelPlans.aircraftId, flight.aircraftId), isNull(fuelPlans.flightId), gte(fuelPlans.expectedDepartureAt, from), lte(fuelPlans.expectedDepartureAt, to)))
		.orderBy(sql`abs(extract(epoch from ${fuelPlans.expectedDepartureAt} - ${at.toISOString()}::timestamptz))`, asc(fuelPlans.expectedDepartureAt))
		.limit(1)
		.for('update');
	if (!plan) return null;
	const [taken] = await tx
		.update(fuelPlans)
		.set({ flightId: flight.id, updatedAt: new Date() })
		.where(and(eq(fuelPlans.id, plan.id), isNull(fuelPlans.flightId)))
		.returning({ id: fuelPlans.id });
	if (!taken) return null;
	await tx
		.update(flights)
		.set({
			pilotId: sql`coalesce(${plan.pilotId}::text, ${flights.pilotId})`,
			instructorId: sql`coalesce(${flights.instructorId}, ${plan.createdBy}::text)`,
			updatedAt: new Date()
		})
		.where(eq(flights.id, flight.id));
	return taken.id;
}

/** The organisation's active aircraft, with what the plan form needs of each. */
export const fleetOf = (orgId: string) =>
	db
		.select({
			id: aircraft.id,
			registration: aircraft.registration,
			type: aircraft.type,
			displayUnit: aircraft.displayUnit,
			densityKgPerL: aircraft.densityKgPerL,
			reserveRule: aircraft.reserveRule,
			reserveCustomMin: aircraft.reserveCustomMin,
			baselineCruiseLph: aircraft.baselineCruiseLph
		})
		.from(aircraft)
		.where(and(eq(aircraft.orgId, orgId), isNull(aircraft.archivedAt)))
		.orderBy(asc(aircraft.registration));

/** The organisation's members who may be named as the pilot of a plan made ahead, by name. */
export const membersOf = (orgId: string) =>
	db
		.select({ id: users.id, name: users.name, role: memberships.role })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.orgId, orgId))
		.orderBy(asc(users.name));
