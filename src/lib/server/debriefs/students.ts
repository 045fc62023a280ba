// The instructor's students: each pilot of a flight the instructor is named on, with those
// flights, whether the reserve was kept, and the state of each debrief.
import { and, desc, eq, isNull } from 'drizzle-orm';
import type { FlightSummary } from '$lib/fuel';
import type { DebriefStatus } from '$lib/wire/plan';
import { db } from '../db';
import { aircraft, debriefs, flights, fuelPlans, users } from '../db/schema';

/**
 * Reserve kept: the engine's per-flight verdict (fuel on board at shutdown against the reserve
 * amount) from the stored summary; null when the flight has no verdict or no reserve amount.
 */
export function reserveKeptOf(summary: FlightSummary | null): boolean | null {
	const state = summary?.verdict?.state;
	return state === 'kept' ? true : state === 'notKept' ? false : null;
}

export interface StudentFlight {
	id: string;
	startedAt: Date;
	title: string;
	registration: string;
	reserveKept: boolean | null;
	hasPlan: boolean;
	debrief: DebriefStatus | 'none';
	signedOff: boolean;
}

export interface Student {
	id: string | null;
	name: string;
	flights: StudentFlight[];
	open: number;
	done: number;
}

export async function studentsOf(orgId: string, instructorId: string): Promise<Student[]> {
	const rows = await db
		.select({
			id: flights.id,
			startedAt: flights.startedAt,
			title: flights.title,
			summary: flights.summary,
			pilotId: flights.pilotId,
			pilot: users.name,
			registration: aircraft.registration,
			status: debriefs.status,
			signedOffAt: debriefs.signedOffAt,
			planId: fuelPlans.id
		})
		.from(flights)
		.innerJoin(aircraft, eq(aircraft.id, flights.aircraftId))
		.leftJoin(users, eq(users.id, flights.pilotId))
		.leftJoin(debriefs, eq(debriefs.flightId, flights.id))
		.leftJoin(fuelPlans, eq(fuelPlans.flightId, flights.id))
		.where(and(eq(flights.orgId, orgId), eq(flights.instructorId, instructorId), isNull(flights.deletedAt)))
		.orderBy(desc(flights.startedAt));
	const byPilot = new Map<string, Student>();
	for (const r of rows) {
		const key = r.pilotId ?? '';
		const s = byPilot.get(key) ?? { id: r.pilotId, name: r.pilot ?? 'Pilot not set', flights: [], open: 0, done: 0 };
		const debrief = r.status ?? 'none';
		s.flights.push({
			id: r.id,
			startedAt: r.startedAt,
			title: r.title,
			registration: r.registration,
			reserveKept: reserveKeptOf(r.summary),
			hasPlan: r.planId !== null,
			debrief,
			signedOff: r.signedOffAt !== null
		});
		if (debrief === 'published') s.done++;
		else s.open++;
		byPilot.set(key, s);
	}
	return [...byPilot.values()].sort((a, b) => a.name.localeCompare(b.name));
}
