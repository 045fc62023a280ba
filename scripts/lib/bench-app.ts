// The built app for a benchmark: builds it when sources changed, serves `node build` on a loopback
// port against the benchmark's own database, waits for /api/health, and stops it afterwards.
import { spawn, type ChildProcess } from 'node:child_process';
import { setTimeout as sleep } from 'node:timers/promises';
import pg from 'pg';
import { buildStaleReason, viteBuild } from './build.mjs';
import { inRoot } from './paths.mjs';
import { withDatabase } from './pgclient.mjs';
import { clusterSettings, ensureCluster } from './postgres.mjs';

/**
 * A freshly migrated database `name` on the project's disposable test cluster (or on the server
 * of BENCH_ADMIN_DATABASE_URL, a role that may create databases).
 */
export async function scratchDatabase(name: string): Promise<{ adminUrl: string; dbUrl: string }> {
	let adminUrl = process.env.BENCH_ADMIN_DATABASE_URL;
	if (!adminUrl) {
		const { port, dataDir } = clusterSettings({ prefix: 'burndown-pgtest', portVar: 'BURNDOWN_TEST_PGPORT', dataVar: 'BURNDOWN_TEST_PGDATA', defaultPort: 54339 });
		const cluster = await ensureCluster({ label: 'bench database', port, dataDir, fast: true, disposable: true, createdb: true });
		adminUrl = cluster.appUrl('postgres') as string;
	}
	const dbUrl = withDatabase(adminUrl, name);
	const c = new pg.Client({ connectionString: adminUrl });
	await c.connect();
	await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
	await c.query(`CREATE DATABASE ${name}`);
	await c.end();
	await new Promise<void>((resolve, reject) => {
		const p = spawn(inRoot('node_modules', '.bin', 'tsx'), ['scripts/migrate.ts'], { cwd: inRoot(), env: { ...process.env, DATABASE_URL: dbUrl }, stdio: 'inherit' });
		p.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`migrate exit ${code}`))));
	});
	return { adminUrl, dbUrl };
}

export interface BenchApp {
	server: ChildProcess;
	origin: string;
	stop(): Promise<void>;
}

export async function startBenchApp(opts: { databaseUrl: string; port: number; log: (line: string) => void; env?: Record<string, string> }): Promise<BenchApp> {
	const stale = buildStaleReason();
	if (stale) {
		opts.log(`building the app first (${stale})`);
		await viteBuild();
	}
	const origin = `http://127.0.0.1:${opts.port}`;
	// BENCH_NODE_ARGS: extra node options for the served app, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof".
	const nodeArgs = (process.env.BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean);
	const server = spawn(process.execPath, [...nodeArgs, 'build'], {
		cwd: inRoot(),
		// No mail leaves a benchmark: port 9 is discard.
		env: { ...process.env, DATABASE_URL: opts.databaseUrl, PORT: String(opts.port), HOST: '127.0.0.1', ORIGIN: origin, SHUTDOWN_TIMEOUT: '2', SMTP_HOST: '127.0.0.1', SMTP_PORT: '9', BURNDOWN_DEMO: '0', ...opts.env },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let serverLog = '';
	server.stdout!.on('data', (d) => (serverLog += d));
	server.stderr!.on('data', (d) => (serverLog += d));
	const stop = async () => {
		if (server.exitCode !== null) return;
		server.kill('SIGTERM');
		await Promise.race([new Promise((r) => server.once('exit', r)), sleep(5000)]);
		if (server.exitCode === null) server.kill('SIGKILL');
	};
	for (let i = 0; ; i++) {
		try {
			if ((await fetch(`${origin}/api/health`)).ok) break;
		} catch {
			/* not up yet */
		}
		if (i > 150 || server.exitCode !== null) {
			await stop();
			throw new Error(`the app did not start:\n${serverLog}`);
		}
		await sleep(100);
	}
	return { server, origin, stop };
}
