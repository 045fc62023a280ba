// The one Drizzle client. The pool connects on first query, so importing this module is cheap
// (build-time analysis, tests that set DATABASE_URL in their setup file first).
import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { serverConfig } from '../config';
import * as schema from './schema';

// timestamptz as Date is Drizzle's job; leave pg's default parsers alone except int8 counts.
pg.types.setTypeParser(20, (v) => Number(v));

const config = serverConfig();
export const pool = new pg.Pool({
	connectionString: config.DATABASE_URL,
	max: config.DATABASE_POOL_MAX
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
