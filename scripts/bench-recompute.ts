// Recompute benchmark: what an aircraft-level change costs now that it recomputes every flight of
// the aircraft in its transaction (a new capacity, baseline flow or meter factor). Inserts a fleet
// history of flights on one aircraft into a scratch database, saves the aircraft through the same
// service the aircraft page calls, and prints the time per flight and the heap it needed next to
// the heap of loading a single flight. The peak includes garbage not yet collected; under a small
// heap limit it shows what is kept, since the flights are recomputed one at a time. A benchmark:
// it asserts nothing.
//
//   npx tsx --expose-gc scripts/bench-recompute.ts [--flights 24] [--samples 7200]
//   node --max-old-space-size=40 --expose-gc --import tsx scripts/bench-recompute.ts --flights 48
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase } from './lib/bench-app';
import { generateFlight, insertFlight, PROFILE_OVERHEAD_S } from '../tests/integration/replay-fixture';

const { values: opt } = parseArgs({ options: { flights: { type: 'string', default: '24' }, samples: { type: 'string', default: '7200' } } });
const FLIGHTS = Math.max(1, Number(opt.flights));
const SAMPLES = Math.max(3000, Number(opt.samples));
const BENCH_DB = 'burndown_bench_recompute';
const log = (s: string) => console.log(`bench:recompute: ${s}`);
const mib = (b: number) => `${(b / 1024 / 1024).toFixed(1)} MiB`;

const { adminUrl, dbUrl } = await scratchDatabase(BENCH_DB);
process.env.DATABASE_URL = dbUrl;
// The app's modules read DATABASE_URL when first used: import them after it is set.
const { db, closeDb } = await import('../src/lib/server/db');
const { aircraft } = await import('../src/lib/server/db/schema');
const { recomputeSummary } = await import('../src/lib/server/flights/summary');
const { loadFlight } = await import('../src/lib/server/flights/load');
const { updateAircraft, aircraftFormValues } = await import('../src/lib/server/services/aircraft');
const { aircraftFormSchema } = await import('../src/lib/schemas/aircraft');
const { eq } = await import('drizzle-orm');

/** Peak heap above `base` while `run` runs, sampled every 5 ms. */
async function peakHeap<T>(run: () => Promise<T>): Promise<{ result: T; peak: number; ms: number }> {
	global.gc?.();
	const base = process.memoryUsage().heapUsed;
	let peak = 0;
	const timer = setInterval(() => (peak = Math.max(peak, process.memoryUsage().heapUsed - base)), 5);
	const t0 = performance.now();
	const result = await run();
	const ms = performance.now() - t0;
	clearInterval(timer);
	peak = Math.max(peak, process.memoryUsage().heapUsed - base);
	return { result, peak, ms };
}

try {
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const org = (await c.query(`insert into organisations (name, slug) values ('Bench Moor Flying Group', 'bench') returning id`)).rows[0].id;
	const ac = (
		await c.query(
			`insert into aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph, low_fuel_l, low_endurance_min)
			 values ($1, 'BM-FLT', 'Four-seat tourer', 'avgas', 0.719, 400, 'l', 'easa-nco.op.125-vfr-day', 31, 40, 45) returning id`,
			[org]
		)
	).rows[0].id as string;
	const ids: string[] = [];
	for (let k = 0; k < FLIGHTS; k++) {
		const s = generateFlight({ start: Date.UTC(2025, 0, 1 + k, 9) / 1000, cruiseS: SAMPLES - PROFILE_OVERHEAD_S });
		ids.push(await insertFlight(c, { orgId: org, aircraftId: ac, pilotId: null, declaration: { kind: 'full' } }, s));
	}
	await c.end();
	await db.transaction(async (tx) => {
		for (const id of ids) await recomputeSummary(id, tx);
	});
	log(`${FLIGHTS} flights of ${SAMPLES.toLocaleString('en-US')} samples each on one aircraft`);

	const one = await peakHeap(() => loadFlight(ids[0]));
	log(`loading one flight: ${one.ms.toFixed(0)} ms, heap ${mib(one.peak)}`);

	const [row] = await db.select().from(aircraft).where(eq(aircraft.id, ac));
	const input = aircraftFormSchema.parse({ ...aircraftFormValues(row), capacity: '390' });
	const save = await peakHeap(() => updateAircraft(org, ac, input, null));
	if (!save.result.ok) throw new Error(save.result.message);
	log(`saving a new capacity, every flight recomputed in the transaction: ${save.ms.toFixed(0)} ms (${(save.ms / FLIGHTS).toFixed(0)} ms a flight), peak heap ${mib(save.peak)} (${(save.peak / Math.max(1, one.peak)).toFixed(1)}× one flight's load)`);
	await closeDb();
} finally {
	const c = new pg.Client({ connectionString: adminUrl });
	await c.connect();
	await c.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
	await c.end();
}
