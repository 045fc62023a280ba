// Runs before every integration test file (vitest setupFiles): gives the file its own database,
// cloned from the migrated template that scripts/test.mjs prepared, in DATABASE_URL before the
// file's imports run; afterwards closes the app's pool and drops the database.
import { randomBytes } from 'node:crypto';
import { afterAll } from 'vitest';
import pg from 'pg';

const adminUrl = process.env.TEST_ADMIN_DATABASE_URL;
const template = process.env.TEST_TEMPLATE_DB;
if (!adminUrl || !template) {
	throw new Error(
		'Integration tests need the test PostgreSQL that scripts/test.mjs starts (TEST_ADMIN_DATABASE_URL and TEST_TEMPLATE_DB are not set). Run: npm test -- --only integration'
	);
}

async function admin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: adminUrl });
	await client.connect();
	try {
		return await fn(client);
	} finally {
		await client.end();
	}
}

// Lower case letters and digits only, so the name needs no quoting anywhere.
const database = `bt_${Date.now().toString(36)}_${randomBytes(4).toString('hex')}`;
await admin((client) => client.query(`CREATE DATABASE ${database} TEMPLATE ${template}`));

const url = new URL(adminUrl);
url.pathname = `/${database}`;
process.env.DATABASE_URL = url.toString();
process.env.TEST_DATABASE_NAME = database;

afterAll(async () => {
	// The app's client reads DATABASE_URL lazily; close its pool so the database can be dropped
	// without forcing connections and the worker exits cleanly.
	try {
		const db = await import('$lib/server/db');
		if (typeof db.closeDb === 'function') await db.closeDb();
	} catch (error) {
		if ((error as NodeJS.ErrnoException).code !== 'ERR_MODULE_NOT_FOUND' && !/Cannot find module|Failed to load url/.test(String(error))) throw error;
	}
	if (process.env.KEEP_TEST_DB) {
		console.log(`KEEP_TEST_DB is set: keeping database ${database}`);
		return;
	}
	// FORCE ends the file's own connections; a server process of another role that happens to sit in
	// the database (a background worker) cannot be ended by us, so wait for it and try again. A
	// scratch database left behind is cleanup, not a test result: say so rather than fail the file.
	for (let attempt = 1; ; attempt++) {
		try {
			await admin((client) => client.query(`DROP DATABASE IF EXISTS ${database} WITH (FORCE)`));
			return;
		} catch (error) {
			if (attempt >= 10) {
				console.warn(`could not drop test database ${database}: ${String(error)}`);
				return;
			}
			await new Promise((resolve) => setTimeout(resolve, 500));
		}
	}
});
