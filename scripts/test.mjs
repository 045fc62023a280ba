// `npm test`: the start bootstrap against a separate, disposable test cluster, then every test:
// vitest unit tests, vitest integration tests (each file on its own clone of a migrated template
// database) and Playwright end-to-end tests against the built app in Debian's Chromium.
//
//   npm test                          all stages
//   npm test -- --only unit           one stage (or a list: --only unit,integration)
//   npm test -- --only e2e -- sign-up other arguments go to vitest / playwright as they are
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ensureKitSync, viteBuild } from './lib/build.mjs';
import { acquireLock } from './lib/lock.mjs';
import { StepError, info, now, report, seconds } from './lib/log.mjs';
import { ensureNodeModules } from './lib/npm.mjs';
import { bin, inRoot } from './lib/paths.mjs';
import { ident, redact, withClient, withDatabase, recreateDatabase } from './lib/pgclient.mjs';
import { clusterSettings, ensureCluster } from './lib/postgres.mjs';
import { onSignals, requireFreePort, run, runOk, startService, stopAll, waitForPort } from './lib/proc.mjs';
import { aptInstall, uid } from './lib/system.mjs';

const STAGES = ['unit', 'integration', 'e2e'];
const TEMPLATE_DB = 'burndown_template';
const E2E_DB = 'burndown_e2e';
const SINK_PORT = 2535;
const E2E_PORT = 4173;
const CHROMIUM = '/usr/bin/chromium';
// The debrief PDF test turns pages into PNGs and reads their text with Debian's poppler-utils.
const PDFTOPPM = '/usr/bin/pdftoppm';
const TEST_BUILD_DIR = 'build-test';

const usage = `Usage: npm test [-- --only ${STAGES.join('|')}[,…]] [-- arguments for vitest / playwright]`;

/** --only picks stages; everything else is handed to the test runners untouched. */
function parseCommandLine(argv) {
	let only = null;
	const passThrough = [];
	for (let i = 0; i < argv.length; i++) {
		const arg = argv[i];
		if (arg === '--help' || arg === '-h') {
			console.log(usage);
			process.exit(0);
		} else if (arg === '--only' || arg.startsWith('--only=')) {
			const value = arg === '--only' ? argv[++i] : arg.slice('--only='.length);
			only = (value ?? '').split(',').filter(Boolean);
			const unknown = only.filter((s) => !STAGES.includes(s));
			if (only.length === 0 || unknown.length > 0) {
				console.error(`unknown stage "${unknown.join(',') || value || ''}"\n${usage}`);
				process.exit(2);
			}
		} else if (arg === '--') {
			passThrough.push(...argv.slice(i + 1));
			break;
		} else {
			passThrough.push(arg);
		}
	}
	return { stages: STAGES.filter((s) => !only || only.includes(s)), passThrough };
}

const { stages, passThrough } = parseCommandLine(process.argv.slice(2));
const results = [];
let workDir = null;

let stopping = false;
onSignals(async () => {
	stopping = true;
	info('interrupted: stopping the test services');
	await stopAll(3000);
	cleanUp();
	process.exit(130);
});

function cleanUp() {
	if (workDir) fs.rmSync(workDir, { recursive: true, force: true });
	workDir = null;
}

/** Test counts from a runner's JSON report; null when the runner wrote none (it crashed). */
function readCounts(file, kind) {
	let json;
	try {
		json = JSON.parse(fs.readFileSync(file, 'utf8'));
	} catch {
		return null;
	}
	if (kind === 'vitest') {
		return { passed: json.numPassedTests, failed: json.numFailedTests, skipped: json.numPendingTests + json.numTodoTests };
	}
	const s = json.stats ?? {};
	return { passed: (s.expected ?? 0) + (s.flaky ?? 0), failed: s.unexpected ?? 0, skipped: s.skipped ?? 0 };
}

async function stage(name, fn) {
	const started = now();
	console.log(`\n── ${name} ${'─'.repeat(Math.max(0, 60 - name.length))}`);
	try {
		const outcome = (await fn()) ?? {};
		results.push({ name, ok: outcome.ok !== false, time: seconds(started), ...outcome });
	} catch (error) {
		if (stopping) throw error;
		report(error);
		results.push({ name, ok: false, time: seconds(started), note: error.message });
	}
	return results.at(-1).ok;
}

/** Drops what earlier (possibly killed) runs left, then creates and migrates the template. */
async function prepareTemplate(adminUrl, env) {
	await withClient(adminUrl, async (client) => {
		const { rows } = await client.query(
			`SELECT datname FROM pg_database WHERE datname LIKE 'bt\\_%' OR datname IN ($1, $2)`,
			[TEMPLATE_DB, E2E_DB]
		);
		for (const { datname } of rows) await client.query(`DROP DATABASE IF EXISTS ${ident(datname)} WITH (FORCE)`);
		await client.query(`CREATE DATABASE ${ident(TEMPLATE_DB)}`);
	});
	await runOk('migrating the template database', bin('tsx'), ['scripts/migrate.ts'], { env: { ...env, DATABASE_URL: withDatabase(adminUrl, TEMPLATE_DB) } });
	// CREATE DATABASE … TEMPLATE refuses while anyone is connected to the template: lock others out.
	await withClient(adminUrl, (client) => client.query(`ALTER DATABASE ${ident(TEMPLATE_DB)} WITH ALLOW_CONNECTIONS false`));
}

/**
 * The runner's own arguments. A filter that matches nothing in one stage is no failure of that
 * stage; without arguments (as in CI) a stage that finds no test fails.
 */
function filterArgs(passWithNoTests) {
	return passThrough.length > 0 ? [passWithNoTests, ...passThrough] : [];
}

async function vitestStage(project, env, reports) {
	const reportFile = path.join(reports, `${project}.json`);
	const result = await run(
		bin('vitest'),
		['run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${reportFile}`, ...filterArgs('--passWithNoTests')],
		{ env }
	);
	const counts = readCounts(reportFile, 'vitest');
	return { ok: result.code === 0, counts, note: result.code === 0 ? undefined : `vitest exit ${result.code ?? result.signal}` };
}

async function e2eStage(env, adminUrl, reports) {
	if (!fs.existsSync(CHROMIUM)) {
		await aptInstall(['chromium'], `Chromium for the end-to-end tests is missing (${CHROMIUM})`);
	}
	if (!fs.existsSync(PDFTOPPM)) {
		await aptInstall(['poppler-utils'], `poppler-utils for the debrief PDF test is missing (${PDFTOPPM})`);
	}
	// Its own output folder, so a test run never swaps files under an app that npm start serves.
	env = { ...env, BURNDOWN_BUILD_DIR: TEST_BUILD_DIR };
	await viteBuild(env);
	const t = now();
	const e2eUrl = withDatabase(adminUrl, E2E_DB);
	await recreateDatabase(adminUrl, E2E_DB);
	const e2eEnv = { ...env, DATABASE_URL: e2eUrl };
	await runOk(`migrating ${E2E_DB}`, bin('tsx'), ['scripts/migrate.ts'], { env: e2eEnv });
	if (!fs.existsSync(inRoot('scripts', 'seed.ts'))) throw new StepError('scripts/seed.ts is missing: the end-to-end tests need the demo data');
	await runOk(`loading the demo data into ${E2E_DB}`, bin('tsx'), ['scripts/seed.ts'], { env: e2eEnv });
	info(`${E2E_DB} recreated, migrated and seeded (${seconds(t)})`);
	// Mail from the integration tests would only clutter the mailbox page the browser tests read.
	for (const f of fs.readdirSync(env.MAILBOX_DIR)) fs.rmSync(path.join(env.MAILBOX_DIR, f), { force: true });
	await requireFreePort(E2E_PORT, 'the end-to-end app server', 'Stop whatever serves it (a leftover node build?) and run again.');
	const reportFile = path.join(reports, 'e2e.json');
	const result = await run(bin('playwright'), ['test', '--reporter=list,json', ...filterArgs('--pass-with-no-tests')], {
		env: { ...e2eEnv, PLAYWRIGHT_JSON_OUTPUT_FILE: reportFile }
	});
	const counts = readCounts(reportFile, 'playwright');
	return { ok: result.code === 0, counts, note: result.code === 0 ? undefined : `playwright exit ${result.code ?? result.signal}` };
}

function printSummary() {
	console.log('\n── summary ' + '─'.repeat(52));
	const total = { passed: 0, failed: 0, skipped: 0 };
	for (const r of results) {
		const status = r.skipped ? 'skipped' : r.ok ? 'ok' : 'FAILED';
		const counts = r.counts ? `${r.counts.passed} passed, ${r.counts.failed} failed${r.counts.skipped ? `, ${r.counts.skipped} skipped` : ''}` : '';
		for (const k of Object.keys(total)) total[k] += r.counts?.[k] ?? 0;
		const detail = [counts, r.note].filter(Boolean).join('; ');
		console.log(`  ${r.name.padEnd(12)} ${status.padEnd(8)} ${(r.time ?? '').padStart(8)}   ${detail}`);
	}
	console.log(`tests: ${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ''}`);
}

async function main() {
	const started = now();
	await acquireLock(path.join(os.tmpdir(), `burndown-test-${uid()}.lock`), { what: 'npm test' });

	let adminUrl;
	let env;
	let reports;
	const bootOk = await stage('bootstrap', async () => {
		await ensureNodeModules();
		await ensureKitSync();
		if (process.env.TEST_ADMIN_DATABASE_URL) {
			adminUrl = process.env.TEST_ADMIN_DATABASE_URL;
			info(`database: TEST_ADMIN_DATABASE_URL is set (${redact(adminUrl)}); starting no PostgreSQL`);
		} else {
			const { port, dataDir } = clusterSettings({ prefix: 'burndown-pgtest', portVar: 'BURNDOWN_TEST_PGPORT', dataVar: 'BURNDOWN_TEST_PGDATA', defaultPort: 54339 });
			const cluster = await ensureCluster({ label: 'test database', port, dataDir, fast: true, disposable: true, createdb: true });
			adminUrl = cluster.appUrl('postgres');
		}
		workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'burndown-test-'));
		reports = path.join(workDir, 'reports');
		const mailboxDir = path.join(workDir, 'mailbox');
		fs.mkdirSync(reports);
		fs.mkdirSync(mailboxDir);
		// The user's own database and mail settings must never reach a test.
		env = Object.fromEntries(Object.entries(process.env).filter(([k]) => k !== 'DATABASE_URL' && !k.startsWith('SMTP_')));
		Object.assign(env, {
			TEST_ADMIN_DATABASE_URL: adminUrl,
			TEST_TEMPLATE_DB: TEMPLATE_DB,
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: String(SINK_PORT),
			MAILBOX_DIR: mailboxDir,
			// Links in test e-mails point at the end-to-end server, whoever sends them.
			ORIGIN: `http://127.0.0.1:${E2E_PORT}`,
			BURNDOWN_DEMO: '1'
		});
		// The sink starts (tsx, about a second) while the template is migrated.
		let sinkReady = Promise.resolve();
		if (stages.some((s) => s !== 'unit')) {
			await requireFreePort(SINK_PORT, 'the test mail sink', 'Is a mail sink from an earlier test run still running? Stop it and run again.');
			const sink = startService(bin('tsx'), ['scripts/mail-sink.ts', '--port', String(SINK_PORT), '--dir', mailboxDir], {
				env: { ...env, BURNDOWN_PARENT_PID: String(process.pid) }
			});
			sinkReady = waitForPort(SINK_PORT, { exited: sink.exited, what: 'the test mail sink', timeoutMs: 20_000 });
			sinkReady.catch(() => {});
		}
		const t = now();
		await prepareTemplate(adminUrl, env);
		info(`${TEMPLATE_DB} recreated and migrated (${seconds(t)})`);
		await sinkReady;
	});

	if (bootOk) {
		for (const name of stages) {
			if (name === 'e2e') await stage('e2e', () => e2eStage(env, adminUrl, reports));
			else await stage(name, () => vitestStage(name, env, reports));
		}
	} else {
		for (const name of stages) results.push({ name, skipped: true, ok: false, note: 'bootstrap failed' });
	}

	await stopAll(3000);
	cleanUp();
	printSummary();
	const ok = results.every((r) => r.ok);
	info(`${ok ? 'all passed' : 'FAILED'} in ${seconds(started)}`);
	process.exit(ok ? 0 : 1);
}

main().catch(async (error) => {
	if (stopping) return;
	const status = report(error);
	await stopAll(3000);
	cleanUp();
	process.exit(status);
});
