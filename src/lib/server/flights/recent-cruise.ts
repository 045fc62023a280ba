// The aircraft's recent median cruise flow, from the stored summaries of its flights before a
// given one: the reserve amount's third basis (after the set normal-cruise flow and the flight's
// own measured cruise), so a flight that has not measured its cruise yet still has a reserve.
import { and, desc, eq, isNotNull, lt, ne, sql } from 'drizzle-orm';
import { db } from '../db';
import { flights } from '../db/schema';
import type { Queryable } from './load';

/** How many earlier flights the median is taken over (our choice: about a month of club use). */
export const RECENT_CRUISE_FLIGHTS = 10;

/** Median of the middle value(s); null for an empty list. */
export function median(values: readonly number[]): number | null {
	const v = values.filter((x) => Number.isFinite(x) && x > 0).sort((a, b) => a - b);
	if (v.length === 0) return null;
	const m = v.length >> 1;
	return v.length % 2 === 1 ? v[m] : (v[m - 1] + v[m]) / 2;
}

/**
 * Median cruise flow (L/h) of the aircraft's last RECENT_CRUISE_FLIGHTS flights that started
 * before `before` and measured one; null when there are none.
 */
export async function recentCruiseFlowLph(aircraftId: string, before: { id?: string; startedAt: Date }, q: Queryable = db): Promise<number | null> {
	const cruise = sql<number | null>`(${flights.summary} ->> 'cruiseFlowLph')::float8`;
	const conditions = [eq(flights.aircraftId, aircraftId), lt(flights.startedAt, before.startedAt), isNotNull(cruise)];
	if (before.id) conditions.push(ne(flights.id, before.id));
	const rows = await q
		.select({ cruise })
		.from(flights)
		.where(and(...conditions))
		.orderBy(desc(flights.startedAt))
		.limit(RECENT_CRUISE_FLIGHTS);
	return median(rows.map((r) => Number(r.cruise)));
}
