// A flight's details (title, route as written, pilot, instructor) and who may be chosen for them,
// and claiming a recorder-opened flight nobody has claimed. None of these is a fuel input, so no
// figure is recomputed; live viewers are told so their header follows.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { can, type Role } from '$lib/permissions';
import type { FlightDetailsInput } from '$lib/schemas/flight';
import { db } from '../db';
import { flights, memberships, users, type Flight } from '../db/schema';
import { announceChange } from '../live/declare';
import type { EditResult } from './edit';

export interface PersonChoice {
	id: string;
	name: string;
}

/** Who may fly (pilot) and who may instruct: members whose role uploads, and instructors and admins. */
export async function peopleChoices(orgId: string): Promise<{ pilots: PersonChoice[]; instructors: PersonChoice[] }> {
	const rows = await db
		.select({ id: users.id, name: users.name, role: memberships.role })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.orgId, orgId))
		.orderBy(asc(users.name));
	return {
		pilots: rows.filter((r) => can(r.role, 'upload')).map(({ id, name }) => ({ id, name })),
		instructors: rows.filter((r) => can(r.role, 'editAnyFlight')).map(({ id, name }) => ({ id, name }))
	};
}

async function roleIn(orgId: string, userId: string): Promise<Role | null> {
	const [m] = await db.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.orgId, orgId), eq(memberships.userId, userId)));
	return m?.role ?? null;
}

/** Why this member cannot be the pilot of a flight of the organisation, or null when they can. */
async function pilotProblem(orgId: string, pilotId: string): Promise<string | null> {
	const role = await roleIn(orgId, pilotId);
	return role && can(role, 'upload') ? null : 'Choose a member of this organisation who flies (a pilot, instructor or admin).';
}

/** Sets (or clears, with null) the pilot, for those who may choose it. */
export async function setPilot(flight: Pick<Flight, 'id' | 'orgId'>, pilotId: string | null): Promise<EditResult> {
	const problem = pilotId === null ? null : await pilotProblem(flight.orgId, pilotId);
	if (problem) return { ok: false, field: 'pilotId', message: problem };
	await db.update(flights).set({ pilotId, updatedAt: new Date() }).where(eq(flights.id, flight.id));
	await announceChange(flight.id);
	return { ok: true };
}

/**
 * Saves the details. `maySetPilot` is the editor's right to choose the pilot: without it a pilot
 * field that names someone else is refused (never silently dropped).
 */
export async function saveDetails(flight: Pick<Flight, 'id' | 'orgId' | 'pilotId'>, input: FlightDetailsInput, maySetPilot: boolean): Promise<EditResult> {
	if (input.pilotId !== undefined && input.pilotId !== flight.pilotId) {
		if (!maySetPilot) return { ok: false, field: 'pilotId', message: 'Only an instructor or an admin can change the pilot of a flight.' };
		const problem = input.pilotId === null ? null : await pilotProblem(flight.orgId, input.pilotId);
		if (problem) return { ok: false, field: 'pilotId', message: problem };
	}
	if (input.instructorId) {
		const role = await roleIn(flight.orgId, input.instructorId);
		if (!role || !can(role, 'editAnyFlight')) return { ok: false, field: 'instructorId', message: 'Choose an instructor or admin of this organisation, or nobody.' };
	}
	await db
		.update(flights)
		.set({
			title: input.title,
			route: input.route,
			...(input.pilotId !== undefined ? { pilotId: input.pilotId } : {}),
			...(input.instructorId !== undefined ? { instructorId: input.instructorId } : {}),
			updatedAt: new Date()
		})
		.where(eq(flights.id, flight.id));
	await announceChange(flight.id);
	return { ok: true };
}

/**
 * The member becomes the pilot of an unclaimed live flight. One statement, so of two pilots
 * claiming at once exactly one gets it; false when someone already has.
 */
export async function claimFlight(flightId: string, userId: string): Promise<boolean> {
	const [claimed] = await db
		.update(flights)
		.set({ pilotId: userId, updatedAt: new Date() })
		.where(and(eq(flights.id, flightId), isNull(flights.pilotId), eq(flights.source, 'live')))
		.returning({ id: flights.id });
	if (claimed) await announceChange(flightId);
	return claimed !== undefined;
}
