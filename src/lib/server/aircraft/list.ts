// The aircraft list of the API: the aircraft of every organisation the user belongs to (every role
// may see its fleet), or of one, ordered by registration then id, one page after a cursor.
import { and, asc, eq, gt, inArray, isNotNull, isNull, or, type SQL } from 'drizzle-orm';
import type { AircraftListQuery } from '$lib/schemas/api';
import { db } from '../db';
import { aircraft, memberships, organisations } from '../db/schema';

export interface AircraftRow {
	id: string;
	org: string;
	registration: string;
	type: string;
	fuelType: (typeof aircraft.$inferSelect)['fuelType'];
	displayUnit: (typeof aircraft.$inferSelect)['displayUnit'];
	capacityL: number;
	archivedAt: Date | null;
}

/** One page (limit + 1 rows are read to know whether another follows). */
export async function listAircraftPage(userId: string, q: AircraftListQuery, after: { key: string; id: string } | null, orgId?: string) {
	const mine = db.select({ orgId: memberships.orgId }).from(memberships).where(eq(memberships.userId, userId));
	const filters: SQL[] = [inArray(aircraft.orgId, mine)];
	if (orgId) filters.push(eq(aircraft.orgId, orgId));
	if (q.archived === 'exclude') filters.push(isNull(aircraft.archivedAt));
	if (q.archived === 'only') filters.push(isNotNull(aircraft.archivedAt));
	if (after) filters.push(or(gt(aircraft.registration, after.key), and(eq(aircraft.registration, after.key), gt(aircraft.id, after.id)))!);
	const rows: AircraftRow[] = await db
		.select({
			id: aircraft.id,
			org: organisations.slug,
			registration: aircraft.registration,
			type: aircraft.type,
			fuelType: aircraft.fuelType,
			displayUnit: aircraft.displayUnit,
			capacityL: aircraft.capacityL,
			archivedAt: aircraft.archivedAt
		})
		.from(aircraft)
		.innerJoin(organisations, eq(organisations.id, aircraft.orgId))
		.where(and(...filters))
		// The same column collation orders the rows and compares the cursor: one order.
		.orderBy(asc(aircraft.registration), asc(aircraft.id))
		.limit(q.limit + 1);
	return { rows: rows.slice(0, q.limit), more: rows.length > q.limit };
}
