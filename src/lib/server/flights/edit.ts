// Changes to a flight's fuel inputs and notes. Each change, its line in the audit trail and the
// recomputed summary commit in one transaction, so the lists never show figures from before a
// correction and no correction goes unrecorded.
import { utcDateTime } from '$lib/format';
import { and, eq, max, min } from 'drizzle-orm';
import type { DeclarationInput, FuelEventInput, NoteInput } from '$lib/schemas/flight';
import { db } from '../db';
import { flightNotes, flights, fuelEvents, samples, type Flight } from '../db/schema';
import { eventSnapshot, recordCorrection, recordDeclarationChange, type Editor } from './corrections';
import { recomputeSummary } from './summary';
import { announceChange } from '../live/declare';

export type { Editor };
export type EditResult = { ok: true } | { ok: false; field: string; message: string };

/** How far outside the recorded samples a fuel event may lie (a refuel before or after them). */
export const EVENT_MARGIN_H = 6;

export async function saveDeclaration(flight: Pick<Flight, 'id'>, input: DeclarationInput, by: Editor): Promise<EditResult> {
	await db.transaction(async (tx) => {
		const [before] = await tx.select().from(flights).where(eq(flights.id, flight.id)).for('update');
		const [after] = await tx
			.update(flights)
			.set({ declaration: input.declaration, previousOnBoardL: input.previousOnBoardL, declarationConfirmed: true, updatedAt: new Date() })
			.where(eq(flights.id, flight.id))
			.returning();
		if (before && after) await recordDeclarationChange(tx, before, after, by);
		await recomputeSummary(flight.id, tx);
	});
	await announceChange(flight.id);
	return { ok: true };
}

export async function addFuelEvent(flight: Pick<Flight, 'id' | 'startedAt'>, input: FuelEventInput, by: Editor): Promise<EditResult> {
	const [range] = await db.select({ first: min(samples.t), last: max(samples.t) }).from(samples).where(eq(samples.flightId, flight.id));
	const first = range?.first ?? flight.startedAt;
	const last = range?.last ?? flight.startedAt;
	const margin = EVENT_MARGIN_H * 3600_000;
	if (input.t.getTime() < first.getTime() - margin || input.t.getTime() > last.getTime() + margin) {
		const fmt = (d: Date) => utcDateTime(d);
		return { ok: false, field: 'at', message: `Choose a time between ${fmt(new Date(first.getTime() - margin))} and ${fmt(new Date(last.getTime() + margin))} UTC (this flight's samples, ± ${EVENT_MARGIN_H} h).` };
	}
	await db.transaction(async (tx) => {
		const [row] = await tx.insert(fuelEvents).values({ flightId: flight.id, t: input.t, kind: input.kind, amountL: input.amountL, note: input.note, createdBy: by.userId }).returning();
		await recordCorrection(tx, { flightId: flight.id, userId: by.userId, kind: 'eventAdded', before: null, after: eventSnapshot(row), reason: by.reason });
		await recomputeSummary(flight.id, tx);
	});
	await announceChange(flight.id);
	return { ok: true };
}

export async function removeFuelEvent(flight: Pick<Flight, 'id'>, eventId: string, by: Editor): Promise<EditResult> {
	const result = await db.transaction(async (tx) => {
		const [gone] = await tx.delete(fuelEvents).where(and(eq(fuelEvents.id, eventId), eq(fuelEvents.flightId, flight.id))).returning();
		if (!gone) return { ok: false, field: 'id', message: 'That fuel event is not on this flight (perhaps removed already).' } as const;
		await recordCorrection(tx, { flightId: flight.id, userId: by.userId, kind: 'eventRemoved', before: eventSnapshot(gone), after: null, reason: by.reason });
		await recomputeSummary(flight.id, tx);
		return { ok: true } as const;
	});
	if (result.ok) await announceChange(flight.id);
	return result;
}

export async function addNote(flight: Pick<Flight, 'id'>, input: NoteInput, userId: string): Promise<EditResult> {
	await db.insert(flightNotes).values({ flightId: flight.id, authorId: userId, t: input.at, body: input.body });
	return { ok: true };
}

/** Authors remove their own notes; whoever may edit any flight may remove any note. */
export async function removeNote(flight: Pick<Flight, 'id'>, noteId: string, userId: string, mayRemoveAny: boolean): Promise<EditResult> {
	const where = mayRemoveAny
		? and(eq(flightNotes.id, noteId), eq(flightNotes.flightId, flight.id))
		: and(eq(flightNotes.id, noteId), eq(flightNotes.flightId, flight.id), eq(flightNotes.authorId, userId));
	const gone = await db.delete(flightNotes).where(where).returning({ id: flightNotes.id });
	if (gone.length === 0) return { ok: false, field: 'id', message: 'That note is not yours to remove, or it is gone already.' };
	return { ok: true };
}

/** Authors edit their own notes (text and moment); whoever may edit any flight may edit any note. */
export async function editNote(flight: Pick<Flight, 'id'>, noteId: string, input: NoteInput, userId: string, mayEditAny: boolean): Promise<EditResult> {
	const where = mayEditAny
		? and(eq(flightNotes.id, noteId), eq(flightNotes.flightId, flight.id))
		: and(eq(flightNotes.id, noteId), eq(flightNotes.flightId, flight.id), eq(flightNotes.authorId, userId));
	const done = await db.update(flightNotes).set({ body: input.body, t: input.at, editedAt: new Date() }).where(where).returning({ id: flightNotes.id });
	if (done.length === 0) return { ok: false, field: 'id', message: 'That note is not yours to change, or it is gone.' };
	return { ok: true };
}
