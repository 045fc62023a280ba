// A flight's notes as its page lists them, oldest first, with their authors' names.
import { asc, eq } from 'drizzle-orm';
import { db } from '../db';
import { flightNotes, users } from '../db/schema';

export async function listNotes(flightId: string) {
	return db
		.select({ id: flightNotes.id, t: flightNotes.t, body: flightNotes.body, createdAt: flightNotes.createdAt, editedAt: flightNotes.editedAt, authorId: flightNotes.authorId, author: users.name })
		.from(flightNotes)
		.leftJoin(users, eq(users.id, flightNotes.authorId))
		.where(eq(flightNotes.flightId, flightId))
		.orderBy(asc(flightNotes.createdAt));
}
