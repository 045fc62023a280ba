// SQL from the start and test scripts: the `pg` driver loaded from the repository's node_modules
// (so this file can be imported before `npm ci` has run), quoting, and database URL helpers.
import { createRequire } from 'node:module';
import { inRoot } from './paths.mjs';
import { StepError } from './log.mjs';

let pg;

function driver() {
	pg ??= createRequire(inRoot('package.json'))('pg');
	return pg;
}

/** The URL with its password replaced, for messages. */
export function redact(url) {
	try {
		const u = new URL(url);
		if (u.password) u.password = '***';
		return u.toString();
	} catch {
		return '(unparseable URL)';
	}
}

/** The same server and credentials, another database. */
export function withDatabase(url, database) {
	const u = new URL(url);
	u.pathname = `/${encodeURIComponent(database)}`;
	return u.toString();
}

export function databaseName(url) {
	return decodeURIComponent(new URL(url).pathname.replace(/^\//, ''));
}

export function ident(name) {
	return `"${name.replace(/"/g, '""')}"`;
}

export function literal(value) {
	return `'${value.replace(/'/g, "''")}'`;
}

/** Opens one connection, runs `fn(client)`, always closes it. */
export async function withClient(url, fn) {
	const client = new (driver().Client)({ connectionString: url, connectionTimeoutMillis: 10_000 });
	try {
		await client.connect();
	} catch (error) {
		throw new StepError(`cannot connect to PostgreSQL at ${redact(url)}: ${error.message}`);
	}
	try {
		return await fn(client);
	} finally {
		await client.end().catch(() => {});
	}
}

/** Creates the login role (or resets its password and rights) and, if named, its own database. */
export async function ensureRoleAndDatabase(superUrl, { user, password, database, createdb = false }) {
	await withClient(superUrl, async (client) => {
		const exists = (await client.query('SELECT 1 FROM pg_roles WHERE rolname = $1', [user])).rowCount > 0;
		const rights = `LOGIN ${createdb ? 'CREATEDB' : 'NOCREATEDB'} PASSWORD ${literal(password)}`;
		await client.query(`${exists ? 'ALTER' : 'CREATE'} ROLE ${ident(user)} WITH ${rights}`);
		if (database) {
			const dbExists = (await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database])).rowCount > 0;
			if (!dbExists) await client.query(`CREATE DATABASE ${ident(database)} OWNER ${ident(user)}`);
		}
	});
}

/** Drops (closing its connections) and creates a database, owned by the connecting role. */
export async function recreateDatabase(adminUrl, database) {
	await withClient(adminUrl, async (client) => {
		await client.query(`DROP DATABASE IF EXISTS ${ident(database)} WITH (FORCE)`);
		await client.query(`CREATE DATABASE ${ident(database)}`);
	});
}
