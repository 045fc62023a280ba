// History benchmark: the aircraft's fuel history page data (stored per-flight and per-phase
// figures, the baseline, the high-burn finder, the reconciliation against receipts) for one
// aircraft with many flights, in a scratch database. One flight is recorded and computed for
// real; its stored rows are then copied to the other flights at later dates (the page never reads
// samples, so their samples are not copied). Prints times and rows; asserts nothing.
//
//   npm run bench:history [-- --flights 2000 --runs 20]
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase } from './lib/bench-app';
import { generateFlight, insertFlight } from '../tests/integration/replay-fixture';

const { values: opt } = parseArgs({ options: { flights: { type: 'string', default: '2000' }, runs: { type: 'string', default: '20' } } });
const FLIGHTS = Math.max(2, Number(opt.flights));
const RUNS = Math.max(1, Number(opt.runs));
const log = (s: string) => console.log(`bench:history: ${s}`);

const { dbUrl } = await scratchDatabase('burndown_bench_history');
process.env.DATABASE_URL = dbUrl;
const { db, closeDb } = await import('../src/lib/server/db');
const { recomputeSummary } = await import('../src/lib/server/flights/summary');
const { aircraftHistory } = await import('../src/lib/server/aircraft/history');
const { historyQuerySchema } = await import('../src/lib/schemas/history');

try {
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`insert into organisations (name, slug) values ('Bench Moor Flying Group', 'bench') returning id`)).rows[0].id as string;
	const ac = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule)
			 values ($1, 'BM-HST', 'Four-seat trainer', 'avgas', 0.719, 150, 'l', 'easa-nco.op.125-vfr-day') returning id`,
			[org]
		)
	).rows[0].id as string;
	const first = await insertFlight(c, { orgId: org, aircraftId: ac, pilotId: null, declaration: { kind: 'full' } }, generateFlight({ start: Date.UTC(2020, 0, 1, 9) / 1000, cruiseS: 3600 }));
	await recomputeSummary(first);
	// Copies of the computed flight, one a day, with its figures (columns read from the catalogue so
	// the copy follows the schema).
	const cols = (await c.query(`select column_name from information_schema.columns where table_name = 'flights' and column_name not in ('id', 'started_at', 'ended_at', 'upload_id') order by ordinal_position`)).rows.map((r) => `"${r.column_name}"`);
	await c.query(`create temporary table copies as select gen_random_uuid() as id, n from generate_series(1, ${FLIGHTS - 1}) n`);
	await c.query(
		`insert into flights (id, started_at, ended_at, ${cols.join(', ')})
		 select k.id, f.started_at + k.n * interval '1 day', f.ended_at + k.n * interval '1 day', ${cols.map((x) => `f.${x}`).join(', ')} from flights f, copies k where f.id = $1`,
		[first]
	);
	await c.query(`insert into flight_figures select k.id, ff.engine_time_s, ff.fuel_used_l, ff.fuel_per_engine_hour_lph, ff.cruise_specific_range_nm_per_l, ff.meter_factor, ff.gap_count, ff.gap_time_s, ff.leaning_moments from flight_figures ff, copies k where ff.flight_id = $1`, [first]);
	await c.query(`insert into flight_phase_figures select k.id, p.phase, p.time_s, p.fuel_l, p.distance_nm, p.average_flow_lph from flight_phase_figures p, copies k where p.flight_id = $1`, [first]);
	// A fill to full every ten days: the page also reconciles the flights between them.
	await c.query(`insert into pump_receipts (aircraft_id, at, amount, unit, amount_l, filled_to_full) select $1, timestamptz '2020-01-01 06:00Z' + n * interval '10 days', 80, 'l', 80, true from generate_series(0, ${Math.floor(FLIGHTS / 10)}) n`, [ac]);
	const counts = (await c.query(`select (select count(*) from flights)::int f, (select count(*) from flight_phase_figures)::int p, (select count(*) from pump_receipts)::int r`)).rows[0];
	await c.end();
	log(`${counts.f} flights, ${counts.p} phase rows, ${counts.r} receipts on one aircraft`);

	const viewer = { orgId: org, userId: 'bench', role: 'admin' as const };
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
			const t0 = performance.now();
			const h = await aircraftHistory(viewer, ac, query);
			times.push(performance.now() - t0);
			rows = h.rows.length;
			trend = h.trend.length;
		}
		times.sort((a, b) => a - b);
		const p = (x: number) => times[Math.min(times.length - 1, Math.ceil(x * times.length) - 1)];
		log(`${name}: ${rows} rows, ${trend} trend points; p50 ${p(0.5).toFixed(1)} ms, p95 ${p(0.95).toFixed(1)} ms over ${RUNS} runs (target p95 ≤ 200 ms: ratio ${(p(0.95) / 200).toFixed(2)})`);
	}
} finally {
	await closeDb();
}
