// A user's own display preferences.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { users, type User } from '../db/schema';

/**
 * The fuel unit the user reads figures in (null: each aircraft's own) and the time zone of the
 * local time shown beside UTC (null: the browser's own zone).
 */
export async function setPreferences(userId: string, prefs: Pick<User, 'prefFuelUnit' | 'timeZone'>): Promise<void> {
	await db.update(users).set({ prefFuelUnit: prefs.prefFuelUnit, timeZone: prefs.timeZone }).where(eq(users.id, userId));
}
