// Whether the database answers, for the health endpoint.
import { sql } from 'drizzle-orm';
import { db } from './db';

export async function databaseReachable(): Promise<boolean> {
	try {
		await db.execute(sql`select 1`);
		return true;
	} catch {
		return false;
	}
}
