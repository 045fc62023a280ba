// Upload benchmark (npm run bench:upload): a 1,000,000-row recorder CSV uploaded through the real
// HTTP route of the built app (POST /api/v1/flights, multipart, as the upload page sends it), and
// in the same run the same rows loaded with psql \copy into a scratch table shaped like samples.
// Prints seconds, rows per second, the ratio to \copy, the server's peak memory, and the replay
// API's payload size and time for a 10-hour 1 Hz flight. A benchmark: it asserts nothing.
//
//   npm run bench:upload [-- --rows 1000000 --port 4193]
//
// Uses the project's PostgreSQL (the one npm start runs, settings unchanged) with a scratch
// database it drops afterwards, or BENCH_ADMIN_DATABASE_URL (a role that may create databases).
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { startBenchApp } from './lib/bench-app';
import { inRoot } from './lib/paths.mjs';
import { withDatabase } from './lib/pgclient.mjs';
import { clusterSettings, ensureCluster } from './lib/postgres.mjs';
import { hashToken, newToken } from '../src/lib/server/tokens';
import { LITRES_PER_US_GALLON } from '../src/lib/units';

const { values: opt } = parseArgs({
	options: {
		rows: { type: 'string', default: '1000000' },
		replay: { type: 'string', default: '36000' },
		port: { type: 'string', default: '4193' }
	}
});
const ROWS = Math.max(1000, Number(opt.rows));
const REPLAY_ROWS = Number(opt.replay);
const PORT = Number(opt.port);
const ORIGIN = `http://127.0.0.1:${PORT}`;
const BENCH_DB = 'burndown_bench_upload';
/** The targets, printed beside the figures. */
const TARGET_SECONDS = 5;
const TARGET_COPY_RATIO = 0.5;

const log = (s: string) => console.log(`bench:upload: ${s}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const s2 = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
const mib = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
const perSecond = (n: number, ms: number) => `${Math.round(n / (ms / 1000)).toLocaleString('en-US')} rows/s`;

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'burndown-bench-upload-'));
const cleanups: (() => Promise<void> | void)[] = [() => fs.rmSync(work, { recursive: true, force: true })];
async function cleanUp() {
	for (const f of cleanups.reverse()) await Promise.resolve(f()).catch((e) => console.error(`bench:upload: clean-up: ${(e as Error).message}`));
	cleanups.length = 0;
}
process.once('SIGINT', () => void cleanUp().then(() => process.exit(130)));

// ---- the files: our format for the upload, the same rows in canonical units for \copy ---------

const SCRATCH_FLIGHT = '00000000-0000-4000-8000-00000000b001';

/** A long cross-country at 1 Hz with a slow wiggle; deterministic. */
async function writeFiles(rows: number, csvPath: string, copyPath: string | null): Promise<number> {
	const csv = fs.createWriteStream(csvPath);
	const copy = copyPath ? fs.createWriteStream(copyPath) : null;
	const t0 = Date.UTC(2026, 4, 2, 6, 0, 0);
	let a = 'time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm,waypoint,latitude,longitude,altitude_ft\n';
	let b = '';
	const flush = async (force = false) => {
		if (!force && a.length < 1 << 20) return;
		if (!csv.write(a)) await new Promise((r) => csv.once('drain', r));
		if (copy && !copy.write(b)) await new Promise((r) => copy.once('drain', r));
		a = '';
		b = '';
	};
	for (let i = 0; i < rows; i++) {
		const time = new Date(t0 + i * 1000).toISOString().slice(0, 19) + 'Z';
		const flow = (9 + 0.6 * Math.sin(i / 37)).toFixed(2);
		const gs = i < 300 ? (i % 20).toFixed(1) : (108 + 2 * Math.sin(i / 53)).toFixed(1);
		const leg = Math.floor(i / 1800);
		const dtg = (60 - ((i % 1800) * 60) / 1800).toFixed(2);
		const wpt = `WP${String(leg % 1000).padStart(3, '0')}`;
		const lat = (47 + (i % 36000) * 1e-5).toFixed(5);
		const lon = (-31 + (i % 36000) * 1e-5).toFixed(5);
		const alt = String(4500 + Math.round(50 * Math.sin(i / 71)));
		a += `${time},${flow},${gs},${dtg},${wpt},${lat},${lon},${alt}\n`;
		// The same sample as the upload stores it: flow in L/h (1 US gal = 3.785411784 L, NIST HB 44).
		if (copy) b += `${SCRATCH_FLIGHT},${i},${time},${Number(flow) * LITRES_PER_US_GALLON},${gs},${dtg},${wpt},${lat},${lon},${alt}\n`;
		await flush();
	}
	await flush(true);
	await new Promise((r) => csv.end(r));
	if (copy) await new Promise((r) => copy.end(r));
	return fs.statSync(csvPath).size;
}

// ---- database, app, user --------------------------------------------------------------------

let adminUrl = process.env.BENCH_ADMIN_DATABASE_URL;
if (!adminUrl) {
	const { port, dataDir } = clusterSettings({ prefix: 'burndown-pg', portVar: 'BURNDOWN_PGPORT', dataVar: 'BURNDOWN_PGDATA', defaultPort: 54329 });
	const cluster = await ensureCluster({ label: 'database', port, dataDir, appDatabase: 'burndown' });
	adminUrl = cluster.superUrl as string;
}
const dbUrl = withDatabase(adminUrl, BENCH_DB);

async function sql<T extends pg.QueryResultRow = pg.QueryResultRow>(url: string, text: string, params: unknown[] = []): Promise<T[]> {
	const c = new pg.Client({ connectionString: url });
	await c.connect();
	try {
		return (await c.query<T>(text, params)).rows;
	} finally {
		await c.end();
	}
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env): Promise<{ code: number; out: string }> {
	return new Promise((resolve) => {
		const p = spawn(cmd, args, { cwd: inRoot(), env, stdio: ['ignore', 'pipe', 'pipe'] });
		let out = '';
		p.stdout.on('data', (d) => (out += d));
		p.stderr.on('data', (d) => (out += d));
		p.on('exit', (code) => resolve({ code: code ?? 1, out }));
	});
}

try {
	await sql(adminUrl, `DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
	await sql(adminUrl, `CREATE DATABASE ${BENCH_DB}`);
	cleanups.push(() => void sql(adminUrl!, `DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`));
	const migrated = await run(inRoot('node_modules', '.bin', 'tsx'), ['scripts/migrate.ts'], { ...process.env, DATABASE_URL: dbUrl });
	if (migrated.code !== 0) throw new Error(`migrate failed:\n${migrated.out}`);

	const token = newToken('bdk_');
	const [org] = await sql<{ id: string }>(dbUrl, `INSERT INTO organisations (name, slug) VALUES ('Bench Hollow Flying Group', 'bench') RETURNING id`);
	await sql(dbUrl, `INSERT INTO users (id, email, name, password_hash) VALUES ('bench-pilot', 'pilot@bench.example', 'Bench pilot', 'x')`);
	await sql(dbUrl, `INSERT INTO memberships (org_id, user_id, role) VALUES ($1, 'bench-pilot', 'pilot')`, [org.id]);
	await sql(dbUrl, `INSERT INTO api_tokens (user_id, name, token_hash) VALUES ('bench-pilot', 'bench', $1)`, [hashToken(token)]);
	// Tanks big enough that a million seconds of flight never runs them dry in the engine's eyes.
	const [ac] = await sql<{ id: string }>(
		dbUrl,
		`INSERT INTO aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph)
		 VALUES ($1, 'BN-BIG', 'Bench tanker', 'avgas', 0.719, 100000, 'l', 'faa-91.151-vfr-day', 34) RETURNING id`,
		[org.id]
	);
	const [ac2] = await sql<{ id: string }>(
		dbUrl,
		`INSERT INTO aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph)
		 VALUES ($1, 'BN-LONG', 'Long-range tourer', 'avgas', 0.719, 1000, 'l', 'faa-91.151-vfr-day', 34) RETURNING id`,
		[org.id]
	);

	let t = performance.now();
	const csvPath = path.join(work, 'bench-flight.csv');
	const copyPath = path.join(work, 'bench-copy.csv');
	const size = await writeFiles(ROWS, csvPath, copyPath);
	log(`generated ${ROWS.toLocaleString('en-US')} rows, ${mib(size)} (${s2(performance.now() - t)})`);

	const app = await startBenchApp({ databaseUrl: withDatabase(adminUrl, BENCH_DB), port: PORT, log, env: { BODY_SIZE_LIMIT: '110M' } });
	const { server } = app;
	cleanups.push(app.stop);
	const memory = (field: 'VmRSS' | 'VmHWM') => {
		const m = new RegExp(`${field}:\\s+(\\d+) kB`).exec(fs.readFileSync(`/proc/${server.pid}/status`, 'utf8'));
		return m ? Number(m[1]) * 1024 : NaN;
	};

	/** One upload as the page sends it: multipart, fields first, NDJSON progress back. */
	async function uploadFile(aircraftId: string, file: string, name: string) {
		const boundary = `----burndown-bench-${Date.now()}`;
		const field = (k: string, v: string) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`;
		const head = field('aircraftId', aircraftId) + field('declaration', 'full') + `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: text/csv\r\n\r\n`;
		const tail = `\r\n--${boundary}--\r\n`;
		const length = Buffer.byteLength(head) + fs.statSync(file).size + Buffer.byteLength(tail);
		async function* body() {
			yield Buffer.from(head);
			for await (const chunk of fs.createReadStream(file, { highWaterMark: 1 << 20 })) yield chunk as Buffer;
			yield Buffer.from(tail);
		}
		const marks: { at: number; line: { kind?: string; progress?: { phase?: string; step?: string } } & Record<string, unknown> }[] = [];
		const t0 = performance.now();
		const res = await fetch(`${ORIGIN}/api/v1/flights`, {
			method: 'POST',
			// Origin: SvelteKit refuses form content types from anywhere else, as a browser would send it.
			headers: { authorization: `Bearer ${token}`, origin: ORIGIN, accept: 'application/x-ndjson', 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(length) },
			body: ReadableStream.from(body()),
			duplex: 'half'
		} as RequestInit);
		let rest = '';
		for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
			rest += Buffer.from(chunk).toString('utf8');
			let nl: number;
			while ((nl = rest.indexOf('\n')) >= 0) {
				const text = rest.slice(0, nl).trim();
				rest = rest.slice(nl + 1);
				if (text) marks.push({ at: performance.now() - t0, line: JSON.parse(text) });
			}
		}
		const totalMs = performance.now() - t0;
		const last = marks.at(-1)?.line as { kind: string; answer?: { outcome: string; flightId: string; report: { parseMs: number; storeMs: number }; detail?: string } } | undefined;
		const result = last?.kind === 'result' ? last.answer : undefined;
		if (!result || result.outcome !== 'stored') throw new Error(`upload failed (HTTP ${res.status}): ${JSON.stringify(last ?? rest).slice(0, 500)}`);
		return { totalMs, result, marks };
	}

	const baseRss = memory('VmRSS');
	// Memory while the big upload runs, sampled every 50 ms (VmHWM gives the exact peak at the end).
	let sampledPeak = 0;
	const sampler = setInterval(() => (sampledPeak = Math.max(sampledPeak, memory('VmRSS'))), 50);
	const up = await uploadFile(ac.id, csvPath, 'bench-flight.csv');
	clearInterval(sampler);
	const peak = memory('VmHWM');
	const readDone = up.marks.find((m) => m.line.kind === 'progress' && m.line.progress?.phase === 'storing')?.at ?? NaN;
	const dbMs = up.result.report.parseMs + up.result.report.storeMs;
	const [{ n: stored }] = await sql<{ n: number }>(dbUrl, 'SELECT count(*)::int AS n FROM samples WHERE flight_id = $1', [up.result.flightId]);

	// ---- the same rows with psql \copy into a scratch table shaped like samples ----------------
	await sql(dbUrl, `INSERT INTO flights (id, org_id, aircraft_id, source, status, started_at, declaration) VALUES ($1, $2, $3, 'upload', 'closed', now(), '{}')`, [SCRATCH_FLIGHT, org.id, ac.id]);
	const copyInto = async (table: string) => {
		const started = performance.now();
		const r = await run('psql', [dbUrl, '-v', 'ON_ERROR_STOP=1', '-qc', `\\copy ${table} (flight_id, seq, t, flow, gs, dtg, wpt, lat, lon, alt) FROM '${copyPath}' WITH (FORMAT csv)`]);
		if (r.code !== 0) throw new Error(`psql \\copy failed: ${r.out}`);
		return performance.now() - started;
	};
	// Same primary key and the same set-based check of flight_id as samples: the fair comparison.
	await sql(dbUrl, 'CREATE TABLE bench_scratch (LIKE samples INCLUDING ALL)');
	await sql(dbUrl, 'CREATE TRIGGER bench_flight_exists AFTER INSERT ON bench_scratch REFERENCING NEW TABLE AS new_samples FOR EACH STATEMENT EXECUTE FUNCTION samples_check_flight()');
	const copyMs = await copyInto('bench_scratch');
	// And with a per-row foreign key instead, the design migration 0002 replaced, to show its cost.
	await sql(dbUrl, 'CREATE TABLE bench_scratch_fk (LIKE samples INCLUDING ALL)');
	await sql(dbUrl, 'ALTER TABLE bench_scratch_fk ADD FOREIGN KEY (flight_id) REFERENCES flights (id) ON DELETE CASCADE');
	const copyFkMs = await copyInto('bench_scratch_fk');

	console.log(`\nUpload of ${ROWS.toLocaleString('en-US')} rows (${mib(size)}) through POST /api/v1/flights, multipart, on ${os.cpus().length} cores:`);
	console.log(`  end to end          ${s2(up.totalMs).padStart(9)}   ${perSecond(ROWS, up.totalMs)}   (target ≤ ${TARGET_SECONDS} s)`);
	console.log(`  file read, checked and COPY'd (while streaming in)  ${s2(up.result.report.parseMs)}   last byte read at ${s2(readDone)} on the client's clock`);
	console.log(`  then original kept, summary, flight row, commit     ${s2(up.result.report.storeMs)}`);
	for (const m of up.marks.filter((x) => x.line.progress?.phase === 'storing')) console.log(`    ${String(m.line.progress?.step).padEnd(9)} at ${s2(m.at)}`);
	console.log(`  samples stored      ${stored.toLocaleString('en-US')}`);
	console.log(`\npsql \\copy of the same rows (CSV, canonical units):`);
	console.log(`  into a table like samples (PK + set-based flight check)  ${s2(copyMs).padStart(9)}   ${perSecond(ROWS, copyMs)}`);
	console.log(`  with a per-row foreign key instead                       ${s2(copyFkMs).padStart(9)}   ${perSecond(ROWS, copyFkMs)}`);
	console.log(`  database phase of the upload vs \\copy: ${(copyMs / dbMs).toFixed(2)} of \\copy speed (target ≥ ${TARGET_COPY_RATIO})`);
	console.log(`\nServer memory (node build): ${mib(baseRss)} before, peak ${mib(peak)} (VmHWM; sampled ${mib(sampledPeak)}), so ${mib(peak - baseRss)} for a ${mib(size)} file`);

	// ---- the replay API for a 10-hour flight at 1 Hz ---------------------------------------------
	if (REPLAY_ROWS > 0) {
		const replayCsv = path.join(work, 'ten-hours.csv');
		const replaySize = await writeFiles(REPLAY_ROWS, replayCsv, null);
		const up2 = await uploadFile(ac2.id, replayCsv, 'ten-hours.csv');
		console.log(`\nReplay flight: ${REPLAY_ROWS.toLocaleString('en-US')} samples (${(REPLAY_ROWS / 3600).toFixed(1)} h at 1 Hz, ${mib(replaySize)}) uploaded in ${s2(up2.totalMs)}`);
		const probe = await fetch(`${ORIGIN}/api/v1/flights/${up2.result.flightId}/samples`, { headers: { authorization: `Bearer ${token}` } });
		if (probe.status === 404 || probe.status === 405) console.log('  the replay API is not there yet');
		else
			for (const [name, query, gzip] of [
				['JSON', '?format=json', false],
				['JSON, gzip', '?format=json', true],
				['binary', '?format=binary', false],
				['binary, gzip', '?format=binary', true]
			] as const) {
				const times: number[] = [];
				let wire = 0;
				for (let r = 0; r < 5; r++) {
					const t0 = performance.now();
					const res = await fetch(`${ORIGIN}/api/v1/flights/${up2.result.flightId}/samples${query}`, { headers: { authorization: `Bearer ${token}`, 'accept-encoding': gzip ? 'gzip' : 'identity' } });
					const body = new Uint8Array(await res.arrayBuffer());
					times.push(performance.now() - t0);
					if (!res.ok) throw new Error(`samples API answered ${res.status}`);
					wire = Number(res.headers.get('content-length') ?? body.length);
				}
				times.sort((x, y) => x - y);
				console.log(`  GET …/samples${query.padEnd(15)} ${name.padEnd(13)} ${mib(wire).padStart(9)} on the wire, ${times[2].toFixed(0)} ms (median of 5)`);
			}
	}
} finally {
	await cleanUp();
}
