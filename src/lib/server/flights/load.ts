// Reading one flight for the fuel engine: its samples as columns (waypoint names turned into
// small integer ids), its fuel events, its aircraft's fuel setup, and the engine input built from
// them with the same mapping the browser uses ($lib/flight-inputs).
import { asc, eq, sql } from 'drizzle-orm';
import { engineInputsOf, fuelSetupOf, type AircraftFuelSetup } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from './recent-cruise';
import { aircraftAt } from '../calibration/in-force';
import { WPT_NONE, type FlightInput, type SampleColumns } from '$lib/fuel';
import { PAYLOAD_VERSION, type ReplayData } from '$lib/components/replay/payload';
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
}

const num = (v: unknown): number => (v === null || v === undefined ? NaN : Number(v));

/** Samples read per query: a page of row objects at a time, never the whole flight's. */
const PAGE_ROWS = 20_000;

/** A Float64Array / Int32Array twice the size, with the first `n` values kept. */
function grown<A extends Float64Array | Int32Array>(a: A, n: number): A {
	const b = new (a.constructor as new (size: number) => A)(Math.max(1024, a.length * 2));
	b.set(a.subarray(0, n));
	return b;
}

/**
 * The flight's samples in sequence order; a null cell becomes NaN ("not recorded"). Read page by
 * page (keyset on seq) straight into typed columns: a million samples as row objects would take
 * several hundred MB at once, the columns take about 50.
 */
export async function loadSampleColumns(flightId: string, q: Queryable = db): Promise<FlightSamples> {
	const counted = await q.execute<{ n: number }>(sql`select count(*)::int as n from samples where flight_id = ${flightId}`);
	let cap = Math.max(1, Number(counted.rows[0]?.n ?? 0));
	let t = new Float64Array(cap);
	let flow = new Float64Array(cap);
	let gs = new Float64Array(cap);
	let dtg = new Float64Array(cap);
	let alt = new Float64Array(cap);
	let wpt = new Int32Array(cap);
	let seq = new Int32Array(cap);
	const ids = new Map<string, number>();
	const waypoints: string[] = [];
	let hasAlt = false;
	let hasWpt = false;
	let n = 0;
	let after = -2147483648;
	for (;;) {
		// Epoch milliseconds as an exact integer: ms ÷ 1000 is the same double Date.getTime() ÷ 1000
		// gives, so server and browser feed the engine identical times.
		const result = await q.execute<{ seq: number; ms: number; flow: number | null; gs: number | null; dtg: number | null; alt: number | null; wpt: string | null }>(sql`
			select seq, (extract(epoch from t) * 1000)::float8 as ms, flow, gs, dtg, alt, wpt
			from samples where flight_id = ${flightId} and seq > ${after} order by seq limit ${PAGE_ROWS}`);
		const rows = result.rows;
		for (const r of rows) {
			// A live flight may have grown since the count.
			if (n === cap) {
				t = grown(t, n);
				flow = grown(flow, n);
				gs = grown(gs, n);
				dtg = grown(dtg, n);
				alt = grown(alt, n);
				wpt = grown(wpt, n);
				seq = grown(seq, n);
				cap = t.length;
			}
			const i = n++;
			seq[i] = Number(r.seq);
			t[i] = Number(r.ms) / 1000;
			flow[i] = num(r.flow);
			gs[i] = num(r.gs);
			dtg[i] = num(r.dtg);
			alt[i] = num(r.alt);
			if (r.alt !== null) hasAlt = true;
			if (r.wpt === null || r.wpt === '') wpt[i] = WPT_NONE;
			else {
				hasWpt = true;
				let id = ids.get(r.wpt);
				if (id === undefined) {
					id = waypoints.length;
					ids.set(r.wpt, id);
					waypoints.push(r.wpt);
				}
				wpt[i] = id;
			}
		}
		if (rows.length < PAGE_ROWS) break;
		after = seq[n - 1];
	}
	const fit = <A extends Float64Array | Int32Array>(a: A): A => (a.length === n ? a : (a.slice(0, n) as A));
	const columns: SampleColumns = { t: fit(t), flow: fit(flow), gs: fit(gs), dtg: fit(dtg) };
	if (hasAlt) columns.alt = fit(alt);
	if (hasWpt) columns.wpt = fit(wpt);
	return { columns, seq: fit(seq), waypoints, hasAlt, hasWpt };
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
export async function loadFlight(flightId: string, q: Queryable = db): Promise<LoadedFlight | null> {
	const [row] = await q.select({ flight: flights, aircraft }).from(flights).innerJoin(aircraft, eq(aircraft.id, flights.aircraftId)).where(eq(flights.id, flightId)).limit(1);
	if (!row) return null;
	const [events, samples, recent, asFlown] = await Promise.all([
		loadEvents(flightId, q),
		loadSampleColumns(flightId, q),
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
		columns: samples.columns,
		seq: samples.seq
	};
}
