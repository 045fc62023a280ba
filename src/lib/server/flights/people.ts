// The names of a flight's pilot and instructor, for its pages and exports.
import { inArray } from 'drizzle-orm';
import { db } from '../db';
import { users, type Flight } from '../db/schema';

export interface FlightPeople {
	pilot: string | null;
	instructor: string | null;
}

export async function flightPeople(flight: Pick<Flight, 'pilotId' | 'instructorId'>): Promise<FlightPeople> {
	const ids = [flight.pilotId, flight.instructorId].filter((x): x is string => x !== null);
	const names = ids.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)) : [];
	const nameOf = (id: string | null) => names.find((n) => n.id === id)?.name ?? null;
	return { pilot: nameOf(flight.pilotId), instructor: nameOf(flight.instructorId) };
}
