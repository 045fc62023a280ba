// Reading one flight for the fuel engine: its samples as columns (waypoint names turned into
// small integer ids), its fuel events, its aircraft's fuel setup, and the engine input built from
// them with the same mapping the browser uses ($lib/flight-inputs).
import { asc, eq, sql } from 'drizzle-orm';
import { engineInputsOf, fuelSetupOf, type AircraftFuelSetup } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from './recent-cruise';
import { aircraftAt } from '../calibration/in-force';
import { ColumnBuilder, WPT_NONE, type FlightInput, type SampleColumns } from '$lib/fuel';
import { PAYLOAD_VERSION, type ReplayData } from '$lib/wire/replay';
import { db, type Db, type Tx } from '../db';
import { aircraft, flights, fuelEvents, type Aircraft, type Flight, type FuelEventRow } from '../db/schema';

export type Queryable = Db | Tx;

export interface FlightSamples {
	columns: SampleColumns;
	seq: Int32Array;
	/** Waypoint names in order of first appearance; columns.wpt indexes into this list. */
	waypoints: string[];
	hasAlt: boolean;
	hasWpt: boolean;
	/** Whether the samples carry positions: then columns.lat and columns.lon (degrees, WGS 84, NaN where none). */
	hasPos: boolean;
}

export interface LoadOptions {
	/** Samples per query (tests read in odd-sized pages). */
	pageRows?: number;
}

/** Samples read per query: bounded pieces, never the whole flight's at once. */
const PAGE_ROWS = 100_000;

/** PostgreSQL's binary values (big-endian float8 / int4), sent base64-encoded, as numbers. */
function floatsOf(b64: string | null, n: number): Float64Array {
	const out = new Float64Array(n);
	if (b64 === null) return out.fill(NaN);
	const buf = Buffer.from(b64, 'base64');
	const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
	for (let i = 0; i < n; i++) out[i] = view.getFloat64(i * 8, false);
	return out;
}
function intsOf(b64: string, n: number): Int32Array {
	const out = new Int32Array(n);
	const buf = Buffer.from(b64, 'base64');
	const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
	for (let i = 0; i < n; i++) out[i] = view.getInt32(i * 4, false);
	return out;
}

/** Float columns of a page; a null cell comes as NaN. */
const PACKED = ['ms', 'flow', 'gs', 'dtg', 'alt', 'lat', 'lon'] as const;
type PackedRow = { n: number; seq: string; has_alt: boolean | null } & Record<(typeof PACKED)[number], string>;

/**
 * The flight's samples in sequence order, through the engine's one rows→columns builder
 * ($lib/fuel/columns). Each page (keyset on seq) arrives as one row of packed columns — each a
 * run of PostgreSQL's binary values, base64 in the text protocol — so no object is built per
 * sample; waypoints come as the rows where the name changes (few). A million samples take their
 * columns (about 50 MB) and one page's text at a time.
 */
export async function loadSampleColumns(flightId: string, q: Queryable = db, o: LoadOptions = {}): Promise<FlightSamples> {
	const pageRows = o.pageRows ?? PAGE_ROWS;
	const counted = await q.execute<{ n: number }>(sql`select count(*)::int as n from samples where flight_id = ${flightId}`);
	// A live flight may grow after the count: the builder grows with it.
	const expected = Math.max(1, Number(counted.rows[0]?.n ?? 0));
	const builder = new ColumnBuilder(expected);
	let after = -2147483648;
	for (;;) {
		// The page is read in seq order by the sorted subquery the aggregates consume (checked below).
		// Epoch milliseconds as an exact integer: ms ÷ 1000 is the same double Date.getTime() ÷ 1000
		// gives, so server and browser feed the engine identical times.
		const [packed, changes] = await Promise.all([
			q.execute<PackedRow>(sql`
				select count(*)::int as n,
					encode(string_agg(int4send(seq), ''::bytea), 'base64') as seq,
					encode(string_agg(float8send((extract(epoch from t) * 1000)::float8), ''::bytea), 'base64') as ms,
					encode(string_agg(float8send(coalesce(flow, 'NaN')), ''::bytea), 'base64') as flow,
					encode(string_agg(float8send(coalesce(gs, 'NaN')), ''::bytea), 'base64') as gs,
					encode(string_agg(float8send(coalesce(dtg, 'NaN')), ''::bytea), 'base64') as dtg,
					encode(string_agg(float8send(coalesce(alt, 'NaN')), ''::bytea), 'base64') as alt,
					bool_or(alt is not null) as has_alt,
					encode(string_agg(float8send(coalesce(lat, 'NaN')), ''::bytea), 'base64') as lat,
					encode(string_agg(float8send(coalesce(lon, 'NaN')), ''::bytea), 'base64') as lon
				from (select seq, t, flow, gs, dtg, alt, lat, lon from samples where flight_id = ${flightId} and seq > ${after} order by seq limit ${pageRows}) page`),
			// The waypoint column as runs: the rows where the name changes ('' is no waypoint).
			q.execute<{ seq: number; wpt: string | null }>(sql`
				select seq, wpt from (
					select seq, nullif(wpt, '') as wpt, lag(nullif(wpt, '')) over (order by seq) as prev, row_number() over (order by seq) as k
					from (select seq, wpt from samples where flight_id = ${flightId} and seq > ${after} order by seq limit ${pageRows}) page
				) runs where k = 1 or wpt is distinct from prev order by seq`)
		]);
		const r = packed.rows[0];
		const n = Number(r?.n ?? 0);
		if (n === 0) break;
		let seq = intsOf(r.seq, n);
		let cols = PACKED.map((k) => floatsOf(r[k], n));
		let ordered = true;
		for (let i = 1; i < n && ordered; i++) ordered = seq[i] > seq[i - 1];
		if (!ordered) {
			// Never seen; kept so a planner that fed the aggregates out of order cannot misplace a sample.
			const order = Array.from(seq.keys()).sort((x, y) => seq[x] - seq[y]);
			seq = Int32Array.from(order, (i) => seq[i]);
			cols = cols.map((c) => Float64Array.from(order, (i) => c[i]));
		}
		const names: string[] = [];
		const index = new Map<string, number>();
		const wpt = new Int32Array(n).fill(WPT_NONE);
		const runs = changes.rows;
		for (let k = 0, i = 0; k < runs.length; k++) {
			const name = runs[k].wpt;
			let id = WPT_NONE;
			if (name !== null) {
				id = index.get(name) ?? names.length;
				if (id === names.length) {
					index.set(name, id);
					names.push(name);
				}
			}
			const until = k + 1 < runs.length ? Number(runs[k + 1].seq) : Infinity;
			while (i < n && seq[i] < Number(runs[k].seq)) i++;
			for (; i < n && seq[i] < until; i++) wpt[i] = id;
		}
		builder.pushBlock({ seq, tMs: cols[0], flow: cols[1], gs: cols[2], dtg: cols[3], alt: cols[4], lat: cols[5], lon: cols[6], altRecorded: r.has_alt === true, wpt, names });
		if (n < pageRows) break;
		after = seq[n - 1];
	}
	return { columns: builder.columns(), seq: builder.seq(), waypoints: builder.waypoints(), hasAlt: builder.hasAlt, hasWpt: builder.hasWpt, hasPos: builder.hasPos };
}

export interface LoadedFlight {
	flight: Flight;
	aircraft: Aircraft;
	setup: AircraftFuelSetup;
	events: FuelEventRow[];
	samples: FlightSamples;
	/** The engine input, from the same mapping the browser uses. */
	input: FlightInput;
}

export async function loadEvents(flightId: string, q: Queryable = db): Promise<FuelEventRow[]> {
	return q.select().from(fuelEvents).where(eq(fuelEvents.flightId, flightId)).orderBy(asc(fuelEvents.t), asc(fuelEvents.createdAt));
}

/** Everything the engine needs for one flight; null when there is no such flight. */
export async function loadFlight(flightId: string, q: Queryable = db, o: LoadOptions = {}): Promise<LoadedFlight | null> {
	const [row] = await q.select({ flight: flights, aircraft }).from(flights).innerJoin(aircraft, eq(aircraft.id, flights.aircraftId)).where(eq(flights.id, flightId)).limit(1);
	if (!row) return null;
	const [events, samples, recent, asFlown] = await Promise.all([
		loadEvents(flightId, q),
		loadSampleColumns(flightId, q, o),
		recentCruiseFlowLph(row.aircraft.id, row.flight, q),
		// The meter factor and K-factor in force at this flight's engine start (dated calibration).
		aircraftAt(row.aircraft, row.flight.startedAt, q)
	]);
	const setup = fuelSetupOf(asFlown, recent);
	return {
		flight: row.flight,
		aircraft: asFlown,
		setup,
		events,
		samples,
		input: { columns: samples.columns, ...engineInputsOf(setup, row.flight, events) }
	};
}

/** The samples API's content for a loaded flight. */
export function replayDataOf(f: LoadedFlight): ReplayData {
	const { flight, aircraft: a, samples } = f;
	return {
		version: PAYLOAD_VERSION,
		flight: {
			id: flight.id,
			title: flight.title,
			status: flight.status,
			source: flight.source,
			startedAt: flight.startedAt.toISOString(),
			endedAt: flight.endedAt?.toISOString() ?? null,
			lastSeq: flight.lastSeq,
			declarationConfirmed: flight.declarationConfirmed
		},
		aircraft: { id: a.id, registration: a.registration, type: a.type, displayUnit: a.displayUnit, fuelType: a.fuelType },
		setup: f.setup,
		declaration: f.input.declaration,
		previousOnBoardL: flight.previousOnBoardL,
		events: f.events.map((e) => ({ id: e.id, t: e.t.getTime() / 1000, kind: e.kind, amountL: e.amountL, note: e.note })),
		waypoints: samples.waypoints,
		count: samples.seq.length,
		hasAlt: samples.hasAlt,
		hasWpt: samples.hasWpt,
		hasPos: samples.hasPos,
		columns: samples.columns,
		seq: samples.seq
	};
}
