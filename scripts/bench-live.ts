// `npm run bench:live`: live fan-out under load, on loopback only. Serves the built app on its own
// port against a scratch database, in two scenarios on one app instance:
//  - one flight: as many SSE viewers as this process holds (up to 1,000) on one live flight,
//    batches 10 times a second (target p95 ≤ 250 ms);
//  - a fleet: many live flights at once (500), each sending one batch a second, each with 2
//    viewers (target p95 ≤ 500 ms).
// Each prints commit-to-viewer latency p50/p95/p99, samples lost and repeated (both must be 0),
// ingest time, NOTIFYs per batch, the server's memory and the database connections in use.
// A benchmark, not a test: it prints figures and fails only when samples were lost or repeated.
//
//   npm run bench:live [-- --scenario both|single|fleet --viewers 1000 --seconds 30 --per-batch 5
//                          --rate 10 --flights 500 --fleet-seconds 60]
import fs from 'node:fs';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase, startBenchApp } from './lib/bench-app';
import { hashToken, newToken } from '../src/lib/server/tokens';
import { NOTIFY_CHANNEL } from '../src/lib/server/live/protocol';
import { openLiveStream, type LiveStream } from '../src/routes/o/[org]/flights/[id]/live/stream-client';

const { values: opt } = parseArgs({
	options: {
		viewers: { type: 'string', default: '1000' },
		seconds: { type: 'string', default: '30' },
		'per-batch': { type: 'string', default: '5' },
		rate: { type: 'string', default: '10' },
		port: { type: 'string', default: '4191' },
		scenario: { type: 'string', default: 'both' },
		flights: { type: 'string', default: '500' },
		'fleet-seconds': { type: 'string', default: '60' }
	}
});
const SCENARIO = opt.scenario === 'single' || opt.scenario === 'fleet' ? opt.scenario : 'both';
const FLIGHTS = Math.min(2000, Math.max(1, Number(opt.flights)));
const FLEET_SECONDS = Math.min(600, Math.max(10, Number(opt['fleet-seconds'])));
const VIEWERS = Math.min(1000, Math.max(1, Number(opt.viewers)));
const SECONDS = Math.min(300, Math.max(5, Number(opt.seconds)));
const PER_BATCH = Math.min(1000, Math.max(1, Number(opt['per-batch'])));
const RATE = Math.min(50, Math.max(1, Number(opt.rate)));
const PORT = Number(opt.port);
const ORIGIN = `http://127.0.0.1:${PORT}`;
const BENCH_DB = 'burndown_bench_live';

const log = (s: string) => console.log(`bench:live: ${s}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function memoryOf(pid: number): { rssMb: number; peakMb: number } {
	const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = (key: string) => Number(new RegExp(`${key}:\\s+(\\d+)`).exec(status)?.[1] ?? NaN);
	return { rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024 };
}

/** CPU time (user + system, ms) a process has used so far. */
function cpuMsOf(pid: number): number {
	try {
		const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
		return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100;
	} catch {
		return 0;
	}
}

/**
 * CPU time (ms) used so far by the PostgreSQL backends serving the benchmark's database (their
 * process titles name it). Backends that ended in between are not counted: a lower bound.
 */
function databaseCpuMs(): number {
	let ms = 0;
	for (const d of fs.readdirSync('/proc')) {
		if (!/^\d+$/.test(d)) continue;
		try {
			if (fs.readFileSync(`/proc/${d}/cmdline`, 'utf8').includes(BENCH_DB)) ms += cpuMsOf(Number(d));
		} catch {
			// gone
		}
	}
	return ms;
}

/** CPU used by the app and by the database while `batches` were stored: per batch, the figure load on a shared machine changes least. */
function cpuLine(app0: number, db0: number, me0: NodeJS.CpuUsage, batches: number, seconds: number): string {
	const app = cpuMsOf(server.pid!) - app0;
	const dbMs = databaseCpuMs() - db0;
	const me = process.cpuUsage(me0);
	const core = (ms: number) => `${((ms / 1000 / seconds) * 100).toFixed(0)} % of a core`;
	return `app ${(app / batches).toFixed(2)} ms per batch (${core(app)}) · database ${(dbMs / batches).toFixed(2)} ms per batch (${core(dbMs)}) · this benchmark's recorders and viewers ${core((me.user + me.system) / 1000)}`;
}

function percentile(sorted: number[], p: number): number {
	if (sorted.length === 0) return NaN;
	return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

// ---- a scratch database on the project's disposable test cluster ---------------------------

const { adminUrl, dbUrl } = await scratchDatabase(BENCH_DB);

const recorderToken = newToken('bdr_');
const viewerToken = newToken('bdk_');
{
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`insert into organisations (name, slug) values ('Bench Hollow Flying Group', 'bench') returning id`)).rows[0].id;
	await c.query(`insert into users (id, email, name, password_hash) values ('bench-viewer', 'viewer@bench.example', 'Bench viewer', 'x')`);
	await c.query(`insert into memberships (org_id, user_id, role) values ($1, 'bench-viewer', 'viewer')`, [org]);
	await c.query(`insert into api_tokens (user_id, name, token_hash) values ('bench-viewer', 'bench', $1)`, [hashToken(viewerToken)]);
	const ac = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, low_fuel_l, low_endurance_min, last_on_board_l)
			 values ($1, 'BD-BEN', 'Four-seat trainer', 'avgas', 0.719, 151.4, 'usgal', 'faa-91.151-vfr-day', 20, 30, 140) returning id`,
			[org]
		)
	).rows[0].id;
	await c.query(`insert into recorders (org_id, aircraft_id, name, token_hash, token_hint) values ($1, $2, 'bench', $3, 'bdr_bench')`, [org, ac, hashToken(recorderToken)]);
	await c.end();
}

// ---- the app ---------------------------------------------------------------------------------

const app = await startBenchApp({ databaseUrl: dbUrl, port: PORT, log });
const { server } = app;
const stopServer = app.stop;
process.once('SIGINT', () => {
	void stopServer().then(() => process.exit(130));
});
const idle = memoryOf(server.pid!);
log(`app on ${ORIGIN} (pid ${server.pid}), ${idle.rssMb.toFixed(0)} MB resident when idle`);

/** Database connections of the benchmark's database in use now (pg_stat_activity). */
async function connectionsInUse(): Promise<number> {
	const r = await monitor.query(`select count(*)::int as n from pg_stat_activity where datname = $1 and pid <> pg_backend_pid()`, [BENCH_DB]);
	return r.rows[0].n as number;
}
const monitor = new pg.Client({ connectionString: dbUrl });
await monitor.connect();
let notices = 0;
await monitor.query(`LISTEN ${NOTIFY_CHANNEL}`);
monitor.on('notification', (m) => {
	if (m.channel === NOTIFY_CHANNEL) notices++;
});

async function singleFlight(): Promise<boolean> {
	async function post(route: string, body: unknown): Promise<Record<string, unknown>> {
		const res = await fetch(`${ORIGIN}/api/v1/live/${route}`, { method: 'POST', headers: { authorization: `Bearer ${recorderToken}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });
		if (!res.ok) throw new Error(`${route} answered ${res.status}: ${await res.text()}`);
		return (await res.json()) as Record<string, unknown>;
	}
	const flightId = String((await post('open', { declaration: { kind: 'full' } })).flightId);

	// ---- viewers ---------------------------------------------------------------------------------

	interface Viewer {
		stream: LiveStream;
		received: number;
		lat: number[];
		failed: boolean;
	}
	const viewers: Viewer[] = [];
	let measuring = false;
	const t0 = Date.now();
	for (let i = 0; i < VIEWERS; i++) {
		const v: Viewer = { stream: null as unknown as LiveStream, received: 0, lat: [], failed: false };
		v.stream = openLiveStream({
			url: `${ORIGIN}/api/v1/flights/${flightId}/stream`,
			headers: { authorization: `Bearer ${viewerToken}` },
			minRetryMs: 200,
			maxRetryMs: 2000,
			onSamples: (run) => {
				v.received += run.to - run.from + 1;
				if (measuring) v.lat.push(Date.now() - run.at);
			},
			onStatus: (s) => {
				if (s === 'denied') v.failed = true;
			}
		});
		viewers.push(v);
		if (i % 50 === 49) await sleep(50);
	}
	// Wait until every viewer's connection is open (or give up on the ones that cannot).
	for (let i = 0; i < 200 && viewers.some((v) => v.stream.connections === 0 && !v.failed); i++) await sleep(100);
	const connected = viewers.filter((v) => v.stream.connections > 0).length;
	log(`${connected} of ${VIEWERS} viewers connected in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
	const withViewers = memoryOf(server.pid!);

	// ---- ingest ----------------------------------------------------------------------------------

	const startMs = Date.UTC(2026, 6, 1, 9, 0, 0);
	let seq = 0;
	let batches = 0;
	let postMs: number[] = [];
	measuring = true;
	const notices0 = notices;
	const app0 = cpuMsOf(server.pid!);
	const db0 = databaseCpuMs();
	const me0 = process.cpuUsage();
	const ingestStart = Date.now();
	let maxConnections = 0;
	const sampler = setInterval(() => void connectionsInUse().then((n) => (maxConnections = Math.max(maxConnections, n))), 1000);
	const endAt = Date.now() + SECONDS * 1000;
	const period = 1000 / RATE;
	let nextAt = Date.now();
	while (Date.now() < endAt) {
		const samples = [];
		for (let k = 0; k < PER_BATCH; k++, seq++) samples.push({ seq, t: new Date(startMs + seq * 200).toISOString(), flow: 34 + Math.sin(seq / 50), gs: 110, dtg: Math.max(0, 90 - seq * 0.006), wpt: 'BENCH' });
		const sent = Date.now();
		await post('samples', { flightId, samples });
		postMs.push(Date.now() - sent);
		batches++;
		nextAt += period;
		const wait = nextAt - Date.now();
		if (wait > 0) await sleep(wait);
	}
	const lastSeq = seq - 1;
	const cpu = cpuLine(app0, db0, me0, batches, (Date.now() - ingestStart) / 1000);
	for (let i = 0; i < 300 && viewers.some((v) => v.stream.connections > 0 && v.stream.cursor < lastSeq); i++) await sleep(100);
	measuring = false;
	clearInterval(sampler);
	const noticesSent = notices - notices0;
	const atEnd = memoryOf(server.pid!);

	// ---- figures ---------------------------------------------------------------------------------

	const all = viewers.filter((v) => v.stream.connections > 0).flatMap((v) => v.lat).sort((a, b) => a - b);
	let lost = 0;
	let repeated = 0;
	let skipped = 0;
	for (const v of viewers) {
		if (v.stream.connections === 0) continue;
		lost += lastSeq + 1 - v.received;
		repeated += v.stream.repeated;
		skipped += v.stream.skipped;
	}
	postMs = postMs.sort((a, b) => a - b);
	const reconnects = viewers.reduce((n, v) => n + Math.max(0, v.stream.connections - 1), 0);
	console.log(`
Live fan-out benchmark (loopback, ${new Date().toISOString().slice(0, 10)}, Node ${process.version}, one app instance)
  viewers held          ${connected} of ${VIEWERS} asked (one process), ${reconnects} reconnects
  ingest                ${batches} batches of ${PER_BATCH} samples at ${RATE}/s for ${SECONDS} s (${lastSeq + 1} samples); POST p50 ${percentile(postMs, 50)} ms, p95 ${percentile(postMs, 95)} ms
  commit → viewer       p50 ${percentile(all, 50)} ms   p95 ${percentile(all, 95)} ms   p99 ${percentile(all, 99)} ms   max ${all.at(-1)} ms  (${all.length} deliveries)
  samples lost          ${lost}
  samples repeated      ${repeated}   (runs skipping ahead: ${skipped})
  server memory (RSS)   idle ${idle.rssMb.toFixed(0)} MB · with viewers ${withViewers.rssMb.toFixed(0)} MB · at the end ${atEnd.rssMb.toFixed(0)} MB · peak ${atEnd.peakMb.toFixed(0)} MB
  NOTIFY per batch      ${(noticesSent / Math.max(1, batches)).toFixed(2)} (${noticesSent} heard for ${batches} batches)
  CPU while ingesting   ${cpu}
  database connections  ${maxConnections} at most while ingesting (app pool and LISTEN; the benchmark's own monitor not counted)
  target                p95 ≤ 250 ms at 1,000 viewers: ${percentile(all, 95) <= 250 && connected >= 1000 ? 'met' : 'NOT met'}`);

	for (const v of viewers) v.stream.close();
	await sleep(300);
	return lost === 0 && repeated === 0;
}
/**
 * Many live flights at once: FLIGHTS recorders, one aircraft each, each sending one sample a
 * second as a batch (a recorder sends its next batch when the last was answered), each flight
 * watched by 2 viewers.
 */
async function fleet(): Promise<boolean> {
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`select id from organisations where slug = 'bench'`)).rows[0].id as string;
	const tokens: string[] = [];
	for (let i = 0; i < FLIGHTS; i++) {
		const token = newToken('bdr_');
		tokens.push(token);
		const ac = (
			await c.query(
				`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, low_fuel_l, low_endurance_min, last_on_board_l)
				 values ($1, $2, 'Four-seat trainer', 'avgas', 0.719, 151.4, 'usgal', 'faa-91.151-vfr-day', 20, 30, 140) returning id`,
				[org, `BF-${String(i).padStart(4, '0')}`]
			)
		).rows[0].id;
		await c.query(`insert into recorders (org_id, aircraft_id, name, token_hash, token_hint) values ($1, $2, $3, $4, 'bdr_fleet')`, [org, ac, `fleet ${i}`, hashToken(token)]);
	}
	await c.end();

	const postAs = async (token: string, route: string, body: unknown) => {
		const res = await fetch(`${ORIGIN}/api/v1/live/${route}`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });
		if (!res.ok) throw new Error(`${route} answered ${res.status}: ${await res.text()}`);
		return (await res.json()) as Record<string, unknown>;
	};
	const flightIds: string[] = [];
	for (let i = 0; i < FLIGHTS; i += 25) {
		const ids = await Promise.all(tokens.slice(i, i + 25).map(async (t) => String((await postAs(t, 'open', { declaration: { kind: 'full' } })).flightId)));
		flightIds.push(...ids);
	}
	log(`fleet: ${FLIGHTS} flights open`);

	interface FleetViewer {
		flight: number;
		stream: LiveStream;
		received: number;
		lat: number[];
	}
	let measuring = false;
	const viewers: FleetViewer[] = [];
	const t0 = Date.now();
	for (let f = 0; f < FLIGHTS; f++) {
		for (let k = 0; k < 2; k++) {
			const v: FleetViewer = { flight: f, stream: null as unknown as LiveStream, received: 0, lat: [] };
			v.stream = openLiveStream({
				url: `${ORIGIN}/api/v1/flights/${flightIds[f]}/stream`,
				headers: { authorization: `Bearer ${viewerToken}` },
				minRetryMs: 200,
				maxRetryMs: 2000,
				onSamples: (run) => {
					v.received += run.to - run.from + 1;
					if (measuring) v.lat.push(Date.now() - run.at);
				}
			});
			viewers.push(v);
		}
		if (f % 25 === 24) await sleep(50);
	}
	for (let i = 0; i < 300 && viewers.some((v) => v.stream.connections === 0); i++) await sleep(100);
	const connected = viewers.filter((v) => v.stream.connections > 0).length;
	log(`fleet: ${connected} of ${viewers.length} viewers connected in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
	const withViewers = memoryOf(server.pid!);

	const startMs = Date.UTC(2026, 6, 2, 9, 0, 0);
	const sent = new Array<number>(FLIGHTS).fill(0);
	const postMs: number[] = [];
	let batches = 0;
	let errors = 0;
	measuring = true;
	const notices0 = notices;
	const app0 = cpuMsOf(server.pid!);
	const db0 = databaseCpuMs();
	const me0 = process.cpuUsage();
	const ingestStart = Date.now();
	let maxConnections = 0;
	const sampler = setInterval(() => void connectionsInUse().then((n) => (maxConnections = Math.max(maxConnections, n))), 1000);
	const endAt = Date.now() + FLEET_SECONDS * 1000;
	// Each recorder: one sample a second, started at its own offset within the first second.
	await Promise.all(
		flightIds.map(async (flightId, f) => {
			await sleep((f / FLIGHTS) * 1000);
			let nextAt = Date.now();
			while (Date.now() < endAt) {
				const seq = sent[f];
				const sample = { seq, t: new Date(startMs + seq * 1000).toISOString(), flow: 34 + Math.sin(seq / 50), gs: 110, dtg: Math.max(0, 90 - seq * 0.03), wpt: 'FLEET' };
				const at = Date.now();
				try {
					await postAs(tokens[f], 'samples', { flightId, samples: [sample] });
					sent[f]++;
					batches++;
					postMs.push(Date.now() - at);
				} catch {
					errors++;
				}
				nextAt += 1000;
				const wait = nextAt - Date.now();
				if (wait > 0) await sleep(wait);
			}
		})
	);
	const cpu = cpuLine(app0, db0, me0, batches, (Date.now() - ingestStart) / 1000);
	const rate = batches / ((Date.now() - ingestStart) / 1000);
	for (let i = 0; i < 300 && viewers.some((v) => v.stream.connections > 0 && v.stream.cursor < sent[v.flight] - 1); i++) await sleep(100);
	measuring = false;
	clearInterval(sampler);
	const noticesSent = notices - notices0;
	const atEnd = memoryOf(server.pid!);

	const all = viewers.flatMap((v) => v.lat).sort((a, b) => a - b);
	let lost = 0;
	let repeated = 0;
	for (const v of viewers) {
		if (v.stream.connections === 0) continue;
		lost += sent[v.flight] - v.received;
		repeated += v.stream.repeated;
	}
	postMs.sort((a, b) => a - b);
	const reconnects = viewers.reduce((n, v) => n + Math.max(0, v.stream.connections - 1), 0);
	console.log(`
Live fleet benchmark (loopback, ${new Date().toISOString().slice(0, 10)}, Node ${process.version}, one app instance)
  flights               ${FLIGHTS} live at once, 2 viewers each: ${connected} of ${viewers.length} viewers held, ${reconnects} reconnects
  ingest                ${batches} batches of 1 sample (one a second per flight) for ${FLEET_SECONDS} s: ${rate.toFixed(0)} stored a second (asked: ${FLIGHTS}), ${errors} failed; POST p50 ${percentile(postMs, 50)} ms, p95 ${percentile(postMs, 95)} ms, p99 ${percentile(postMs, 99)} ms
  commit → viewer       p50 ${percentile(all, 50)} ms   p95 ${percentile(all, 95)} ms   p99 ${percentile(all, 99)} ms   max ${all.at(-1)} ms  (${all.length} deliveries)
  samples lost          ${lost}
  samples repeated      ${repeated}
  NOTIFY per batch      ${(noticesSent / Math.max(1, batches)).toFixed(2)} (${noticesSent} heard for ${batches} batches)
  server memory (RSS)   with viewers ${withViewers.rssMb.toFixed(0)} MB · at the end ${atEnd.rssMb.toFixed(0)} MB · peak ${atEnd.peakMb.toFixed(0)} MB
  CPU while ingesting   ${cpu}
  database connections  ${maxConnections} at most while ingesting (app pool and LISTEN; the benchmark's own monitor not counted)
  target                p95 ≤ 500 ms, 0 lost, 0 repeated: ${percentile(all, 95) <= 500 && lost === 0 && repeated === 0 && connected === viewers.length ? 'met' : 'NOT met'}`);
	for (const v of viewers) v.stream.close();
	await sleep(300);
	return lost === 0 && repeated === 0;
}

let ok = true;
try {
	if (SCENARIO !== 'fleet') ok = (await singleFlight()) && ok;
	if (SCENARIO !== 'single') ok = (await fleet()) && ok;
} finally {
	await monitor.end();
	await stopServer();
}
{
	const c = new pg.Client({ connectionString: adminUrl });
	await c.connect();
	await c.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
	await c.end();
}
process.exit(ok ? 0 : 1);
