// Applies the committed SQL migrations in drizzle/ to the database in DATABASE_URL, over one
// connection, holding an advisory lock so two app instances starting at once do not race.
//
//   DATABASE_URL=postgres://… tsx scripts/migrate.ts
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';

const migrationsFolder = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', 'drizzle');
// Any fixed number: it only has to be the same for every copy of this script.
const LOCK_KEY = 7_300_421;

function fail(message: string): never {
	console.error(`migrate: ${message}`);
	process.exit(1);
}

/** Applied migrations so far; 0 before the first run created drizzle's own table. */
async function appliedCount(client: pg.Client): Promise<number> {
	const exists = await client.query("SELECT to_regclass('drizzle.__drizzle_migrations') IS NOT NULL AS ok");
	if (!exists.rows[0].ok) return 0;
	const count = await client.query('SELECT count(*)::int AS n FROM drizzle.__drizzle_migrations');
	return count.rows[0].n;
}

const url = process.env.DATABASE_URL;
if (!url) fail('DATABASE_URL is not set (npm start and npm test set it; or export it yourself)');
if (!fs.existsSync(path.join(migrationsFolder, 'meta', '_journal.json'))) {
	fail(`no migrations in ${migrationsFolder} (drizzle/meta/_journal.json missing): run npm run db:generate`);
}

const client = new pg.Client({ connectionString: url });
try {
	await client.connect();
} catch (error) {
	fail(`cannot connect to ${new URL(url).host}: ${(error as Error).message}`);
}
try {
	await client.query('SELECT pg_advisory_lock($1)', [LOCK_KEY]);
	const before = await appliedCount(client);
	await migrate(drizzle(client), { migrationsFolder });
	const after = await appliedCount(client);
	const database = decodeURIComponent(new URL(url).pathname.slice(1));
	console.log(`migrate: ${database} is up to date (${after} migration${after === 1 ? '' : 's'}, ${after - before} new)`);
} catch (error) {
	const cause = (error as Error).cause as Error | undefined;
	console.error(`migrate: failed: ${(error as Error).message}${cause ? `\n  cause: ${cause.message}` : ''}`);
	process.exitCode = 1;
} finally {
	await client.end().catch(() => {});
}
