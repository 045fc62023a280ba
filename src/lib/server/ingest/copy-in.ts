// Spooled bytes into the database by binary COPY on the upload's own connection: the encoded
// samples as they are, the original file as upload_chunks rows. A COPY that fails part-way is
// abandoned (the server answers CopyFail with an error) before the caller rolls back.
import { finished } from 'node:stream/promises';
import { from as copyFrom } from 'pg-copy-streams';
import type pg from 'pg';
import { SAMPLE_COPY_COLUMNS, chunkTuple, copyHeader, copyTrailer, writeWithBackpressure } from './binary-copy';
import type { Spool } from './spool';

async function copyIn(client: pg.PoolClient, statement: string, parts: AsyncIterable<Buffer>): Promise<void> {
	const stream = client.query(copyFrom(statement));
	const failure: { error: Error | null } = { error: null };
	stream.on('error', (e: Error) => (failure.error = e));
	let done = false;
	try {
		await writeWithBackpressure(stream, copyHeader());
		for await (const part of parts) {
			if (failure.error) throw failure.error;
			await writeWithBackpressure(stream, part);
		}
		await writeWithBackpressure(stream, copyTrailer());
		stream.end();
		await finished(stream);
		done = true;
	} finally {
		if (!done && !stream.closed)
			await new Promise<void>((resolve) => {
				stream.once('close', () => resolve());
				stream.once('error', () => resolve());
				stream.destroy(failure.error ?? new Error('The upload was abandoned.'));
			});
	}
	if (failure.error) throw failure.error;
}

/** The samples the encoder spooled, into the samples table. */
export async function copySamplesIn(client: pg.PoolClient, spool: Spool): Promise<void> {
	await copyIn(client, `COPY samples (${SAMPLE_COPY_COLUMNS}) FROM STDIN (FORMAT binary)`, spool.pieces());
}

/** The original bytes, read back from the body's spool into upload_chunks. */
export async function copyOriginalIn(client: pg.PoolClient, uploadId: string, spool: Spool): Promise<void> {
	async function* tuples(): AsyncGenerator<Buffer> {
		let n = 0;
		for await (const piece of spool.pieces()) yield* chunkTuple(uploadId, n++, piece);
	}
	await copyIn(client, 'COPY upload_chunks (upload_id, n, bytes) FROM STDIN (FORMAT binary)', tuples());
}
