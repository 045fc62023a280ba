// Export benchmark (npm run bench:export): the server's peak memory while exporting the fuel log
// of a 1,000,000-sample flight as CSV through the real HTTP route of the built app
// (GET /api/v1/flights/:id/export), once alone and then by four viewers at once. Prints the
// resident set size before, the peak during each run, the answers' statuses and sizes, and
// seconds. A benchmark: it asserts nothing.
//
//   npm run bench:export [-- --rows 1000000 --clients 4 --port 4194 --gzip]
//
// Uses the project's disposable test cluster (or BENCH_ADMIN_DATABASE_URL) with a scratch
// database, and writes the samples with one INSERT … SELECT from generate_series.
import fs from 'node:fs';
import { performance } from 'node:perf_hooks';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { scratchDatabase, startBenchApp } from './lib/bench-app';
import { hashToken, newToken } from '../src/lib/server/tokens';

const { values: opt } = parseArgs({
	options: {
		rows: { type: 'string', default: '1000000' },
		clients: { type: 'string', default: '4' },
		port: { type: 'string', default: '4194' },
		gzip: { type: 'boolean', default: false }
	}
});
const ROWS = Math.max(1000, Number(opt.rows));
const CLIENTS = Math.max(1, Number(opt.clients));
const PORT = Number(opt.port);
const BENCH_DB = 'burndown_bench_export';

const log = (s: string) => console.log(`bench:export: ${s}`);
const mib = (kb: number) => `${(kb / 1024).toFixed(0)} MiB`;

/** Resident set size of a process, in KiB, from /proc. */
function rssKb(pid: number): number {
	const m = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
	return m ? Number(m[1]) : 0;
}

async function main() {
	const { adminUrl, dbUrl } = await scratchDatabase(BENCH_DB);
	const c = new pg.Client({ connectionString: dbUrl });
	await c.connect();
	const token = newToken('bdk_');
	const [org] = (await c.query<{ id: string }>(`INSERT INTO organisations (name, slug) VALUES ('Bench Export Flying Group', 'bench-export') RETURNING id`)).rows;
	await c.query(`INSERT INTO users (id, email, name, password_hash) VALUES ('bench-viewer', 'viewer@bench.example', 'Bench viewer', 'x')`);
	await c.query(`INSERT INTO memberships (org_id, user_id, role) VALUES ($1, 'bench-viewer', 'viewer')`, [org.id]);
	await c.query(`INSERT INTO api_tokens (user_id, name, token_hash) VALUES ('bench-viewer', 'bench', $1)`, [hashToken(token)]);
	const [ac] = (
		await c.query<{ id: string }>(
			`INSERT INTO aircraft (org_id, registration, type, fuel_type, density_kg_per_l, capacity_l, display_unit, reserve_rule, baseline_cruise_lph)
			 VALUES ($1, 'BN-EXP', 'Bench tanker', 'avgas', 0.719, 100000, 'l', 'faa-91.151-vfr-day', 34) RETURNING id`,
			[org.id]
		)
	).rows;
	const t0 = '2026-05-02T06:00:00Z';
	const [flight] = (
		await c.query<{ id: string }>(
			`INSERT INTO flights (org_id, aircraft_id, source, status, started_at, ended_at, declaration, title, sample_count, last_seq, last_sample_at)
			 VALUES ($1, $2, 'upload', 'closed', $3::timestamptz, $3::timestamptz + make_interval(secs => $4 - 1), '{"kind":"full"}', 'Bench export', $4, $4 - 1, $3::timestamptz + make_interval(secs => $4 - 1)) RETURNING id`,
			[org.id, ac.id, t0, ROWS]
		)
	).rows;
	let t = performance.now();
	await c.query(
		`INSERT INTO samples (flight_id, seq, t, flow, gs, dtg, wpt, alt)
		 SELECT $1, g, $2::timestamptz + make_interval(secs => g), 34 + 2 * sin(g / 37.0), CASE WHEN g < 300 THEN g % 20 ELSE 108 + 2 * sin(g / 53.0) END,
		        60 - (g % 1800) / 30.0, 'WP' || lpad(((g / 1800) % 1000)::text, 3, '0'), 4500 + 500 * sin(g / 900.0)
		 FROM generate_series(0, $3 - 1) g`,
		[flight.id, t0, ROWS]
	);
	log(`${ROWS.toLocaleString('en-US')} samples written in ${((performance.now() - t) / 1000).toFixed(1)} s`);
	await c.end();

	const app = await startBenchApp({ databaseUrl: dbUrl, port: PORT, log });
	const pid = app.server.pid!;
	const url = `${app.origin}/api/v1/flights/${flight.id}/export?what=log`;
	const headers: Record<string, string> = { authorization: `Bearer ${token}`, ...(opt.gzip ? { 'accept-encoding': 'gzip' } : {}) };
	try {
		// Warm up (first request compiles the routes) with the summary, which is small.
		await (await fetch(`${app.origin}/api/v1/flights/${flight.id}/export?what=summary`, { headers })).text();
		const runs: [string, number][] = [
			['one export', 1],
			[`${CLIENTS} exports at once`, CLIENTS]
		];
		for (const [label, n] of runs) {
			await new Promise((r) => setTimeout(r, 1000));
			const base = rssKb(pid);
			let peak = base;
			const timer = setInterval(() => (peak = Math.max(peak, rssKb(pid))), 20);
			t = performance.now();
			const results = await Promise.all(
				Array.from({ length: n }, async () => {
					const res = await fetch(url, { headers });
					let bytes = 0;
					const reader = res.body!.getReader();
					for (let r = await reader.read(); !r.done; r = await reader.read()) bytes += r.value.length;
					return { status: res.status, bytes };
				})
			);
			const ms = performance.now() - t;
			clearInterval(timer);
			peak = Math.max(peak, rssKb(pid));
			const statuses = results.map((r) => `${r.status}${r.status === 200 ? ` (${(r.bytes / 1024 / 1024).toFixed(0)} MiB)` : ''}`).join(', ');
			log(`${label}: RSS before ${mib(base)}, peak ${mib(peak)} (+${mib(peak - base)}), ${(ms / 1000).toFixed(1)} s; answers ${statuses}`);
		}
		const health = await fetch(`${app.origin}/api/health`);
		log(`server still answering: /api/health ${health.status}`);
	} finally {
		await app.stop();
		const a = new pg.Client({ connectionString: adminUrl });
		await a.connect();
		await a.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
		await a.end();
	}
}

main().catch((e) => {
	console.error(`bench:export: ${(e as Error).stack ?? e}`);
	process.exit(1);
});
