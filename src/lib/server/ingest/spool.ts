// The upload's body on its way in: counted against the size limit, hashed and kept in a spool
// file as it passes, so a slow or hostile client never holds a database connection; and the spool
// files themselves, temporary files with no name that go with the process whatever ends it.
import { createHash, randomUUID } from 'node:crypto';
import { open, unlink, type FileHandle } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_LABEL } from '$lib/csv';

/** Size of the pieces a spool is read back in (and the original file is kept in: upload_chunks rows). */
export const CHUNK_BYTES = 1 << 20;

export class UploadTooLargeError extends Error {
	constructor() {
		super(`The file is larger than the ${MAX_UPLOAD_LABEL} limit; nothing was stored. Split the recording, or leave out columns Burndown does not use.`);
	}
}

/** An append-only temporary file with no name. */
export class Spool {
	size = 0;
	private constructor(private readonly file: FileHandle) {}

	static async open(): Promise<Spool> {
		const path = join(tmpdir(), `burndown-upload-${randomUUID()}`);
		const file = await open(path, 'w+', 0o600);
		try {
			await unlink(path);
		} catch (error) {
			await file.close().catch(() => {});
			throw error;
		}
		return new Spool(file);
	}

	async append(bytes: Uint8Array): Promise<void> {
		await this.file.write(bytes, 0, bytes.length, this.size);
		this.size += bytes.length;
	}

	/** Everything appended, read back in order in pieces of at most `pieceBytes`. */
	async *pieces(pieceBytes = CHUNK_BYTES): AsyncGenerator<Buffer> {
		const size = this.size;
		for (let at = 0; at < size; at += pieceBytes) {
			// A fresh buffer per piece: whoever takes it (a COPY stream) may still hold the previous one.
			const piece = Buffer.allocUnsafe(Math.min(pieceBytes, size - at));
			const { bytesRead } = await this.file.read(piece, 0, piece.length, at);
			if (bytesRead !== piece.length) throw new Error('The spool file was shorter than what was written to it.');
			yield piece;
		}
	}

	async close(): Promise<void> {
		await this.file.close().catch(() => {});
	}
}

/** Runs `work` with two fresh spools (the body, the encoded samples) and closes both after it. */
export async function withSpools<T>(work: (body: Spool, copy: Spool) => Promise<T>): Promise<T> {
	const body = await Spool.open();
	let copy: Spool;
	try {
		copy = await Spool.open();
	} catch (error) {
		await body.close();
		throw error;
	}
	try {
		return await work(body, copy);
	} finally {
		await body.close();
		await copy.close();
	}
}

/** The body's bytes as they arrive: counted (UploadTooLargeError past the limit), hashed, spooled. */
export class ReceivedBody {
	bytes = 0;
	private readonly hash = createHash('sha256');

	constructor(
		private readonly source: AsyncIterable<Uint8Array>,
		private readonly spool: Spool,
		private readonly limitBytes = MAX_UPLOAD_BYTES
	) {}

	async *chunks(): AsyncGenerator<Uint8Array> {
		for await (const chunk of this.source) {
			this.bytes += chunk.length;
			if (this.bytes > this.limitBytes) throw new UploadTooLargeError();
			this.hash.update(chunk);
			await this.spool.append(chunk);
			yield chunk;
		}
	}

	/** The SHA-256 of the whole body, once it has been read. */
	sha256(): string {
		return this.hash.digest('hex');
	}
}
