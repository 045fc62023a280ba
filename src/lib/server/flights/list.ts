// The flights list: an organisation's flights (or only the member's own, by role) with the figures
// from the cached summary, filtered by aircraft, pilot, date range and reserve verdict, sorted and
// paged in SQL.
import { and, asc, count, desc, eq, gte, isNull, lt, or, sql, type SQL } from 'drizzle-orm';
import type { FlightSummary } from '$lib/fuel';
import { can, type Role } from '$lib/permissions';
import { FLIGHTS_PER_PAGE, type FlightListQuery, type FlightSort } from '$lib/schemas/flight';
import { db } from '../db';
import { aircraft, flights, users } from '../db/schema';

const figure = (key: keyof FlightSummary) => sql`(${flights.summary}->>${key})::float8`;

const SORT_COLUMNS: Record<FlightSort, SQL | typeof flights.startedAt> = {
	date: flights.startedAt,
	aircraft: sql`${aircraft.registration}`,
	pilot: sql`${users.name}`,
	block: figure('blockTimeS'),
	used: figure('fuelUsedL'),
	flow: figure('averageFlowLph'),
	onboard: figure('onBoardAtShutdownL'),
	margin: sql`(${flights.summary}->'verdict'->>'marginL')::float8`,
	alarms: figure('alarmCount')
};

/** Newest first by date; the figures largest first; names A to Z. */
export function defaultDir(sort: FlightSort): 'asc' | 'desc' {
	return sort === 'aircraft' || sort === 'pilot' ? 'asc' : 'desc';
}

export interface ListViewer {
	orgId: string;
	userId: string;
	role: Role;
}

/**
 * What the member may see at all: every flight of the organisation, or their own and (for members
 * who fly) the recorder-opened flights nobody has claimed yet: mayOnFlight's 'view' in SQL.
 */
export function visibleFlights(v: ListViewer): SQL {
	// Flights in the trash are nobody's to see here (the trash page lists them).
	const org = and(eq(flights.orgId, v.orgId), isNull(flights.deletedAt))!;
	if (can(v.role, 'viewAllFlights')) return org;
	const own = or(eq(flights.pilotId, v.userId), eq(flights.instructorId, v.userId))!;
	const unclaimed = and(isNull(flights.pilotId), eq(flights.source, 'live'))!;
	return and(org, can(v.role, 'upload') ? or(own, unclaimed) : own)!;
}

export async function listFlights(v: ListViewer, q: FlightListQuery) {
	const filters: SQL[] = [visibleFlights(v)];
	if (q.aircraft) filters.push(eq(flights.aircraftId, q.aircraft));
	if (q.pilot) filters.push(eq(flights.pilotId, q.pilot));
	if (q.from) filters.push(gte(flights.startedAt, new Date(`${q.from}T00:00:00Z`)));
	if (q.to) filters.push(lt(flights.startedAt, new Date(Date.parse(`${q.to}T00:00:00Z`) + 86_400_000)));
	if (q.verdict) filters.push(sql`${flights.summary}->'verdict'->>'state' = ${q.verdict}`);
	const where = and(...filters);
	const dir = q.dir ?? defaultDir(q.sort);
	const key = SORT_COLUMNS[q.sort];
	const order = dir === 'asc' ? sql`${key} asc nulls last` : sql`${key} desc nulls last`;

	const [[{ total }], rows] = await Promise.all([
		db.select({ total: count() }).from(flights).innerJoin(aircraft, eq(aircraft.id, flights.aircraftId)).leftJoin(users, eq(users.id, flights.pilotId)).where(where),
		db
			.select({
				id: flights.id,
				title: flights.title,
				status: flights.status,
				source: flights.source,
				startedAt: flights.startedAt,
				summary: flights.summary,
				aircraftId: aircraft.id,
				registration: aircraft.registration,
				displayUnit: aircraft.displayUnit,
				densityKgPerL: aircraft.densityKgPerL,
				pilotId: flights.pilotId,
				pilot: users.name
			})
			.from(flights)
			.innerJoin(aircraft, eq(aircraft.id, flights.aircraftId))
			.leftJoin(users, eq(users.id, flights.pilotId))
			.where(where)
			// The id breaks ties so pages never repeat or skip a flight.
			.orderBy(order, desc(flights.startedAt), asc(flights.id))
			.limit(FLIGHTS_PER_PAGE)
			.offset((q.page - 1) * FLIGHTS_PER_PAGE)
	]);
	const pages = Math.max(1, Math.ceil(total / FLIGHTS_PER_PAGE));
	return {
		total,
		pages,
		page: q.page,
		sort: q.sort,
		dir,
		flights: rows
	};
}

/** Choices for the filters: the fleet (archived too, old flights use them) and the pilots seen. */
export async function listFilterOptions(v: ListViewer) {
	const [fleet, pilots] = await Promise.all([
		db.select({ id: aircraft.id, registration: aircraft.registration }).from(aircraft).where(eq(aircraft.orgId, v.orgId)).orderBy(asc(aircraft.registration)),
		can(v.role, 'viewAllFlights')
			? db
					.selectDistinct({ id: users.id, name: users.name })
					.from(flights)
					.innerJoin(users, eq(users.id, flights.pilotId))
					.where(eq(flights.orgId, v.orgId))
					.orderBy(asc(users.name))
			: Promise.resolve([])
	]);
	return { fleet, pilots };
}

/**
 * The pilot's usual aircraft, for preselecting it on the upload page: the aircraft of their latest
 * flight (as pilot, out of the trash) that is still in the fleet; null without one.
 */
export async function usualAircraftOf(orgId: string, userId: string): Promise<string | null> {
	const [row] = await db
		.select({ id: flights.aircraftId })
		.from(flights)
		.innerJoin(aircraft, eq(aircraft.id, flights.aircraftId))
		.where(and(eq(flights.orgId, orgId), eq(flights.pilotId, userId), isNull(flights.deletedAt), isNull(aircraft.archivedAt)))
		.orderBy(desc(flights.startedAt))
		.limit(1);
	return row?.id ?? null;
}
