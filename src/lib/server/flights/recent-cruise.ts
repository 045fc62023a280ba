// The aircraft's recent median cruise flow, from the stored summaries of its flights before a
// given one: the reserve amount's third basis (after the set normal-cruise flow and the flight's
// own measured cruise), so a flight that has not measured its cruise yet still has a reserve.
import { sql } from 'drizzle-orm';
import { db } from '../db';
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
	return (await recentCruiseFlowsLph([{ aircraftId, before }], q))[0];
}

/** recentCruiseFlowLph for several aircraft and flights in one query, in the order asked. */
export async function recentCruiseFlowsLph(asked: readonly { aircraftId: string; before: { id?: string; startedAt: Date } }[], q: Queryable = db): Promise<(number | null)[]> {
	if (asked.length === 0) return [];
	const col = <T>(f: (x: (typeof asked)[number]) => T) => sql.param(asked.map(f));
	const cruise = sql`(o.summary ->> 'cruiseFlowLph')::float8`;
	// The flight itself never counts (an all-zero uuid stands for "no flight" as no row has it).
	const result = await q.execute<{ i: number; cruise: number }>(sql`
		select r.i::int as i, o.cruise from unnest(
			${col((x) => x.aircraftId)}::uuid[],
			${col((x) => x.before.id ?? '00000000-0000-0000-0000-000000000000')}::uuid[],
			${col((x) => x.before.startedAt.toISOString())}::timestamptz[]
		) with ordinality as r(aircraft_id, flight_id, started_at, i)
		cross join lateral (
			select ${cruise} as cruise from flights o
			where o.aircraft_id = r.aircraft_id and o.started_at < r.started_at and ${cruise} is not null and o.id <> r.flight_id
			order by o.started_at desc limit ${RECENT_CRUISE_FLIGHTS}
		) o`);
	const values: number[][] = asked.map(() => []);
	for (const row of result.rows) values[Number(row.i) - 1].push(Number(row.cruise));
	return values.map(median);
}
