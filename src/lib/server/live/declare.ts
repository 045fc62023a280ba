// Setting or correcting the declaration from the live page (the pilot or an instructor, during the
// flight or after it closed): stored, confirmed, the stored figures recomputed, alarms brought in
// line, and every viewer told to recompute.
import { eq } from 'drizzle-orm';
import type { Declaration } from '$lib/fuel';
import { db } from '../db';
import { recordDeclarationChange, type Editor } from '../flights/corrections';
import { recomputeSummary } from '../flights/summary';
import { aircraft, flights } from '../db/schema';
import { mailAlarms, syncAlarms, type NewAlarm } from './alarms';
import { inBackground } from '../mail';
import { computationFor, dropComputation } from './computation';
import { lockFlight, notify } from './flights';

export async function setLiveDeclaration(flightId: string, declaration: Declaration, previousOnBoardL: number | null, by: Editor | null = null): Promise<void> {
	let toMail: NewAlarm[] = [];
	try {
		await db.transaction(async (tx) => {
			await lockFlight(tx, flightId);
			const [before] = await tx.select().from(flights).where(eq(flights.id, flightId)).for('update');
			const [f] = await tx
				.update(flights)
				.set({ declaration, previousOnBoardL, declarationConfirmed: true, updatedAt: new Date() })
				.where(eq(flights.id, flightId))
				.returning();
			if (!f) return;
			if (before) await recordDeclarationChange(tx, before, f, by);
			if (f.status === 'open' && f.source === 'live') {
				const [a] = await tx.select().from(aircraft).where(eq(aircraft.id, f.aircraftId));
				const computed = await computationFor(tx, f, a);
				toMail = (await syncAlarms(tx, f, computed)).toMail;
			}
			await recomputeSummary(f.id, tx);
			await notify(tx, { f: f.id, s: f.lastSeq, at: Date.now(), m: 1 });
		});
	} catch (error) {
		dropComputation(flightId);
		throw error;
	}
	if (toMail.length > 0)
		inBackground('live alarm mail', async () => {
			await mailAlarms(flightId, toMail);
		});
}

/**
 * Tells every instance's viewers that the flight changed (an acknowledgement, a watch, a correction
 * saved on the replay page). Cached live computations notice changed inputs by themselves.
 */
export async function announceChange(flightId: string): Promise<void> {
	const [f] = await db.select({ lastSeq: flights.lastSeq }).from(flights).where(eq(flights.id, flightId));
	if (f) await notify(db, { f: flightId, s: f.lastSeq, at: Date.now(), m: 1 });
}
