// The one way stored or received sample rows become the engine's columns: the replay loader,
// the upload's summary, the server's live computation and the live page all push their rows
// through a ColumnBuilder, so "live equals replay equals the stored summary" holds by
// construction rather than by copies that agree.
import { WPT_NONE, type SampleColumns } from './types';

const num = (v: number | null | undefined): number => (v === null || v === undefined ? NaN : v);

function grown<A extends Float64Array | Int32Array>(a: A, n: number, cap: number): A {
	const b = new (a.constructor as new (size: number) => A)(cap);
	b.set(a.subarray(0, n));
	return b;
}

/**
 * Columns grown as rows arrive. Times become epoch seconds as tMs ÷ 1000 (the same double on the
 * server and in the browser); a null cell becomes NaN; waypoint names become small integer ids in
 * order of first appearance, numbered in `waypointIds` (pass one map to continue the numbering
 * across several builders, as the live paths do run after run).
 */
export class ColumnBuilder {
	private n = 0;
	private cap: number;
	private t: Float64Array;
	private flow: Float64Array;
	private gs: Float64Array;
	private dtg: Float64Array;
	private alt: Float64Array;
	private wpt: Int32Array;
	private lat: Float64Array;
	private lon: Float64Array;
	private seqs: Int32Array;
	private anyAlt = false;
	private anyWpt = false;
	private anyPos = false;
	readonly waypointIds: Map<string, number>;

	constructor(capacity = 1024, waypointIds: Map<string, number> = new Map()) {
		this.cap = Math.max(1, Math.floor(capacity));
		this.t = new Float64Array(this.cap);
		this.flow = new Float64Array(this.cap);
		this.gs = new Float64Array(this.cap);
		this.dtg = new Float64Array(this.cap);
		this.alt = new Float64Array(this.cap);
		this.wpt = new Int32Array(this.cap);
		this.lat = new Float64Array(this.cap);
		this.lon = new Float64Array(this.cap);
		this.seqs = new Int32Array(this.cap);
		this.waypointIds = waypointIds;
	}

	get length(): number {
		return this.n;
	}

	/** Whether any row so far had an altitude / a waypoint / a position. */
	get hasAlt(): boolean {
		return this.anyAlt;
	}
	get hasWpt(): boolean {
		return this.anyWpt;
	}
	get hasPos(): boolean {
		return this.anyPos;
	}

	/**
	 * One row, as separate values (no object per row on the hot paths): epoch milliseconds, null
	 * (or '' for a waypoint) for "not recorded". A position counts only with both coordinates.
	 */
	push(seq: number, tMs: number, flow: number | null, gs: number | null, dtg: number | null, alt: number | null, wpt: string | null, lat: number | null = null, lon: number | null = null): void {
		if (this.n === this.cap) this.grow();
		const i = this.n++;
		this.seqs[i] = seq;
		this.t[i] = tMs / 1000;
		this.flow[i] = num(flow);
		this.gs[i] = num(gs);
		this.dtg[i] = num(dtg);
		this.alt[i] = num(alt);
		if (alt !== null && alt !== undefined) this.anyAlt = true;
		this.position(i, num(lat), num(lon));
		if (wpt === null || wpt === undefined || wpt === '') this.wpt[i] = WPT_NONE;
		else {
			this.anyWpt = true;
			let id = this.waypointIds.get(wpt);
			if (id === undefined) {
				id = this.waypointIds.size;
				this.waypointIds.set(wpt, id);
			}
			this.wpt[i] = id;
		}
	}

	/**
	 * Many rows at once, as columns (the replay loader reads them so, without an object per row):
	 * NaN where a cell was not recorded; `altRecorded` whether any of these rows had an altitude;
	 * waypoints as indices into `names` (WPT_NONE for none), numbered here in the order they come;
	 * positions (NaN where none) count, as in push, only with both coordinates.
	 */
	pushBlock(b: {
		seq: ArrayLike<number>;
		tMs: ArrayLike<number>;
		flow: ArrayLike<number>;
		gs: ArrayLike<number>;
		dtg: ArrayLike<number>;
		alt: ArrayLike<number>;
		altRecorded: boolean;
		wpt: ArrayLike<number>;
		names: readonly string[];
		lat?: ArrayLike<number>;
		lon?: ArrayLike<number>;
	}): void {
		const m = b.seq.length;
		while (this.cap - this.n < m) this.grow();
		const ids = b.names.map((name) => {
			let id = this.waypointIds.get(name);
			if (id === undefined) {
				id = this.waypointIds.size;
				this.waypointIds.set(name, id);
			}
			return id;
		});
		const at = this.n;
		for (let j = 0; j < m; j++) {
			const i = at + j;
			this.seqs[i] = b.seq[j];
			this.t[i] = b.tMs[j] / 1000;
			this.flow[i] = b.flow[j];
			this.gs[i] = b.gs[j];
			this.dtg[i] = b.dtg[j];
			this.alt[i] = b.alt[j];
			const w = b.wpt[j];
			if (w === WPT_NONE) this.wpt[i] = WPT_NONE;
			else {
				this.anyWpt = true;
				this.wpt[i] = ids[w];
			}
			this.position(i, b.lat ? b.lat[j] : NaN, b.lon ? b.lon[j] : NaN);
		}
		if (b.altRecorded) this.anyAlt = true;
		this.n += m;
	}

	/** A position counts only with both coordinates; otherwise neither is kept. */
	private position(i: number, la: number, lo: number): void {
		if (Number.isFinite(la) && Number.isFinite(lo)) {
			this.lat[i] = la;
			this.lon[i] = lo;
			this.anyPos = true;
		} else {
			this.lat[i] = NaN;
			this.lon[i] = NaN;
		}
	}

	private grow(): void {
		const cap = Math.max(1024, this.cap * 2);
		const n = this.n;
		this.t = grown(this.t, n, cap);
		this.flow = grown(this.flow, n, cap);
		this.gs = grown(this.gs, n, cap);
		this.dtg = grown(this.dtg, n, cap);
		this.alt = grown(this.alt, n, cap);
		this.wpt = grown(this.wpt, n, cap);
		this.lat = grown(this.lat, n, cap);
		this.lon = grown(this.lon, n, cap);
		this.seqs = grown(this.seqs, n, cap);
		this.cap = cap;
	}

	/**
	 * The rows so far as engine columns (views, no copy): altitude, waypoints and positions only
	 * when some row had one, so a flight without them reads the same however its rows arrived.
	 */
	columns(): SampleColumns {
		const n = this.n;
		const cols: SampleColumns = { t: this.t.subarray(0, n), flow: this.flow.subarray(0, n), gs: this.gs.subarray(0, n), dtg: this.dtg.subarray(0, n) };
		if (this.anyAlt) cols.alt = this.alt.subarray(0, n);
		if (this.anyWpt) cols.wpt = this.wpt.subarray(0, n);
		if (this.anyPos) {
			cols.lat = this.lat.subarray(0, n);
			cols.lon = this.lon.subarray(0, n);
		}
		return cols;
	}

	/** The rows' sequence numbers. */
	seq(): Int32Array {
		return this.seqs.subarray(0, this.n);
	}

	/** Waypoint names by id (the ids of every builder sharing the map). */
	waypoints(): string[] {
		return [...this.waypointIds.keys()];
	}
}

