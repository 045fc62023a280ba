// The one Drizzle client. The pool connects on first query, so importing this module is cheap
// (build-time analysis, tests that set DATABASE_URL in their setup file first).
import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';

// timestamptz as Date is Drizzle's job; leave pg's default parsers alone except int8 counts.
pg.types.setTypeParser(20, (v) => Number(v));

export const pool = new pg.Pool({
	connectionString: process.env.DATABASE_URL,
	max: Number(process.env.DATABASE_POOL_MAX ?? 10)
});
pool.on('error', (err) => console.error('[db] idle client error', err.message));

export const db = drizzle(pool, { schema, casing: 'snake_case' });
export type Db = typeof db;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

let closed = false;
export async function closeDb(): Promise<void> {
	if (closed) return;
	closed = true;
	await pool.end();
}
