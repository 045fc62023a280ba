// Acknowledging a live flight's alarms, shared: who acknowledged which alarm episode and when is
// stored once and shown to every viewer (pushed over the stream) and on the timeline of the live
// and replay pages. The alarm itself stays on the timeline whatever its acknowledgements.
import { and, asc, eq } from 'drizzle-orm';
import { db } from '../db';
import { alarmAcks, flightAlarms, flights, users } from '../db/schema';
import type { AlarmAck } from '$lib/wire/live';
import { notify } from './flights';

/** Every acknowledgement of the flight's alarms, oldest first, with the name of who gave it. */
export async function alarmAcksOf(flightId: string): Promise<AlarmAck[]> {
	const rows = await db
		.select({ alarmId: alarmAcks.alarmId, kind: flightAlarms.kind, raisedAt: flightAlarms.raisedAt, by: users.name, at: alarmAcks.at })
		.from(alarmAcks)
		.innerJoin(flightAlarms, eq(flightAlarms.id, alarmAcks.alarmId))
		.innerJoin(users, eq(users.id, alarmAcks.userId))
		.where(eq(flightAlarms.flightId, flightId))
		.orderBy(asc(alarmAcks.at));
	return rows.map((r) => ({ alarmId: r.alarmId, kind: r.kind, raisedAt: r.raisedAt.getTime() / 1000, by: r.by, at: r.at.getTime() / 1000 }));
}

/**
 * Records the member's acknowledgement (again is fine) and tells every viewer, on every
 * instance; false when the alarm is not on this flight.
 */
export async function acknowledgeAlarm(flightId: string, alarmId: string, userId: string): Promise<boolean> {
	return db.transaction(async (tx) => {
		const [alarm] = await tx
			.select({ id: flightAlarms.id, lastSeq: flights.lastSeq })
			.from(flightAlarms)
			.innerJoin(flights, eq(flights.id, flightAlarms.flightId))
			.where(and(eq(flightAlarms.id, alarmId), eq(flightAlarms.flightId, flightId)));
		if (!alarm) return false;
		const [added] = await tx.insert(alarmAcks).values({ alarmId: alarm.id, userId }).onConflictDoNothing().returning({ at: alarmAcks.at });
		if (added) await notify(tx, { f: flightId, s: alarm.lastSeq, at: Date.now(), m: 1 });
		return true;
	});
}
