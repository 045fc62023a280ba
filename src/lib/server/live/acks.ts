// Acknowledging a live flight's alarms: each viewer for themselves; the alarm stays on the
// timeline for everyone.
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { alarmAcks, flightAlarms } from '../db/schema';

/** The alarms of this flight the member has acknowledged. */
export async function alarmsAckedBy(userId: string, flightId: string): Promise<string[]> {
	const rows = await db
		.select({ id: alarmAcks.alarmId })
		.from(alarmAcks)
		.innerJoin(flightAlarms, eq(flightAlarms.id, alarmAcks.alarmId))
		.where(and(eq(alarmAcks.userId, userId), eq(flightAlarms.flightId, flightId)));
	return rows.map((r) => r.id);
}

/** Records the member's acknowledgement (again is fine); false when the alarm is not on this flight. */
export async function acknowledgeAlarm(flightId: string, alarmId: string, userId: string): Promise<boolean> {
	const [alarm] = await db.select({ id: flightAlarms.id }).from(flightAlarms).where(and(eq(flightAlarms.id, alarmId), eq(flightAlarms.flightId, flightId)));
	if (!alarm) return false;
	await db.insert(alarmAcks).values({ alarmId: alarm.id, userId }).onConflictDoNothing();
	return true;
}
