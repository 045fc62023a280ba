// PostgreSQL's binary COPY format, written straight into reusable buffers: samples as the
// database stores them (no number-to-text-and-back), and file pieces as raw bytea. Layout per
// the PostgreSQL manual, "COPY — Binary Format": signature, flags, header extension, tuples of
// (int16 field count, then int32 length + bytes per field, -1 for NULL), int16 -1 trailer.
import type { Writable } from 'node:stream';
import type { RecorderRow } from '$lib/csv';

const SIGNATURE = Buffer.from([0x50, 0x47, 0x43, 0x4f, 0x50, 0x59, 0x0a, 0xff, 0x0d, 0x0a, 0x00]);
/** Microseconds from the Unix epoch to PostgreSQL's, 2000-01-01 00:00 UTC. */
const PG_EPOCH_US = 946_684_800_000_000;
const TWO_32 = 4_294_967_296;

/** The header every binary COPY stream starts with. */
export function copyHeader(): Buffer {
	const b = Buffer.alloc(SIGNATURE.length + 8);
	SIGNATURE.copy(b, 0);
	// Flags (no OIDs) and header extension length, both 0.
	return b;
}

/** The trailer that ends a binary COPY stream. */
export function copyTrailer(): Buffer {
	const b = Buffer.alloc(2);
	b.writeInt16BE(-1, 0);
	return b;
}

/** Writes to a stream, waiting for it to drain when its buffer is full. */
export function writeWithBackpressure(stream: Writable, chunk: Buffer): Promise<void> | void {
	if (stream.write(chunk)) return;
	return new Promise((resolve, reject) => {
		const done = (error?: Error) => {
			stream.off('drain', onDrain);
			stream.off('error', done);
			stream.off('close', onClose);
			if (error) reject(error);
			else resolve();
		};
		const onDrain = () => done();
		const onClose = () => done(new Error('The database stream closed while writing.'));
		stream.on('drain', onDrain);
		stream.on('error', done);
		stream.on('close', onClose);
	});
}

/** Largest tuple of the sample layout: 10 fields, a waypoint of at most 40 UTF-16 units (≤ 120 bytes). */
const MAX_ROW_BYTES = 2 + 10 * 4 + 16 + 8 * 8 + 200;

/** The column list SampleCopyEncoder's tuples fill, in order. */
export const SAMPLE_COPY_COLUMNS = 'flight_id, seq, t, flow, gs, dtg, wpt, lat, lon, alt';

/**
 * Encodes sample rows of one flight for SAMPLE_COPY_COLUMNS:
 * (flight_id uuid, seq int4, t timestamptz, flow, gs, dtg float8, wpt text, lat, lon, alt float8).
 */
export class SampleCopyEncoder {
	private buf: Buffer;
	private pos = 0;
	private flightId: Buffer;

	constructor(flightId: string, private size = 1 << 18) {
		this.buf = Buffer.allocUnsafe(size);
		this.flightId = Buffer.from(flightId.replace(/-/g, ''), 'hex');
	}

	/** Room for another row? When false, take() the buffer first. */
	hasRoom(): boolean {
		return this.pos + MAX_ROW_BYTES <= this.size;
	}

	private f8(v: number | null): void {
		const b = this.buf;
		if (v === null) {
			b.writeInt32BE(-1, this.pos);
			this.pos += 4;
		} else {
			b.writeInt32BE(8, this.pos);
			b.writeDoubleBE(v, this.pos + 4);
			this.pos += 12;
		}
	}

	push(row: RecorderRow, seq: number): void {
		const b = this.buf;
		let p = this.pos;
		b.writeInt16BE(10, p);
		b.writeInt32BE(16, p + 2);
		this.flightId.copy(b, p + 6);
		p += 20;
		b.writeInt32BE(4, p + 2);
		b.writeInt32BE(seq, p + 6);
		// timestamptz: int8 microseconds since 2000-01-01; split in two halves because the value
		// (below 2^53 for any time before 2255) is exact in a double but not in an int32.
		const us = row.tMs * 1000 - PG_EPOCH_US;
		const hi = Math.floor(us / TWO_32);
		b.writeInt32BE(8, p + 10);
		b.writeInt32BE(hi, p + 14);
		b.writeUInt32BE(us - hi * TWO_32, p + 18);
		this.pos = p + 22;
		this.f8(row.flow);
		this.f8(row.gs);
		this.f8(row.dtg);
		if (row.wpt === null) {
			b.writeInt32BE(-1, this.pos);
			this.pos += 4;
		} else {
			p = this.pos;
			const n = b.write(row.wpt, p + 4, 'utf8');
			b.writeInt32BE(n, p);
			this.pos = p + 4 + n;
		}
		this.f8(row.lat);
		this.f8(row.lon);
		this.f8(row.alt);
	}

	/** The bytes encoded since the last take(), as a fresh Buffer the stream may keep. */
	take(): Buffer | null {
		if (this.pos === 0) return null;
		const out = Buffer.from(this.buf.subarray(0, this.pos));
		this.pos = 0;
		return out;
	}
}

/** One upload_chunks tuple (upload_id uuid, n int4, bytes bytea). */
export function chunkTuple(uploadId: string, n: number, bytes: Uint8Array): Buffer[] {
	const head = Buffer.alloc(2 + 4 + 16 + 4 + 4 + 4);
	head.writeInt16BE(3, 0);
	head.writeInt32BE(16, 2);
	Buffer.from(uploadId.replace(/-/g, ''), 'hex').copy(head, 6);
	head.writeInt32BE(4, 22);
	head.writeInt32BE(n, 26);
	head.writeInt32BE(bytes.length, 30);
	return [head, Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length)];
}
