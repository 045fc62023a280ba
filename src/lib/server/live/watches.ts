// Watching an aircraft (its owner) or one flight (an instructor) for alarm e-mails.
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { watches } from '../db/schema';

export type WatchTarget = { aircraftId: string } | { flightId: string };

const where = (userId: string, t: WatchTarget) =>
	'aircraftId' in t ? and(eq(watches.userId, userId), eq(watches.aircraftId, t.aircraftId)) : and(eq(watches.userId, userId), eq(watches.flightId, t.flightId));

export async function isWatching(userId: string, t: WatchTarget): Promise<boolean> {
	const [w] = await db.select({ id: watches.id }).from(watches).where(where(userId, t)).limit(1);
	return !!w;
}

export async function setWatching(userId: string, t: WatchTarget, on: boolean): Promise<void> {
	if (on) await db.insert(watches).values({ userId, ...t }).onConflictDoNothing();
	else await db.delete(watches).where(where(userId, t));
}
