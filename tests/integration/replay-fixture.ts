// A made-up recorder flight for the replay tests, the end-to-end test and the replay benchmark:
// taxi, climb, cruise over a few invented waypoints, descent, taxi in, at 1 Hz, with an optional
// recorder dropout. Deterministic (no randomness), and written straight into PostgreSQL with one
// UNNEST insert so any size fits in a single statement.
import type pg from 'pg';

export interface FixtureOptions {
	/** First sample, epoch seconds UTC. */
	start?: number;
	/** Cruise length in seconds; the rest of the profile adds PROFILE_OVERHEAD_S. */
	cruiseS?: number;
	/**
	 * 'usgal': the recorder logged US gal/h to one decimal, stored converted to L/h (full doubles,
	 * as an upload from a US recorder is); 'l' (default): L/h to two decimals.
	 */
	recordedIn?: 'l' | 'usgal';
	/** Leave out this many samples from this offset (a recorder dropout). */
	dropout?: { at: number; seconds: number } | null;
}

export interface FixtureSamples {
	t: Float64Array;
	flow: Float64Array;
	gs: Float64Array;
	dtg: Float64Array;
	alt: Float64Array;
	wpt: (string | null)[];
}

/** Invented waypoint names; each leg is LEG_NM long. */
export const WAYPOINTS = ['MARSH', 'TALLY', 'OXBOW', 'CAIRN', 'FENNY', 'SKERRY', 'BRACKEN', 'LOWTHER'];
export const LEG_NM = 28;

// Profile in seconds: [length, ground speed kt, flow L/h, altitude from, altitude to]. Flows are
// typical of a four-seat 160 hp trainer: climb near 1.4× cruise, idle-ish on the ground.
const profile = (cruiseS: number): [number, number, number, number, number][] => [
	[300, 9, 17, 420, 420],
	[600, 78, 42, 420, 5500],
	[cruiseS, 108, 30.5, 5500, 5500],
	[600, 118, 19, 5500, 900],
	[240, 8, 14, 420, 420],
	[30, 0, 0, 420, 420]
];

/** Seconds of taxi, climb, descent, taxi-in and shutdown around the cruise. */
export const PROFILE_OVERHEAD_S = profile(0).reduce((a, p) => a + p[0], 0);

/** 1 US gallon = 3.785411784 L (NIST Handbook 44, Appendix C). */
const L_PER_USGAL = 3.785411784;

export function generateFlight(o: FixtureOptions = {}): FixtureSamples {
	const start = o.start ?? Date.UTC(2025, 4, 14, 9, 0, 0) / 1000;
	const plan = profile(o.cruiseS ?? 3600);
	const total = plan.reduce((a, p) => a + p[0], 0);
	const skip = o.dropout ?? null;
	const keep = (i: number) => !skip || i < skip.at || i >= skip.at + skip.seconds;
	const n = skip ? total - Math.min(skip.seconds, Math.max(0, total - skip.at)) : total;
	const out: FixtureSamples = { t: new Float64Array(n), flow: new Float64Array(n), gs: new Float64Array(n), dtg: new Float64Array(n), alt: new Float64Array(n), wpt: new Array(n) };
	let k = 0;
	let flown = 0;
	let s = 0;
	for (const [len, gs, flow, alt0, alt1] of plan) {
		for (let j = 0; j < len; j++, s++) {
			// A slow wiggle stands in for sensor noise and turbulence.
			const g = gs === 0 ? 0 : gs + 2 * Math.sin(s / 53);
			const f = flow === 0 ? 0 : flow + 0.6 * Math.sin(s / 37);
			flown += g / 3600;
			const leg = Math.min(WAYPOINTS.length - 1, Math.floor(flown / LEG_NM));
			if (!keep(s)) continue;
			out.t[k] = start + s;
			out.gs[k] = Math.round(g * 10) / 10;
			out.flow[k] = o.recordedIn === 'usgal' ? (Math.round((f / L_PER_USGAL) * 10) / 10) * L_PER_USGAL : Math.round(f * 100) / 100;
			out.dtg[k] = Math.max(0, Math.round(((leg + 1) * LEG_NM - flown) * 100) / 100);
			out.alt[k] = Math.round(alt0 + ((alt1 - alt0) * j) / len);
			out.wpt[k] = WAYPOINTS[leg];
			k++;
		}
	}
	return out;
}

export interface FixtureFlight {
	orgId: string;
	aircraftId: string;
	pilotId: string | null;
	title?: string;
	declaration?: unknown;
	previousOnBoardL?: number | null;
}

type Sql = Pick<pg.Pool | pg.Client | pg.PoolClient, 'query'>;

/** Inserts a closed, uploaded flight and its samples; returns the flight id. */
export async function insertFlight(client: Sql, f: FixtureFlight, s: FixtureSamples): Promise<string> {
	const n = s.t.length;
	const iso = (x: number) => new Date(Math.round(x * 1000)).toISOString();
	const { rows } = await client.query(
		`insert into flights (org_id, aircraft_id, pilot_id, title, source, status, started_at, ended_at, declaration, previous_on_board_l, sample_count, last_seq)
		 values ($1, $2, $3, $4, 'upload', 'closed', $5, $6, $7, $8, $9, $10) returning id`,
		[f.orgId, f.aircraftId, f.pilotId, f.title ?? 'replay fixture', iso(s.t[0]), iso(s.t[n - 1]), JSON.stringify(f.declaration ?? { kind: 'full' }), f.previousOnBoardL ?? null, n, n - 1]
	);
	const id = rows[0].id as string;
	const nums = (a: Float64Array) => Array.from(a, (v) => (Number.isNaN(v) ? null : v));
	await client.query(
		`insert into samples (flight_id, seq, t, flow, gs, dtg, alt, wpt)
		 select $1, * from unnest($2::int[], $3::timestamptz[], $4::float8[], $5::float8[], $6::float8[], $7::float8[], $8::text[])`,
		[id, Array.from({ length: n }, (_, i) => i), Array.from(s.t, iso), nums(s.flow), nums(s.gs), nums(s.dtg), nums(s.alt), s.wpt]
	);
	return id;
}
