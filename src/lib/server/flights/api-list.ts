// The flights list of the API: across every organisation the user belongs to, the flights each
// membership lets them view (visibleFlights: never the trash), newest engine start first, one page
// after a cursor (engine start, then id, so flights with the same start keep one order).
import { and, desc, eq, gte, lt, or, sql, type SQL } from 'drizzle-orm';
import type { FlightListApiQuery } from '$lib/schemas/api';
import type { Role } from '$lib/permissions';
import { db } from '../db';
import { aircraft, flights, memberships, organisations, users } from '../db/schema';
import { visibleFlights } from './list';

export interface ApiMembership {
	orgId: string;
	role: Role;
}

const DAY_MS = 86_400_000;

export async function listFlightsPage(userId: string, memberOf: ApiMembership[], q: FlightListApiQuery, after: { key: string; id: string } | null) {
	if (memberOf.length === 0) return { rows: [], more: false };
	const filters: SQL[] = [or(...memberOf.map((m) => visibleFlights({ orgId: m.orgId, userId, role: m.role })))!];
	if (q.aircraft) filters.push(eq(flights.aircraftId, q.aircraft));
	if (q.pilot) filters.push(eq(flights.pilotId, q.pilot));
	if (q.from) filters.push(gte(flights.startedAt, new Date(`${q.from}T00:00:00Z`)));
	if (q.to) filters.push(lt(flights.startedAt, new Date(Date.parse(`${q.to}T00:00:00Z`) + DAY_MS)));
	if (after) filters.push(sql`(${flights.startedAt}, ${flights.id}) < (${new Date(after.key).toISOString()}::timestamptz, ${after.id}::uuid)`);
	const rows = await db
		.select({
			id: flights.id,
			org: organisations.slug,
			aircraftId: flights.aircraftId,
			registration: aircraft.registration,
			title: flights.title,
			status: flights.status,
			source: flights.source,
			startedAt: flights.startedAt,
			endedAt: flights.endedAt,
			pilotId: flights.pilotId,
			pilot: users.name,
			sampleCount: flights.sampleCount,
			fuelUsedL: sql<number | null>`(${flights.summary}->>'fuelUsedL')::float8`
		})
		.from(flights)
		.innerJoin(aircraft, eq(aircraft.id, flights.aircraftId))
		.innerJoin(organisations, eq(organisations.id, flights.orgId))
		.leftJoin(users, eq(users.id, flights.pilotId))
		.where(and(...filters))
		.orderBy(desc(flights.startedAt), desc(flights.id))
		.limit(q.limit + 1);
	return { rows: rows.slice(0, q.limit), more: rows.length > q.limit };
}

/** The user's memberships: organisation and role. */
export async function membershipsOf(userId: string): Promise<ApiMembership[]> {
	return db.select({ orgId: memberships.orgId, role: memberships.role }).from(memberships).where(eq(memberships.userId, userId));
}
