// The aircraft a flight or a recorder belongs to, looked up within its organisation. The foreign
// keys make a missing one all but impossible; if it happens it is answered as not found (404),
// never as a server error, and an aircraft of another organisation is never returned.
import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { aircraft, type Aircraft } from '../db/schema';
import type { Queryable } from '../flights/load';

export interface BelongsToAircraft {
	orgId: string;
	aircraftId: string;
}

/** The aircraft of `owner` in the owner's organisation, or null. */
export async function findAircraftOf(owner: BelongsToAircraft, q: Queryable = db): Promise<Aircraft | null> {
	const [a] = await q
		.select()
		.from(aircraft)
		.where(and(eq(aircraft.id, owner.aircraftId), eq(aircraft.orgId, owner.orgId)))
		.limit(1);
	return a ?? null;
}

export const AIRCRAFT_GONE = 'The aircraft of this flight no longer exists.';

/** The same for a page, a form action or an endpoint: 404 when there is none. */
export async function aircraftOf(owner: BelongsToAircraft, q: Queryable = db): Promise<Aircraft> {
	const a = await findAircraftOf(owner, q);
	if (!a) error(404, AIRCRAFT_GONE);
	return a;
}
