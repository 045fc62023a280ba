import { and, desc, eq } from 'drizzle-orm';
import { visibleFlights } from '$lib/server/flights/list';
import { requireMember } from '$lib/server/access';
import { db } from '$lib/server/db';
import { aircraft, flights, users } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

// Overview: flights in the air now, the latest flights the member may see, and the fleet.
export const load = (async (event) => {
	const { org, role, user } = await requireMember(event, event.params.org);
	const visible = visibleFlights({ orgId: org.id, userId: user.id, role });
	const columns = {
		id: flights.id,
		title: flights.title,
		status: flights.status,
		source: flights.source,
		startedAt: flights.startedAt,
		lastSampleAt: flights.lastSampleAt,
		summary: flights.summary,
		registration: aircraft.registration,
		displayUnit: aircraft.displayUnit,
		densityKgPerL: aircraft.densityKgPerL,
		pilot: users.name
	};
	const base = () => db.select(columns).from(flights).innerJoin(aircraft, eq(aircraft.id, flights.aircraftId)).leftJoin(users, eq(users.id, flights.pilotId));
	const [live, recent, fleet] = await Promise.all([
		base().where(and(visible, eq(flights.status, 'open'))).orderBy(desc(flights.startedAt)).limit(20),
		base().where(and(visible, eq(flights.status, 'closed'))).orderBy(desc(flights.startedAt)).limit(8),
		db.select().from(aircraft).where(eq(aircraft.orgId, org.id)).orderBy(aircraft.registration)
	]);
	return { live, recent, fleet: fleet.filter((a) => a.archivedAt === null) };
}) satisfies PageServerLoad;
