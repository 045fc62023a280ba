// The replay payload: a flight's samples as columns plus everything the fuel engine needs (the
// aircraft's fuel setup, the declaration, the fuel events), so the browser runs the same engine
// the server does. Two encodings of the same content: JSON arrays, and a binary layout (Float64
// columns, positions as Int32 in units of 1e-7 degree).
// Pure code, used by the samples API (encode) and the replay and live pages (decode).
import type { AircraftFuelSetup } from '$lib/flight-inputs';
import { WPT_NONE, type Declaration, type FuelEventKind, type SampleColumns } from '$lib/fuel';
import type { FuelUnit } from '$lib/units';

/** 2: positions (hasPos, lat and lon columns). */
export const PAYLOAD_VERSION = 2;
/** First four bytes of the binary layout: "BDS1". */
export const BINARY_MAGIC = 0x31534442;
export const BINARY_CONTENT_TYPE = 'application/vnd.burndown.samples';

export interface PayloadEvent {
	id: string;
	/** Epoch seconds UTC. */
	t: number;
	kind: FuelEventKind;
	amountL: number | null;
	note: string;
}

/** Everything but the columns. */
export interface PayloadMeta {
	version: number;
	flight: {
		id: string;
		title: string;
		status: 'open' | 'closed';
		source: 'upload' | 'live';
		startedAt: string;
		endedAt: string | null;
		lastSeq: number;
		declarationConfirmed: boolean;
	};
	aircraft: { id: string; registration: string; type: string; displayUnit: FuelUnit; fuelType: string };
	setup: AircraftFuelSetup;
	declaration: Declaration;
	previousOnBoardL: number | null;
	events: PayloadEvent[];
	/** Waypoint names; the wpt column holds an index into this list (WPT_NONE for none). */
	waypoints: string[];
	count: number;
	hasAlt: boolean;
	hasWpt: boolean;
	/** Whether the samples carry positions (lat and lon columns, degrees WGS 84). */
	hasPos: boolean;
}

/** What a decoded payload gives the page: the engine's columns plus the recorder sequence. */
export interface ReplayData extends PayloadMeta {
	columns: SampleColumns;
	seq: Int32Array;
}

/** The JSON form: t as integer milliseconds after t0Ms (exact), null for "not recorded". */
export interface JsonPayload extends PayloadMeta {
	t0Ms: number;
	columns: {
		tMs: number[];
		seq: number[];
		flow: (number | null)[];
		gs: (number | null)[];
		dtg: (number | null)[];
		alt?: (number | null)[];
		wpt?: (number | null)[];
		lat?: (number | null)[];
		lon?: (number | null)[];
	};
}

const toJsonArray = (a: Float64Array): (number | null)[] => {
	const out = new Array<number | null>(a.length);
	for (let i = 0; i < a.length; i++) out[i] = Number.isNaN(a[i]) ? null : a[i];
	return out;
};
const fromJsonArray = (a: readonly (number | null)[]): Float64Array => {
	const out = new Float64Array(a.length);
	for (let i = 0; i < a.length; i++) out[i] = a[i] ?? NaN;
	return out;
};

export function encodeJson(data: ReplayData): JsonPayload {
	const { columns: c, seq, ...meta } = data;
	const n = data.count;
	// Times are stored to the millisecond, so integer ms offsets carry them exactly.
	const t0Ms = n > 0 ? Math.round(c.t[0] * 1000) : 0;
	const tMs = new Array<number>(n);
	for (let i = 0; i < n; i++) tMs[i] = Math.round(c.t[i] * 1000) - t0Ms;
	const columns: JsonPayload['columns'] = {
		tMs,
		seq: Array.from(seq),
		flow: toJsonArray(c.flow),
		gs: toJsonArray(c.gs),
		dtg: toJsonArray(c.dtg)
	};
	if (c.alt) columns.alt = toJsonArray(c.alt);
	if (c.wpt) columns.wpt = Array.from(c.wpt, (w) => (w === WPT_NONE ? null : w));
	if (meta.hasPos && c.lat && c.lon) {
		columns.lat = toJsonArray(c.lat);
		columns.lon = toJsonArray(c.lon);
	}
	return { ...meta, t0Ms, columns };
}

export function decodeJson(p: JsonPayload): ReplayData {
	const { t0Ms, columns: j, ...meta } = p;
	const n = j.tMs.length;
	const t = new Float64Array(n);
	// (t0 + offset) ms ÷ 1000 is the same double the server gets from Date.getTime() ÷ 1000.
	for (let i = 0; i < n; i++) t[i] = (t0Ms + j.tMs[i]) / 1000;
	const columns: SampleColumns = { t, flow: fromJsonArray(j.flow), gs: fromJsonArray(j.gs), dtg: fromJsonArray(j.dtg) };
	if (j.alt) columns.alt = fromJsonArray(j.alt);
	if (j.wpt) columns.wpt = Int32Array.from(j.wpt, (w) => (w === null ? WPT_NONE : w));
	if (j.lat && j.lon) {
		columns.lat = fromJsonArray(j.lat);
		columns.lon = fromJsonArray(j.lon);
	}
	return { ...meta, hasPos: Boolean(columns.lat), count: n, columns, seq: Int32Array.from(j.seq) };
}

/*
 * Binary layout, little-endian:
 *   u32 magic "BDS1" · u32 header length H · H bytes of header JSON (PayloadMeta), space-padded
 *   so the columns start on an 8-byte boundary · Float64 t (epoch s), flow, gs, dtg, [alt] ·
 *   Int32 seq, [wpt], [lat, lon]. NaN means "not recorded"; [..] columns are present when
 *   hasAlt / hasWpt / hasPos. Positions are Int32 in units of 1e-7 degree (POSITION_NONE for
 *   none): half the bytes of Float64, about 1 cm on the ground, and exact for any position given
 *   to 7 decimals or fewer (k ÷ 1e7 is the double nearest to the decimal, as parsing it gives).
 */

/** Units of a binary position: 1e-7 degree (a common scale for positions in binary records; common practice). */
export const POSITION_SCALE = 1e7;
/** A sample without a position in the binary layout (the smallest Int32, like WPT_NONE). */
export const POSITION_NONE = -2147483648;

const toPositionInt = (deg: number): number => (Number.isFinite(deg) ? Math.round(deg * POSITION_SCALE) : POSITION_NONE);
const fromPositionInt = (v: number): number => (v === POSITION_NONE ? NaN : v / POSITION_SCALE);
export function encodeBinary(data: ReplayData): Uint8Array<ArrayBuffer> {
	const { columns: c, seq, ...meta } = data;
	const n = data.count;
	let header: Uint8Array = new TextEncoder().encode(JSON.stringify(meta));
	const padded = Math.ceil((8 + header.length) / 8) * 8 - 8;
	if (padded !== header.length) {
		const h = new Uint8Array(padded).fill(0x20);
		h.set(header);
		header = h;
	}
	const floats = [c.t, c.flow, c.gs, c.dtg, ...(meta.hasAlt && c.alt ? [c.alt] : [])];
	const ints: ArrayLike<number>[] = [seq, ...(meta.hasWpt && c.wpt ? [c.wpt] : [])];
	if (meta.hasPos) {
		if (!c.lat || !c.lon) throw new PayloadError('hasPos is set but the lat and lon columns are missing.');
		ints.push(Array.from(c.lat.subarray(0, n), toPositionInt), Array.from(c.lon.subarray(0, n), toPositionInt));
	}
	const size = 8 + header.length + floats.length * n * 8 + ints.length * n * 4;
	const buf = new ArrayBuffer(size);
	const view = new DataView(buf);
	view.setUint32(0, BINARY_MAGIC, true);
	view.setUint32(4, header.length, true);
	const bytes = new Uint8Array(buf);
	bytes.set(header, 8);
	let at = 8 + header.length;
	const littleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
	for (const col of floats) {
		if (littleEndian) new Float64Array(buf, at, n).set(col.subarray(0, n));
		else for (let i = 0; i < n; i++) view.setFloat64(at + i * 8, col[i], true);
		at += n * 8;
	}
	for (const col of ints) {
		for (let i = 0; i < n; i++) view.setInt32(at + i * 4, col[i], true);
		at += n * 4;
	}
	return bytes;
}

export class PayloadError extends Error {}

export function decodeBinary(input: ArrayBuffer | Uint8Array): ReplayData {
	const bytes = input instanceof Uint8Array ? input : new Uint8Array(input);
	if (bytes.length < 8) throw new PayloadError('Replay data is too short.');
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	if (view.getUint32(0, true) !== BINARY_MAGIC) throw new PayloadError('Replay data has an unknown format.');
	const headerLength = view.getUint32(4, true);
	if (8 + headerLength > bytes.length) throw new PayloadError('Replay data header is cut short.');
	const meta = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + headerLength))) as PayloadMeta;
	if (meta.version !== PAYLOAD_VERSION) throw new PayloadError(`Replay data version ${meta.version} is not supported.`);
	const n = meta.count;
	const floatCount = meta.hasAlt ? 5 : 4;
	const intCount = 1 + (meta.hasWpt ? 1 : 0) + (meta.hasPos ? 2 : 0);
	if (bytes.length !== 8 + headerLength + n * (floatCount * 8 + intCount * 4))
		throw new PayloadError('Replay data length does not match its header.');
	let at = 8 + headerLength;
	const f64 = (): Float64Array => {
		const a = new Float64Array(n);
		for (let i = 0; i < n; i++) a[i] = view.getFloat64(at + i * 8, true);
		at += n * 8;
		return a;
	};
	const i32 = (): Int32Array => {
		const a = new Int32Array(n);
		for (let i = 0; i < n; i++) a[i] = view.getInt32(at + i * 4, true);
		at += n * 4;
		return a;
	};
	const columns: SampleColumns = { t: f64(), flow: f64(), gs: f64(), dtg: f64() };
	if (meta.hasAlt) columns.alt = f64();
	const seq = i32();
	if (meta.hasWpt) columns.wpt = i32();
	if (meta.hasPos) {
		columns.lat = Float64Array.from(i32(), fromPositionInt);
		columns.lon = Float64Array.from(i32(), fromPositionInt);
	}
	return { ...meta, columns, seq };
}
