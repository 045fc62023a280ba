// Replay payload benchmark: a 10-hour flight at 1 Hz (36,000 samples) served by the built app
// against a scratch database, fetched over loopback HTTP in each encoding (JSON and binary, plain
// and gzipped), then decoded and run through the fuel engine here as the browser would. Prints
// sizes and median times; a benchmark, not a test (it asserts nothing about speed).
//
//   npx tsx scripts/bench-replay.ts [--samples 36000] [--runs 7] [--port 4192]
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase, startBenchApp } from './lib/bench-app';
import { hashToken, newToken } from '../src/lib/server/tokens';
import { computeFlight, summarize } from '../src/lib/fuel';
import { engineInputsOf } from '../src/lib/flight-inputs';
import { decodeBinary, decodeJson, type JsonPayload } from '../src/lib/wire/replay';
import { downsampleMinMax } from '../src/lib/components/replay/series';
import { generateFlight, insertFlight, PROFILE_OVERHEAD_S } from '../tests/integration/replay-fixture';

const { values: opt } = parseArgs({
	options: {
		samples: { type: 'string', default: '36000' },
		runs: { type: 'string', default: '7' },
		port: { type: 'string', default: '4192' }
	}
});
const SAMPLES = Math.max(3000, Number(opt.samples));
const RUNS = Math.max(1, Number(opt.runs));
const PORT = Number(opt.port);
const ORIGIN = `http://127.0.0.1:${PORT}`;
const BENCH_DB = 'burndown_bench_replay';

const log = (s: string) => console.log(`bench:replay: ${s}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const kb = (bytes: number) => `${(bytes / 1024).toFixed(0)} KiB`;
const ms = (x: number) => `${x.toFixed(1)} ms`;

// ---- a scratch database on the project's disposable test cluster -----------------------------

const { adminUrl, dbUrl } = await scratchDatabase(BENCH_DB);

const token = newToken('bdk_');
// Flows logged in US gal/h and stored in L/h, as an upload from a US recorder is: full doubles.
const samples = generateFlight({ cruiseS: SAMPLES - PROFILE_OVERHEAD_S, recordedIn: 'usgal' });
let flightId: string;
{
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`insert into organisations (name, slug) values ('Bench Hollow Flying Group', 'bench') returning id`)).rows[0].id;
	await c.query(`insert into users (id, email, name, password_hash) values ('bench-pilot', 'pilot@bench.example', 'Bench pilot', 'x')`);
	await c.query(`insert into memberships (org_id, user_id, role) values ($1, 'bench-pilot', 'pilot')`, [org]);
	await c.query(`insert into api_tokens (user_id, name, token_hash) values ('bench-pilot', 'bench', $1)`, [hashToken(token)]);
	// A long-range tourer, so ten hours do not run the tanks dry (usable 400 L).
	const ac = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph, low_fuel_l, low_endurance_min)
			 values ($1, 'BN-LONG', 'Long-range tourer', 'avgas', 0.719, 400, 'l', 'easa-nco.op.125-vfr-day', 31, 40, 45) returning id`,
			[org]
		)
	).rows[0].id;
	const t0 = performance.now();
	flightId = await insertFlight(c, { orgId: org, aircraftId: ac, pilotId: 'bench-pilot', title: 'ten hours at 1 Hz', declaration: { kind: 'full' } }, samples);
	log(`stored ${samples.t.length.toLocaleString('en-US')} samples in ${ms(performance.now() - t0)} (one UNNEST insert)`);
	await c.end();
}

// ---- the app ---------------------------------------------------------------------------------

const app = await startBenchApp({ databaseUrl: dbUrl, port: PORT, log });
const stopServer = app.stop;
process.once('SIGINT', () => {
	void stopServer().then(() => process.exit(130));
});

// ---- fetching ------------------------------------------------------------------------------

interface Fetched {
	wire: number;
	body: Uint8Array;
	totalMs: number;
	firstByteMs: number;
}

/**
 * One request with Node's fetch (undici), which would transparently gunzip: the body is read as
 * raw bytes through the wire so the transferred size is what a browser receives.
 */
async function get(query: string, gzip: boolean): Promise<Fetched> {
	const t0 = performance.now();
	const res = await fetch(`${ORIGIN}/api/v1/flights/${flightId}/samples${query}`, {
		headers: { authorization: `Bearer ${token}`, 'accept-encoding': gzip ? 'gzip' : 'identity' }
	});
	const firstByteMs = performance.now() - t0;
	if (!res.ok) throw new Error(`samples API answered ${res.status}: ${await res.text()}`);
	const body = new Uint8Array(await res.arrayBuffer());
	const totalMs = performance.now() - t0;
	const wire = Number(res.headers.get('content-length') ?? body.length);
	return { wire, body, totalMs, firstByteMs };
}

const variants = [
	{ name: 'JSON', query: '?format=json', gzip: false },
	{ name: 'JSON, gzip', query: '?format=json', gzip: true },
	{ name: 'binary', query: '?format=binary', gzip: false },
	{ name: 'binary, gzip', query: '?format=binary', gzip: true }
];

try {
	// Warm the server (first query plans, JIT) before timing.
	for (const v of variants) await get(v.query, v.gzip);
	console.log(`\nReplay API, ${samples.t.length.toLocaleString('en-US')} samples (${(samples.t.length / 3600).toFixed(1)} h at 1 Hz), median of ${RUNS} runs over loopback:`);
	console.log('  encoding        on the wire   decoded    first byte   complete   decode + engine here');
	for (const v of variants) {
		const runs: Fetched[] = [];
		const clientMs: number[] = [];
		for (let r = 0; r < RUNS; r++) {
			const f = await get(v.query, v.gzip);
			runs.push(f);
			// What the page does next: decode, then run the engine and summarise.
			const t0 = performance.now();
			// fetch has already gunzipped a compressed body, as a browser does.
			const raw = f.body;
			const data = v.query.includes('binary') ? decodeBinary(raw) : decodeJson(JSON.parse(new TextDecoder().decode(raw)) as JsonPayload);
			const c = computeFlight({ columns: data.columns, ...engineInputsOf(data.setup, data, data.events) });
			summarize(c);
			clientMs.push(performance.now() - t0);
		}
		const decoded = runs[0].body.length;
		console.log(
			`  ${v.name.padEnd(14)}  ${kb(runs[0].wire).padStart(11)}  ${kb(decoded).padStart(9)}  ${ms(median(runs.map((r) => r.firstByteMs))).padStart(11)}  ${ms(median(runs.map((r) => r.totalMs))).padStart(9)}  ${ms(median(clientMs)).padStart(12)}`
		);
	}

	// Drawing: the min/max reduction of one series to a 1,000-pixel-wide chart.
	{
		const data = decodeBinary((await get('?format=binary', false)).body);
		const c = computeFlight({ columns: data.columns, ...engineInputsOf(data.setup, data, data.events) });
		const times: number[] = [];
		let points = 0;
		for (let r = 0; r < RUNS; r++) {
			const t0 = performance.now();
			const d = downsampleMinMax(data.columns.t, [c.onBoard], 0, c.length - 1, 1000);
			times.push(performance.now() - t0);
			points = d.x.length;
		}
		console.log(`\nCharts: ${c.length.toLocaleString('en-US')} samples reduced to ${points.toLocaleString('en-US')} points per series for 1,000 px in ${ms(median(times))} (median), four series per redraw.`);
	}

	// What the browser's default request (binary, gzip accepted) costs on the wire.
	{
		const res = await fetch(`${ORIGIN}/api/v1/flights/${flightId}/samples?format=binary`, { headers: { authorization: `Bearer ${token}`, 'accept-encoding': 'gzip' } });
		const enc = res.headers.get('content-encoding');
		const len = Number(res.headers.get('content-length'));
		const body = new Uint8Array(await res.arrayBuffer());
		log(`replay page request: content-encoding ${enc ?? 'none'}, ${kb(len)} sent for ${kb(body.length)} of payload (${(body.length / len).toFixed(1)}× smaller)`);
	}
} finally {
	await stopServer();
	const c = new pg.Client({ connectionString: adminUrl });
	await c.connect();
	await c.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
	await c.end();
}
