// Reading one flight for the fuel engine: its samples as columns (waypoint names turned into
// small integer ids), its fuel events, its aircraft's fuel setup, and the engine input built from
// them with the same mapping the browser uses ($lib/flight-inputs).
import { asc, eq, sql } from 'drizzle-orm';
import { engineInputsOf, fuelSetupOf, type AircraftFuelSetup } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from './recent-cruise';
import { aircraftAt } from '../calibration/in-force';
import { ColumnBuilder, type FlightInput, type SampleColumns } from '$lib/fuel';
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
	/** Latitude and longitude (degrees, WGS 84) per sample, NaN where none; only when asked for, and null when no sample has one. */
	positions?: { lat: Float64Array; lon: Float64Array } | null;
}

export interface LoadOptions {
	/** Also read each sample's position (the export's log shows it). */
	positions?: boolean;
}

/** Samples read per query: a page of row objects at a time, never the whole flight's. */
const PAGE_ROWS = 20_000;

/**
 * The flight's samples in sequence order, through the engine's one rows→columns builder
 * ($lib/fuel/columns). Read page by page (keyset on seq) straight into typed columns: a million
 * samples as row objects would take several hundred MB at once, the columns take about 50.
 */
export async function loadSampleColumns(flightId: string, q: Queryable = db, o: LoadOptions = {}): Promise<FlightSamples> {
	const counted = await q.execute<{ n: number }>(sql`select count(*)::int as n from samples where flight_id = ${flightId}`);
	// A live flight may grow after the count: the builder grows with it.
	const expected = Math.max(1, Number(counted.rows[0]?.n ?? 0));
	const builder = new ColumnBuilder(expected);
	let after = -2147483648;
	// Positions straight into typed columns (grown like the builder's when a live flight grew).
	let lat = new Float64Array(o.positions ? expected : 0);
	let lon = new Float64Array(o.positions ? expected : 0);
	let n = 0;
	let hasPosition = false;
	const positions = o.positions ? sql`, lat, lon` : sql``;
	for (;;) {
		// Epoch milliseconds as an exact integer: ms ÷ 1000 is the same double Date.getTime() ÷ 1000
		// gives, so server and browser feed the engine identical times.
		const result = await q.execute<{ seq: number; ms: number; flow: number | null; gs: number | null; dtg: number | null; alt: number | null; wpt: string | null; lat?: number | null; lon?: number | null }>(sql`
			select seq, (extract(epoch from t) * 1000)::float8 as ms, flow, gs, dtg, alt, wpt${positions}
			from samples where flight_id = ${flightId} and seq > ${after} order by seq limit ${PAGE_ROWS}`);
		const rows = result.rows;
		for (const r of rows) builder.push(Number(r.seq), Number(r.ms), r.flow, r.gs, r.dtg, r.alt, r.wpt);
		if (o.positions)
			for (const r of rows) {
				if (n === lat.length) {
					const grown = [new Float64Array(lat.length * 2), new Float64Array(lat.length * 2)];
					grown[0].set(lat);
					grown[1].set(lon);
					[lat, lon] = grown;
				}
				const has = r.lat !== null && r.lat !== undefined && r.lon !== null && r.lon !== undefined;
				hasPosition ||= has;
				lat[n] = has ? Number(r.lat) : NaN;
				lon[n] = has ? Number(r.lon) : NaN;
				n++;
			}
		if (rows.length < PAGE_ROWS) break;
		after = Number(rows[rows.length - 1].seq);
	}
	const out: FlightSamples = { columns: builder.columns(), seq: builder.seq(), waypoints: builder.waypoints(), hasAlt: builder.hasAlt, hasWpt: builder.hasWpt };
	if (o.positions) out.positions = hasPosition ? { lat: lat.subarray(0, n), lon: lon.subarray(0, n) } : null;
	return out;
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
		columns: samples.columns,
		seq: samples.seq
	};
}
