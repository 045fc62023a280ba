// The samples table as the live path uses it: storing a batch once whatever the retries, the
// highest contiguous sequence (what a recorder is acknowledged and what viewers may see), the
// stored neighbours a batch must fit between in time, and reading sequence ranges back.
import { sql } from 'drizzle-orm';
import { ColumnBuilder, type SampleColumns } from '$lib/fuel';
import type { SampleRunRows } from '$lib/wire/live';
import { db, type Db, type Tx } from '../db';
import type { LiveSample } from './batch';

export type Queryable = Db | Tx;

/** Inserts the batch's samples that are not stored yet; returns how many were new. */
export async function insertSamples(q: Queryable, flightId: string, samples: readonly LiveSample[]): Promise<number> {
	return insertSamplesOf(q, [{ flightId, samples }]);
}

/** insertSamples for the batches of several flights in one statement; returns how many were new in all. */
export async function insertSamplesOf(q: Queryable, batches: readonly { flightId: string; samples: readonly LiveSample[] }[]): Promise<number> {
	const rows = batches.flatMap((b) => b.samples.map((s) => [b.flightId, s] as const));
	if (rows.length === 0) return 0;
	const col = <T>(f: (s: LiveSample, flightId: string) => T) => sql.param(rows.map(([id, s]) => f(s, id)));
	// One statement with array parameters (unnest): eleven parameters whatever the batch sizes.
	const result = await q.execute(sql`
		insert into samples (flight_id, seq, t, flow, gs, dtg, wpt, lat, lon, alt)
		select u.* from unnest(
			${col((_, id) => id)}::uuid[],
			${col((s) => s.seq)}::int[],
			${col((s) => new Date(s.tMs).toISOString())}::timestamptz[],
			${col((s) => s.flow)}::float8[],
			${col((s) => s.gs)}::float8[],
			${col((s) => s.dtg)}::float8[],
			${col((s) => s.wpt)}::text[],
			${col((s) => s.lat)}::float8[],
			${col((s) => s.lon)}::float8[],
			${col((s) => s.alt)}::float8[]
		) as u
		on conflict (flight_id, seq) do nothing`);
	return result.rowCount ?? 0;
}

/**
 * The highest sequence s such that every sequence from the flight's start up to s is stored,
 * given that everything up to `known` already is. Walks forward from known + 1 over the primary
 * key: the first stored sequence whose successor is missing ends the run.
 */
export async function contiguousFrom(q: Queryable, flightId: string, known: number): Promise<number> {
	const result = await q.execute<{ s: number | null }>(sql`
		select case
			when not exists (select 1 from samples where flight_id = ${flightId} and seq = ${known + 1}) then ${known}
			else (
				select min(a.seq) from samples a
				where a.flight_id = ${flightId} and a.seq > ${known}
					and not exists (select 1 from samples b where b.flight_id = ${flightId} and b.seq = a.seq + 1)
			)
		end as s`);
	return Number(result.rows[0]?.s ?? known);
}

/** A stored sample as a retry is compared with it: every column a batch carries. */
export type StoredSample = Pick<LiveSample, 'tMs' | 'flow' | 'gs' | 'dtg' | 'alt' | 'wpt' | 'lat' | 'lon'>;

/** The columns of two samples that differ (time first), empty when one is an exact resend of the other. */
export function differingFields(stored: StoredSample, sent: LiveSample): (keyof StoredSample)[] {
	const keys: (keyof StoredSample)[] = ['tMs', 'flow', 'gs', 'dtg', 'alt', 'wpt', 'lat', 'lon'];
	return keys.filter((k) => stored[k] !== sent[k]);
}

export interface Neighbours {
	/** The stored sample just below the batch's first sequence, if any. */
	below: { seq: number; tMs: number } | null;
	above: { seq: number; tMs: number } | null;
	/** Stored samples with the batch's own sequence numbers (retries), by seq. */
	same: Map<number, StoredSample>;
	/** The highest sequence stored at all (beyond holes too). */
	highest: number;
}

/** What is stored around and inside the sequence range lo..hi. */
export async function neighbours(q: Queryable, flightId: string, lo: number, hi: number): Promise<Neighbours> {
	const ms = sql`(extract(epoch from t) * 1000)::float8`;
	type Row = { k: string; seq: number; ms: number; flow: number | null; gs: number | null; dtg: number | null; alt: number | null; wpt: string | null; lat: number | null; lon: number | null };
	const none = sql`null::float8 as flow, null::float8 as gs, null::float8 as dtg, null::float8 as alt, null::text as wpt, null::float8 as lat, null::float8 as lon`;
	const result = await q.execute<Row>(sql`
		(select 'b' as k, seq, ${ms} as ms, ${none} from samples where flight_id = ${flightId} and seq < ${lo} order by seq desc limit 1)
		union all
		(select 'a', seq, ${ms}, ${none} from samples where flight_id = ${flightId} and seq > ${hi} order by seq limit 1)
		union all
		(select 's', seq, ${ms}, flow, gs, dtg, alt, wpt, lat, lon from samples where flight_id = ${flightId} and seq between ${lo} and ${hi})
		union all
		(select 'h', seq, 0, ${none} from samples where flight_id = ${flightId} order by seq desc limit 1)`);
	const out: Neighbours = { below: null, above: null, same: new Map(), highest: -1 };
	for (const r of result.rows) {
		const seq = Number(r.seq);
		const tMs = Math.round(Number(r.ms));
		if (r.k === 'b') out.below = { seq, tMs };
		else if (r.k === 'a') out.above = { seq, tMs };
		else if (r.k === 's') out.same.set(seq, { tMs, flow: r.flow, gs: r.gs, dtg: r.dtg, alt: r.alt, wpt: r.wpt, lat: r.lat, lon: r.lon });
		else out.highest = seq;
	}
	return out;
}

/** Samples with after < seq ≤ upTo in sequence order, at most `limit`, as rows for the wire. */
export interface SampleRun extends SampleRunRows {
	seq: number[];
}

export interface RunRequest {
	flightId: string;
	after: number;
	upTo: number;
	limit: number;
}

export async function readRun(flightId: string, after: number, upTo: number, limit: number, q: Queryable = db): Promise<SampleRun> {
	return (await readRuns([{ flightId, after, upTo, limit }], q))[0];
}

/** The runs of several flights (or ranges) in one query, in the order asked. */
export async function readRuns(requests: readonly RunRequest[], q: Queryable = db): Promise<SampleRun[]> {
	const runs: SampleRun[] = requests.map(() => ({ seq: [], tMs: [], flow: [], gs: [], dtg: [], alt: [], wpt: [], lat: [], lon: [] }));
	if (requests.length === 0) return runs;
	const col = <T>(f: (r: RunRequest) => T) => sql.param(requests.map(f));
	const result = await q.execute<{ i: number; seq: number; ms: number; flow: number | null; gs: number | null; dtg: number | null; alt: number | null; wpt: string | null; lat: number | null; lon: number | null }>(sql`
		select r.i::int as i, s.seq, (extract(epoch from s.t) * 1000)::float8 as ms, s.flow, s.gs, s.dtg, s.alt, s.wpt, s.lat, s.lon
		from unnest(${col((r) => r.flightId)}::uuid[], ${col((r) => r.after)}::int[], ${col((r) => r.upTo)}::int[], ${col((r) => r.limit)}::int[])
			with ordinality as r(f, after, up_to, lim, i)
		cross join lateral (
			select seq, t, flow, gs, dtg, alt, wpt, lat, lon from samples
			where flight_id = r.f and seq > r.after and seq <= r.up_to
			order by seq limit r.lim
		) s
		order by r.i, s.seq`);
	for (const r of result.rows) {
		const run = runs[Number(r.i) - 1];
		run.seq.push(Number(r.seq));
		run.tMs.push(Math.round(Number(r.ms)));
		run.flow.push(r.flow);
		run.gs.push(r.gs);
		run.dtg.push(r.dtg);
		run.alt.push(r.alt);
		run.wpt.push(r.wpt);
		run.lat!.push(r.lat);
		run.lon!.push(r.lon);
	}
	return runs;
}

/**
 * A run as engine columns, through the engine's one rows→columns builder. Waypoint names become
 * ids in order of first appearance, continuing `ids` across calls: the same numbering the
 * replay loader gives.
 */
export function runColumns(run: SampleRun, ids: Map<string, number>): SampleColumns {
	const n = run.seq.length;
	const b = new ColumnBuilder(n, ids);
	for (let i = 0; i < n; i++) b.push(run.seq[i], run.tMs[i], run.flow[i], run.gs[i], run.dtg[i], run.alt[i], run.wpt[i], run.lat?.[i] ?? null, run.lon?.[i] ?? null);
	return b.columns();
}
