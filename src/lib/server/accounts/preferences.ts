// A user's own display preferences.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { users, type User } from '../db/schema';

/** The fuel unit the user reads figures in (null: each aircraft's own). */
export async function setPreferredFuelUnit(userId: string, unit: User['prefFuelUnit']): Promise<void> {
	await db.update(users).set({ prefFuelUnit: unit }).where(eq(users.id, userId));
}
