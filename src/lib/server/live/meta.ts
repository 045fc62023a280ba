// The flight's live state apart from its samples (status, declaration, fuel events, alarms), as
// the stream's meta event carries it. Read once per change per instance, whatever the viewers.
import { asc, eq } from 'drizzle-orm';
import { db } from '../db';
import { flightAlarms, flights, fuelEvents } from '../db/schema';
import type { MetaEvent } from '$lib/wire/live';
import { alarmAcksOf } from './acks';

export type FlightMeta = Omit<MetaEvent, 'v' | 'serverTime'>;

export async function loadMeta(flightId: string): Promise<FlightMeta | null> {
	const [f] = await db.select().from(flights).where(eq(flights.id, flightId)).limit(1);
	if (!f) return null;
	const [events, alarms, acks] = await Promise.all([
		db.select().from(fuelEvents).where(eq(fuelEvents.flightId, flightId)).orderBy(asc(fuelEvents.t), asc(fuelEvents.createdAt)),
		db.select().from(flightAlarms).where(eq(flightAlarms.flightId, flightId)).orderBy(asc(flightAlarms.raisedAt)),
		alarmAcksOf(flightId)
	]);
	return {
		flight: {
			id: f.id,
			title: f.title,
			status: f.status,
			startedAt: f.startedAt.toISOString(),
			endedAt: f.endedAt?.toISOString() ?? null,
			lastSeq: f.lastSeq,
			firstSeq: f.firstSeq,
			receivedAt: f.sampleCount > 0 ? f.updatedAt.getTime() : null,
			declarationConfirmed: f.declarationConfirmed
		},
		declaration: f.declaration,
		previousOnBoardL: f.previousOnBoardL,
		events: events.map((e) => ({ id: e.id, t: e.t.getTime() / 1000, kind: e.kind, amountL: e.amountL, note: e.note })),
		alarms: alarms.map((a) => ({
			id: a.id,
			kind: a.kind,
			raisedAt: a.raisedAt.getTime() / 1000,
			clearedAt: a.clearedAt ? a.clearedAt.getTime() / 1000 : null,
			value: a.value,
			emailed: a.emailedAt !== null,
			mailedTo: a.mailedCount,
			acks: acks.filter((k) => k.alarmId === a.id).map((k) => ({ by: k.by, at: k.at }))
		}))
	};
}
