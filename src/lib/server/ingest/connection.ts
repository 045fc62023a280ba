// The upload's own database connection: one of the few that uploads may hold at once
// (uploadConnections), checked out of the pool for a single transaction, so its COPY streams and
// queries run on one connection at the speed of the disk.
import { drizzle } from 'drizzle-orm/node-postgres';
import type pg from 'pg';
import { pool } from '../db';
import * as schema from '../db/schema';
import { uploadConnections } from '../limits';

export type UploadDb = ReturnType<typeof drizzle<typeof schema, pg.PoolClient>>;

/**
 * Runs `work` in one transaction on an upload connection. It commits when `commit(result)` says
 * so and rolls back otherwise, or when `work` throws (which is then thrown on).
 */
export async function inUploadTransaction<T>(work: (client: pg.PoolClient, db: UploadDb) => Promise<T>, commit: (result: T) => boolean): Promise<T> {
	const releaseSlot = await uploadConnections.acquire();
	let client: pg.PoolClient;
	try {
		client = await pool.connect();
	} catch (error) {
		releaseSlot();
		throw error;
	}
	let clientBroken = false;
	// A checked-out client has no 'error' listener of the pool's: without this one, a connection
	// dropped by the server mid-transaction would be an unhandled error that ends the process.
	const onClientError = (e: Error) => {
		clientBroken = true;
		console.error('[upload] database connection failed', e.message);
	};
	client.on('error', onClientError);
	try {
		await client.query('BEGIN');
		const result = await work(client, drizzle(client, { schema, casing: 'snake_case' }));
		await client.query(commit(result) ? 'COMMIT' : 'ROLLBACK');
		return result;
	} catch (error) {
		try {
			await client.query('ROLLBACK');
		} catch {
			clientBroken = true;
		}
		throw error;
	} finally {
		client.off('error', onClientError);
		client.release(clientBroken ? new Error('connection left in an unknown state') : undefined);
		releaseSlot();
	}
}
