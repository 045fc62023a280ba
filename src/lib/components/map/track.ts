// The track on the map, worked out from the sample columns without any map library: the pieces
// flown and the gaps (no samples, or samples without a position) to draw apart, the position at
// the scrubber, the sample nearest a point (a click on the track), the waypoints as passed, a
// round length for the scale bar.
import { findPassages, type DataGap, type SampleColumns } from '$lib/fuel';

/** Indices of positioned samples: a flown piece runs from..to; a gap piece joins from (the last fix before) to to (the first after). */
export interface TrackPiece {
	kind: 'flown' | 'gap';
	from: number;
	to: number;
}

type Positions = Pick<SampleColumns, 'lat' | 'lon'>;

const fix = (c: Positions, i: number): boolean => Number.isFinite(c.lat![i]) && Number.isFinite(c.lon![i]);

/** How many of the first n samples have a position. */
export function positionCount(c: Positions, n: number): number {
	if (!c.lat || !c.lon) return 0;
	let k = 0;
	for (let i = 0; i < n; i++) if (fix(c, i)) k++;
	return k;
}

/** Whether any of the first n samples has a position. */
export function hasPositions(c: Positions, n: number): boolean {
	if (!c.lat || !c.lon) return false;
	for (let i = 0; i < n; i++) if (fix(c, i)) return true;
	return false;
}

/**
 * The track split where nothing is known of the path: across a time gap (the engine's 'time'
 * gaps: a dropout, or a stop with the recorder off) and across samples without a position. Flow
 * gaps keep their positions and stay flown. Consecutive pieces share their end sample.
 */
export function trackPieces(c: Positions, n: number, gaps: readonly Pick<DataGap, 'kind' | 'endIndex'>[] = []): TrackPiece[] {
	if (!c.lat || !c.lon) return [];
	const afterGap = new Uint8Array(n);
	for (const g of gaps) if (g.kind === 'time' && g.endIndex >= 0 && g.endIndex < n) afterGap[g.endIndex] = 1;
	const pieces: TrackPiece[] = [];
	let prev = -1;
	for (let i = 0; i < n; i++) {
		if (!fix(c, i)) continue;
		if (prev >= 0) {
			const kind = i > prev + 1 || afterGap[i] ? 'gap' : 'flown';
			const last = pieces[pieces.length - 1];
			if (last && last.kind === kind && kind === 'flown') last.to = i;
			else pieces.push({ kind, from: prev, to: i });
		}
		prev = i;
	}
	// A single fix is still a place the aircraft was.
	if (pieces.length === 0 && prev >= 0) pieces.push({ kind: 'flown', from: prev, to: prev });
	return pieces;
}

export interface TrackPosition {
	/** The sample the position is from: the one asked for, or the last one before it with a position. */
	index: number;
	lat: number;
	lon: number;
}

/** The position at sample `index`, or the last known before it; null before the first fix. */
export function positionAt(c: Positions, index: number): TrackPosition | null {
	if (!c.lat || !c.lon) return null;
	for (let i = Math.min(index, c.lat.length - 1); i >= 0; i--) if (fix(c, i)) return { index: i, lat: c.lat[i], lon: c.lon[i] };
	return null;
}

/** Mean Earth radius 6,371,008.8 m (IUGG; from memory) in NM of exactly 1852 m (BIPM SI Brochure). */
const EARTH_RADIUS_NM = 6_371_008.8 / 1852;
const RAD = Math.PI / 180;

/**
 * A local flat projection about a reference point: x east and y north of it, in NM, a degree of
 * longitude scaled by the cosine of the mean latitude of the two points, longitudes taken the
 * short way round (across the antimeridian too). Within a few dozen NM it is within 0.1 % of the
 * great circle, so the sample nearest a click is the nearest on the ground, which is what it is
 * for; the map itself draws in the map library's projection.
 */
export function localProjection(ref: { lat: number; lon: number }): (lat: number, lon: number) => [number, number] {
	const k = EARTH_RADIUS_NM * RAD;
	return (lat, lon) => {
		let d = lon - ref.lon;
		if (d > 180) d -= 360;
		else if (d < -180) d += 360;
		return [d * k * Math.cos(((lat + ref.lat) / 2) * RAD), (lat - ref.lat) * k];
	};
}

/** The positioned sample nearest to a point (-1 when none has a position). */
export function nearestSample(c: Positions, n: number, p: { lat: number; lon: number }): number {
	if (!c.lat || !c.lon) return -1;
	const project = localProjection(p);
	let best = -1;
	let bestD = Infinity;
	for (let i = 0; i < n; i++) {
		if (!fix(c, i)) continue;
		const [x, y] = project(c.lat[i], c.lon[i]);
		const d = x * x + y * y;
		if (d < bestD) {
			bestD = d;
			best = i;
		}
	}
	return best;
}

/** The largest 1, 2 or 5 × 10^k not above `max` (a scale bar's length); 0 for a non-positive max. */
export function roundScaleLength(max: number): number {
	if (!(max > 0) || !Number.isFinite(max)) return 0;
	const p = 10 ** Math.floor(Math.log10(max));
	for (const m of [5, 2, 1]) if (m * p <= max * (1 + 1e-12)) return m * p;
	return p;
}

export interface TrackWaypoint {
	name: string;
	/** The sample of the passage and the position there (or the last known before). */
	index: number;
	lat: number;
	lon: number;
	/** Its number in the plan's route (1 = the first leg's end), when a plan was given. */
	planned: number | null;
}

/**
 * The waypoints on the track, placed where the recorder says each was passed (its distance to go
 * at the least, $lib/fuel/passage). With a plan's route, its waypoints in order — the ones passed
 * placed, the others listed as not reached; without one, every waypoint the recorder reported.
 * In flight, the waypoint being flown to is not passed yet.
 */
export function trackWaypoints(
	c: Pick<SampleColumns, 't' | 'dtg' | 'wpt' | 'lat' | 'lon'>,
	n: number,
	names: readonly string[],
	o: { route?: readonly string[] | null; inFlight?: boolean } = {}
): { passed: TrackWaypoint[]; notReached: string[] } {
	let passages = findPassages({ t: c.t.subarray(0, n), dtg: c.dtg.subarray(0, n), wpt: c.wpt?.subarray(0, n) }, names);
	// Still flying towards the last one: its least distance so far is where the aircraft is now.
	if (o.inFlight && passages.length > 0 && passages[passages.length - 1].runEnd === n - 1) passages = passages.slice(0, -1);
	const placed = passages.map((p) => ({ p, at: positionAt(c, p.index) })).filter((x) => x.at !== null);
	if (!o.route || o.route.length === 0) {
		return { passed: placed.map(({ p, at }) => ({ name: p.wpt, index: at!.index, lat: at!.lat, lon: at!.lon, planned: null })), notReached: [] };
	}
	const passed: TrackWaypoint[] = [];
	const notReached: string[] = [];
	let from = 0;
	o.route.forEach((name, k) => {
		const j = placed.findIndex((x, i) => i >= from && x.p.wpt.toUpperCase() === name.toUpperCase());
		if (j < 0) {
			notReached.push(name);
			return;
		}
		const { p, at } = placed[j];
		passed.push({ name: p.wpt, index: at!.index, lat: at!.lat, lon: at!.lon, planned: k + 1 });
		from = j + 1;
	});
	return { passed, notReached };
}
