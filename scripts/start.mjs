// `npm start` (build and serve) and `npm run dev` (vite dev server): the one-command bootstrap.
// Installs npm packages and PostgreSQL when missing, starts the project's own database and the
// fake mail server, migrates, loads the demo data, then serves the app on 127.0.0.1.
//
// Uses only Node's built-ins until node_modules exists. Ctrl-C stops the app and the mail sink;
// PostgreSQL keeps running until `npm run db:stop`.
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { buildStaleReason, ensureKitSync, viteBuild } from './lib/build.mjs';
import { StepError, info, now, report, seconds, warn } from './lib/log.mjs';
import { ensureNodeModules } from './lib/npm.mjs';
import { bin, inRoot, shortPath } from './lib/paths.mjs';
import { redact } from './lib/pgclient.mjs';
import { clusterSettings, ensureCluster } from './lib/postgres.mjs';
import { onSignals, requireFreePort, runOk, startService, stopAll, waitForPort } from './lib/proc.mjs';

const usage = `Usage: npm start [-- --build]    build (when sources changed) and serve the app
       npm run dev                 the same bootstrap, then the vite dev server
Options: --build  always run vite build    --help  this text`;

const { values: opts } = (() => {
	try {
		return parseArgs({ options: { dev: { type: 'boolean' }, build: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } } });
	} catch (error) {
		console.error(`${error.message}\n${usage}`);
		process.exit(2);
	}
})();
if (opts.help) {
	console.log(usage);
	process.exit(0);
}

let serving = false;
// Set on Ctrl-C: children then exit (or fail) because of the signal, which is no error to report.
let stopping = false;
onSignals(async () => {
	stopping = true;
	info(serving ? 'stopping the app and the mail sink (PostgreSQL keeps running; npm run db:stop stops it)…' : 'interrupted');
	await stopAll();
	process.exit(serving ? 0 : 130);
});

async function main() {
	const started = now();
	const appPort = Number(process.env.PORT || 5180);
	const origin = process.env.ORIGIN || `http://127.0.0.1:${appPort}`;
	const useSink = !process.env.SMTP_HOST;
	const smtpPort = Number(process.env.SMTP_PORT || 2525);

	// Fail before any slow step when a second copy is already running.
	await requireFreePort(appPort, 'the app', 'Is Burndown already running (another npm start)? Stop it with Ctrl-C, or set PORT.');
	if (useSink) await requireFreePort(smtpPort, 'the mail sink', 'Is another npm start running? Stop it, or set SMTP_PORT.');

	await ensureNodeModules();
	await ensureKitSync();

	let databaseUrl = process.env.DATABASE_URL;
	if (databaseUrl) {
		info(`database: DATABASE_URL is set (${redact(databaseUrl)}); starting no PostgreSQL`);
	} else {
		const { port, dataDir } = clusterSettings({ prefix: 'burndown-pg', portVar: 'BURNDOWN_PGPORT', dataVar: 'BURNDOWN_PGDATA', defaultPort: 54329 });
		const cluster = await ensureCluster({ label: 'database', port, dataDir, appDatabase: 'burndown' });
		databaseUrl = cluster.appUrl('burndown');
		// A loopback-only cluster with a generated password: shown so psql or drizzle-kit can use it.
		info(`database: DATABASE_URL=${databaseUrl}`);
	}

	const mailboxDir = path.resolve(process.env.MAILBOX_DIR || inRoot('.data', 'mailbox'));
	// ORIGIN too, so the seed's messages and e-mailed links name the address actually served.
	const env = { ...process.env, DATABASE_URL: databaseUrl, MAILBOX_DIR: mailboxDir, ORIGIN: origin, BURNDOWN_DEMO: process.env.BURNDOWN_DEMO ?? '1' };
	const services = [];
	// The sink starts (tsx, about a second) while migrations and the demo data run.
	let sinkReady = Promise.resolve();
	if (useSink) {
		const t = now();
		env.SMTP_HOST = '127.0.0.1';
		env.SMTP_PORT = String(smtpPort);
		const sink = startService(bin('tsx'), ['scripts/mail-sink.ts', '--port', String(smtpPort), '--dir', mailboxDir], {
			env: { ...env, BURNDOWN_PARENT_PID: String(process.pid) }
		});
		services.push({ name: 'mail sink', ...sink });
		sinkReady = waitForPort(smtpPort, { exited: sink.exited, what: 'the mail sink', timeoutMs: 20_000 }).then(() =>
			info(`mail: fake SMTP server on 127.0.0.1:${smtpPort}, messages in ${shortPath(mailboxDir)} (${seconds(t)})`)
		);
		// Reported where it is awaited; this only keeps an early failure from being "unhandled".
		sinkReady.catch(() => {});
	} else {
		info(`mail: SMTP_HOST is set (${process.env.SMTP_HOST}); starting no mail sink`);
	}

	let t = now();
	await runOk('migrations (scripts/migrate.ts)', bin('tsx'), ['scripts/migrate.ts'], { env });
	info(`migrations done (${seconds(t)})`);
	t = now();
	await runOk('stored figures (scripts/refresh-derived.ts)', bin('tsx'), ['scripts/refresh-derived.ts'], { env });
	info(`stored figures checked (${seconds(t)})`);

	// The seed sends mail (the demo flight followed live e-mails its alarms): the sink must answer.
	await sinkReady;
	if (fs.existsSync(inRoot('scripts', 'seed.ts'))) {
		t = now();
		await runOk('demo data (scripts/seed.ts)', bin('tsx'), ['scripts/seed.ts'], { env });
		info(`demo data step done (${seconds(t)})`);
	} else {
		warn('scripts/seed.ts is missing: no demo data loaded');
	}

	const watchdog = ['--import', pathToFileURL(inRoot('scripts', 'lib', 'exit-with-parent.mjs')).href];
	let app;
	if (opts.dev) {
		app = startService(process.execPath, [...watchdog, inRoot('node_modules', 'vite', 'bin', 'vite.js'), 'dev', '--host', '127.0.0.1', '--port', String(appPort), '--strictPort'], {
			env: { ...env, BURNDOWN_PARENT_PID: String(process.pid) },
			stdin: 'inherit'
		});
	} else {
		const stale = opts.build ? 'asked for with --build' : buildStaleReason();
		if (stale) {
			info(`build needed: ${stale}`);
			await viteBuild(env);
		} else {
			info('build/ is newer than every source file: serving it as it is (npm start -- --build rebuilds)');
		}
		app = startService(process.execPath, [...watchdog, 'build'], {
			env: {
				...env,
				BURNDOWN_PARENT_PID: String(process.pid),
				PORT: String(appPort),
				HOST: '127.0.0.1',
				// The app limits uploads to 100 MB itself; adapter-node's own limit must sit above that.
				BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT || '110M',
				// Open live streams would otherwise hold Ctrl-C for adapter-node's default 30 s.
				SHUTDOWN_TIMEOUT: process.env.SHUTDOWN_TIMEOUT || '5'
			}
		});
	}
	await waitForPort(appPort, { exited: app.exited, what: opts.dev ? 'vite dev' : 'the app (node build)', timeoutMs: 60_000 });
	services.push({ name: opts.dev ? 'vite dev' : 'app', ...app });
	serving = true;
	const url = opts.dev ? `http://127.0.0.1:${appPort}` : origin;
	info(`ready in ${seconds(started)}`);
	console.log(`\n  Burndown is running at ${url}\n  Ctrl-C stops it; PostgreSQL keeps running until: npm run db:stop\n`);

	// If any service dies on its own, stop the rest and pass its failure on.
	const first = await Promise.race(services.map((s) => s.exited.then((r) => ({ ...r, name: s.name }))));
	if (stopping) return;
	serving = false;
	await stopAll();
	throw new StepError(`${first.name} stopped unexpectedly (${first.signal ? `signal ${first.signal}` : `exit ${first.code}`})`);
}

main().catch(async (error) => {
	if (stopping) return;
	const status = report(error);
	await stopAll();
	process.exit(status);
});
