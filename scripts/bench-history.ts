// History benchmark: one aircraft with a long history (by default 1,000 flights of 3 h at 1 Hz,
// 10.8 M samples) in a scratch database, and what an owner does with it, each printed with its
// ratio to the target:
//   1. the aircraft's fuel history page data (stored per-flight and per-phase figures, the
//      baseline, the high-burn finder, the reconciliation): p95 ≤ 200 ms;
//   2. comparing two such flights, server side: ≤ 300 ms;
//   3. one 10-hour 1 Hz flight's samples through the samples API of the built app: ≤ 50 ms of
//      server time (its Server-Timing header), and the replay page from navigation to charts
//      drawn in Debian's Chromium: ≤ 600 ms;
//   4. recomputing every flight after a factor change, through the calibration page's action:
//      ≤ 15 s, with the server process's peak memory (RSS high-water, /proc) printed.
// One flight is recorded and computed for real; its samples and stored figures are copied to the
// other flights at later dates (the same figures, since the aircraft and the samples are the same).
// A benchmark: prints figures, asserts nothing.
//
//   npm run bench:history                                   full size (several minutes on 2 cores)
//   npm run bench:history -- --flights 100 --hours 1        a quick run (or BENCH_HISTORY_FLIGHTS=100)
//   options: --flights N --hours H --long-hours H --runs N --port P --no-browser
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase, startBenchApp } from './lib/bench-app';
import { generateFlight, insertFlight, PROFILE_OVERHEAD_S } from '../tests/integration/replay-fixture';

const { values: opt } = parseArgs({
	options: {
		flights: { type: 'string', default: process.env.BENCH_HISTORY_FLIGHTS ?? '1000' },
		hours: { type: 'string', default: process.env.BENCH_HISTORY_HOURS ?? '3' },
		'long-hours': { type: 'string', default: '10' },
		runs: { type: 'string', default: '20' },
		port: { type: 'string', default: '4193' },
		'no-browser': { type: 'boolean', default: false }
	}
});
const FLIGHTS = Math.max(2, Number(opt.flights));
const HOURS = Math.max(0.5, Number(opt.hours));
const LONG_HOURS = Math.max(1, Number(opt['long-hours']));
const RUNS = Math.max(3, Number(opt.runs));
const PORT = Number(opt.port);
const BENCH_DB = 'burndown_bench_history';
const PASSWORD = 'bench-history-password-7d1c';
const log = (s: string) => console.log(`bench:history: ${s}`);
const ms = (x: number) => `${x.toFixed(1)} ms`;
const mib = (kb: number) => `${(kb / 1024).toFixed(0)} MiB`;
const sorted = (xs: number[]) => [...xs].sort((a, b) => a - b);
const pct = (xs: number[], p: number) => sorted(xs)[Math.min(xs.length - 1, Math.ceil(p * xs.length) - 1)];
const ratio = (x: number, target: number) => `target ≤ ${target} ms: ratio ${(x / target).toFixed(2)}`;

const { adminUrl, dbUrl } = await scratchDatabase(BENCH_DB);
process.env.DATABASE_URL = dbUrl;
// The app's modules read DATABASE_URL when first used: import them after it is set.
const { closeDb } = await import('../src/lib/server/db');
const { recomputeSummary } = await import('../src/lib/server/flights/summary');
const { aircraftHistory } = await import('../src/lib/server/aircraft/history');
const { compareFlights } = await import('../src/lib/server/flights/compare');
const { historyQuerySchema } = await import('../src/lib/schemas/history');
const { hashPassword } = await import('../src/lib/server/auth');
const { hashToken, newToken } = await import('../src/lib/server/tokens');
const { db } = await import('../src/lib/server/db');
const { flights: flightsTable } = await import('../src/lib/server/db/schema');
const { inArray } = await import('drizzle-orm');

let stopApp: (() => Promise<void>) | null = null;
try {
	// ---- the history --------------------------------------------------------------------------
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`insert into organisations (name, slug) values ('Bench Moor Flying Group', 'bench') returning id`)).rows[0].id as string;
	const token = newToken('bdk_');
	await c.query(`insert into users (id, email, name, password_hash) values ('bench-owner', 'owner@bench.example', 'Bench owner', $1)`, [await hashPassword(PASSWORD)]);
	await c.query(`insert into memberships (org_id, user_id, role) values ($1, 'bench-owner', 'admin')`, [org]);
	await c.query(`insert into api_tokens (user_id, name, token_hash) values ('bench-owner', 'bench', $1)`, [hashToken(token)]);
	const ac = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule)
			 values ($1, 'BM-HST', 'Four-seat tourer', 'avgas', 0.719, 300, 'l', 'easa-nco.op.125-vfr-day') returning id`,
			[org]
		)
	).rows[0].id as string;
	const cruiseS = Math.round(HOURS * 3600) - PROFILE_OVERHEAD_S;
	const t0 = performance.now();
	const first = await insertFlight(c, { orgId: org, aircraftId: ac, pilotId: 'bench-owner', declaration: { kind: 'full' } }, generateFlight({ start: Date.UTC(2020, 0, 1, 9) / 1000, cruiseS }));
	await recomputeSummary(first);
	// Copies of the computed flight, one a day, with its samples and figures (columns read from the
	// catalogue so the copy follows the schema).
	const colsOf = async (table: string, skip: string[]) =>
		(await c.query(`select column_name from information_schema.columns where table_name = $1 and column_name <> all($2) order by ordinal_position`, [table, skip])).rows.map((r) => `"${r.column_name}"`);
	const flightCols = await colsOf('flights', ['id', 'started_at', 'ended_at', 'upload_id', 'last_sample_at']);
	const sampleCols = await colsOf('samples', ['flight_id', 't']);
	await c.query(`create temporary table copies as select gen_random_uuid() as id, n from generate_series(1, ${FLIGHTS - 1}) n`);
	await c.query(
		`insert into flights (id, started_at, ended_at, last_sample_at, ${flightCols.join(', ')})
		 select k.id, f.started_at + k.n * interval '1 day', f.ended_at + k.n * interval '1 day', f.last_sample_at + k.n * interval '1 day', ${flightCols.map((x) => `f.${x}`).join(', ')} from flights f, copies k where f.id = $1`,
		[first]
	);
	for (let from = 1; from < FLIGHTS; from += 100) {
		await c.query(
			`insert into samples (flight_id, t, ${sampleCols.join(', ')})
			 select k.id, s.t + k.n * interval '1 day', ${sampleCols.map((x) => `s.${x}`).join(', ')} from samples s, copies k where s.flight_id = $1 and k.n between $2 and $3`,
			[first, from, from + 99]
		);
	}
	await c.query(`insert into flight_figures select k.id, ff.engine_time_s, ff.fuel_used_l, ff.fuel_per_engine_hour_lph, ff.cruise_specific_range_nm_per_l, ff.meter_factor, ff.gap_count, ff.gap_time_s, ff.leaning_moments from flight_figures ff, copies k where ff.flight_id = $1`, [first]);
	await c.query(`insert into flight_phase_figures select k.id, p.phase, p.time_s, p.fuel_l, p.distance_nm, p.average_flow_lph from flight_phase_figures p, copies k where p.flight_id = $1`, [first]);
	// A fill to full every ten days: the page also reconciles the flights between them.
	await c.query(`insert into pump_receipts (aircraft_id, at, amount, unit, amount_l, filled_to_full) select $1, timestamptz '2020-01-01 06:00Z' + n * interval '10 days', 80, 'l', 80, true from generate_series(0, ${Math.floor(FLIGHTS / 10)}) n`, [ac]);
	await c.query('vacuum analyze');
	const counts = (await c.query(`select (select count(*) from flights)::int f, (select count(*) from samples)::bigint s, (select count(*) from flight_phase_figures)::int p, (select count(*) from pump_receipts)::int r`)).rows[0];
	log(`${counts.f} flights of ${HOURS} h at 1 Hz (${Number(counts.s).toLocaleString('en-US')} samples), ${counts.p} phase rows, ${counts.r} receipts on one aircraft; built in ${(performance.now() - t0) / 1000 < 1 ? ms(performance.now() - t0) : `${((performance.now() - t0) / 1000).toFixed(0)} s`}`);

	// A long-range tourer with one 10-hour flight for the samples API and the replay page.
	const tourer = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph, low_fuel_l, low_endurance_min)
			 values ($1, 'BM-LONG', 'Long-range tourer', 'avgas', 0.719, 400, 'l', 'easa-nco.op.125-vfr-day', 31, 40, 45) returning id`,
			[org]
		)
	).rows[0].id as string;
	const longFlight = await insertFlight(c, { orgId: org, aircraftId: tourer, pilotId: 'bench-owner', title: `${LONG_HOURS} hours at 1 Hz`, declaration: { kind: 'full' } }, generateFlight({ start: Date.UTC(2019, 5, 1, 6) / 1000, cruiseS: LONG_HOURS * 3600 - PROFILE_OVERHEAD_S, recordedIn: 'usgal' }));
	await recomputeSummary(longFlight);
	const secondId = (await c.query(`select id from flights where aircraft_id = $1 order by started_at limit 1 offset 1`, [ac])).rows[0].id as string;
	await c.end();

	// ---- 1. the history page's data ----------------------------------------------------------------
	const viewer = { orgId: org, userId: 'bench-owner', role: 'admin' as const };
	for (const [name, q] of [
		['page 1, newest first', {}],
		['page 40, sorted by cruise flow', { sort: 'cruise', page: '40' }]
	] as const) {
		const query = historyQuerySchema.parse(q);
		await aircraftHistory(viewer, ac, query); // warm-up
		const times: number[] = [];
		let rows = 0;
		let trend = 0;
		for (let i = 0; i < RUNS; i++) {
			const s = performance.now();
			const h = await aircraftHistory(viewer, ac, query);
			times.push(performance.now() - s);
			rows = h.rows.length;
			trend = h.trend.length;
		}
		log(`history page data, ${name}: ${rows} rows, ${trend} trend points; p50 ${ms(pct(times, 0.5))}, p95 ${ms(pct(times, 0.95))} over ${RUNS} runs (${ratio(pct(times, 0.95), 200)})`);
	}

	// ---- 2. compare two flights, server side ---------------------------------------------------------
	{
		const two = await db.select().from(flightsTable).where(inArray(flightsTable.id, [first, secondId]));
		await compareFlights(two); // warm-up
		const times: number[] = [];
		const runs = Math.max(3, Math.ceil(RUNS / 2));
		for (let i = 0; i < runs; i++) {
			const s = performance.now();
			await compareFlights(two);
			times.push(performance.now() - s);
		}
		log(`compare two ${HOURS} h flights (load, compute, align, phase table): p50 ${ms(pct(times, 0.5))}, p95 ${ms(pct(times, 0.95))} over ${runs} runs (${ratio(pct(times, 0.5), 300)})`);
	}

	// ---- 3. the samples API and the replay page, on the built app ----------------------------------
	const app = await startBenchApp({ databaseUrl: dbUrl, port: PORT, log });
	stopApp = app.stop;
	const origin = app.origin;
	const serverPid = app.server.pid!;
	{
		const get = async (gzip: boolean) => {
			const s = performance.now();
			const res = await fetch(`${origin}/api/v1/flights/${longFlight}/samples?format=binary`, { headers: { authorization: `Bearer ${token}`, 'accept-encoding': gzip ? 'gzip' : 'identity' } });
			if (!res.ok) throw new Error(`samples API answered ${res.status}`);
			const body = await res.arrayBuffer();
			const timing = Object.fromEntries((res.headers.get('server-timing') ?? '').split(',').map((p) => /(\w+);dur=([\d.]+)/.exec(p.trim())).filter((m) => m !== null).map((m) => [m![1], Number(m![2])]));
			return { wall: performance.now() - s, bytes: Number(res.headers.get('content-length') ?? body.byteLength), count: Number(res.headers.get('x-sample-count')), ...timing } as { wall: number; bytes: number; count: number; load: number; encode: number; total: number };
		};
		for (const gzip of [false, true]) {
			await get(gzip);
			const runs: Awaited<ReturnType<typeof get>>[] = [];
			for (let i = 0; i < RUNS; i++) runs.push(await get(gzip));
			const med = (k: 'wall' | 'load' | 'encode' | 'total') => pct(runs.map((r) => r[k]), 0.5);
			log(
				`samples API, ${runs[0].count.toLocaleString('en-US')} samples, binary${gzip ? ', gzip (what the replay page asks for)' : ''}: server ${ms(med('total'))} (read ${ms(med('load'))}, encode ${ms(med('encode'))}), ${(runs[0].bytes / 1024).toFixed(0)} KiB, complete over loopback ${ms(med('wall'))}; median of ${RUNS} (server ${ratio(med('total'), 50)})`
			);
		}
	}
	if (opt['no-browser'] || !fs.existsSync('/usr/bin/chromium')) {
		log('replay page: not measured (no /usr/bin/chromium, or --no-browser)');
	} else {
		const { chromium } = await import('@playwright/test');
		const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'] });
		try {
			const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
			await page.goto(`${origin}/sign-in`);
			await page.getByLabel('E-mail').fill('owner@bench.example');
			await page.getByLabel('Password').fill(PASSWORD);
			await page.getByRole('button', { name: 'Sign in' }).click();
			await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
			const url = `${origin}/o/bench/flights/${longFlight}`;
			const once = async () => {
				await page.goto(url, { waitUntil: 'commit' });
				await page.locator('[data-testid="fuel-charts"] canvas').first().waitFor({ state: 'visible', timeout: 60_000 });
				// Two frames after the canvases exist: they have been painted. Milliseconds since the
				// navigation started (the document's time origin).
				return page.evaluate(() => new Promise<number>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r(performance.now())))));
			};
			await once();
			const times: number[] = [];
			const runs = Math.max(3, Math.ceil(RUNS / 4));
			for (let i = 0; i < runs; i++) times.push(await once());
			log(`replay page of the ${LONG_HOURS} h flight, navigation to charts drawn (Chromium, full page load, warm): median ${ms(pct(times, 0.5))}, worst ${ms(Math.max(...times))} over ${runs} (${ratio(pct(times, 0.5), 600)})`);
		} finally {
			await browser.close();
		}
	}

	// ---- 4. recompute the whole history after a factor change ----------------------------------------
	{
		const signIn = await fetch(`${origin}/sign-in`, { method: 'POST', redirect: 'manual', headers: { origin, accept: 'text/html' }, body: new URLSearchParams({ email: 'owner@bench.example', password: PASSWORD }) });
		const cookie = (signIn.headers.getSetCookie?.() ?? []).map((x) => x.split(';')[0]).join('; ');
		if (signIn.status !== 303 || !cookie) throw new Error(`sign-in answered ${signIn.status}`);
		const status = () => fs.readFileSync(`/proc/${serverPid}/status`, 'utf8');
		const kb = (field: string) => Number(new RegExp(`${field}:\\s+(\\d+)`).exec(status())?.[1] ?? NaN);
		const rssBefore = kb('VmRSS');
		let rssPeak = rssBefore;
		const sampler = setInterval(() => (rssPeak = Math.max(rssPeak, kb('VmRSS'))), 50);
		const seen: string[] = [];
		const poller = setInterval(async () => {
			const r = await fetch(`${origin}/o/bench/aircraft/${ac}/recompute`, { headers: { cookie } }).catch(() => null);
			const j = r?.ok ? ((await r.json()) as { job: { state: string; done: number; total: number } | null }).job : null;
			if (j && j.state === 'running') seen.push(`${j.done}/${j.total}`);
		}, 1000);
		const s = performance.now();
		const res = await fetch(`${origin}/o/bench/aircraft/${ac}/reconciliation?/factors`, {
			method: 'POST',
			headers: { origin, cookie, 'x-sveltekit-action': 'true', accept: 'application/json' },
			body: new URLSearchParams({ meterFactor: '1.02', kFactor: '', inForceFrom: '2000-01-01T00:00', inForceUntil: '', step: 'confirm', note: 'bench' })
		});
		const body = await res.text();
		const took = performance.now() - s;
		clearInterval(sampler);
		clearInterval(poller);
		rssPeak = Math.max(rssPeak, kb('VmRSS'));
		const hwm = kb('VmHWM');
		if (!res.ok || !/"type":"success"/.test(body)) throw new Error(`the factors action answered ${res.status}: ${body.slice(0, 300)}`);
		log(
			`recompute all ${FLIGHTS} flights after a new meter factor (the calibration page's action, one transaction): ${(took / 1000).toFixed(1)} s, ${(took / FLIGHTS).toFixed(1)} ms a flight (target ≤ 15 s: ratio ${(took / 15000).toFixed(2)}); progress polled once a second while it ran: ${seen.length === 0 ? 'none (too quick to poll)' : seen.length <= 6 ? seen.join(', ') : `${seen.slice(0, 3).join(', ')} … ${seen.slice(-2).join(', ')} (${seen.length} polls)`}`
		);
		log(`server memory during the recompute: RSS ${mib(rssBefore)} before, peak ${mib(rssPeak)} (sampled every 50 ms); process high-water VmHWM ${mib(hwm)} (since the app started, the replay page included)`);
	}
	log(`machine: ${execFileSync('nproc').toString().trim()} cores; Node ${process.version}`);
} finally {
	await stopApp?.();
	await closeDb();
	const c = new pg.Client({ connectionString: adminUrl });
	await c.connect();
	await c.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
	await c.end();
}
