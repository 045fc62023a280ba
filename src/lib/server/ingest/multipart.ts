// The upload's multipart/form-data body (RFC 7578) read with busboy: text fields come back as
// strings, the file part as a stream of byte chunks, so a 100 MB upload never sits in memory whole
// (Request.formData() would buffer the entire body first). This wrapper turns busboy's events into
// parts in order and its errors into MultipartError messages a person can act on.
import busboy from 'busboy';
import type { Readable } from 'node:stream';

export class MultipartError extends Error {
	/** The form field the error is about, when there is one. */
	constructor(
		message: string,
		readonly field: string | null = null
	) {
		super(message);
	}
}

export interface MultipartField {
	kind: 'field';
	name: string;
	value: string;
}

export interface MultipartFile {
	kind: 'file';
	name: string;
	filename: string | null;
	contentType: string | null;
	/** The part's bytes; read it to the end before asking for the next part (a part left unread is skipped). */
	body: AsyncIterable<Buffer>;
}

export type MultipartPart = MultipartField | MultipartFile;

/** The largest text field, unless the caller says otherwise. */
export const FIELD_LIMIT_BYTES = 256 * 1024;

/** The boundary from a Content-Type header, or null when it is not multipart/form-data. */
export function multipartBoundary(contentType: string | null): string | null {
	if (!contentType || !/^multipart\/form-data\b/i.test(contentType)) return null;
	const m = /;\s*boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
	const b = m ? (m[1] ?? m[2]) : null;
	return b && b.length <= 70 ? b : null;
}

/** Errors a stream reports when it was torn down by something else, which is then the real cause. */
function isStreamNoise(error: unknown): boolean {
	const code = (error as NodeJS.ErrnoException | null)?.code;
	return code === 'ERR_STREAM_PREMATURE_CLOSE' || code === 'ERR_STREAM_DESTROYED' || code === 'ABORT_ERR';
}

type Event =
	| { kind: 'field'; name: string | undefined; value: string; truncated: boolean }
	| { kind: 'file'; name: string | undefined; stream: Readable; filename: string | undefined; mimeType: string }
	| { kind: 'end' }
	| { kind: 'error'; error: unknown };

/**
 * The parts of a multipart body in order. Text fields over `fieldLimit` bytes are refused. The body
 * is read only as fast as the parts are consumed: while a file part's stream is not read, busboy
 * holds back its write callback, so this stops pulling from `source`.
 */
export async function* readMultipart(
	source: AsyncIterable<Uint8Array>,
	boundary: string,
	fieldLimit = FIELD_LIMIT_BYTES,
	signal?: AbortSignal
): AsyncGenerator<MultipartPart> {
	let bb: busboy.Busboy;
	try {
		bb = busboy({
			headers: { 'content-type': `multipart/form-data; boundary="${boundary.replace(/["\\]/g, '\\$&')}"` },
			// One byte over the limit tells a field at the limit from a longer one (busboy flags truncation on reaching it).
			limits: { fieldSize: fieldLimit + 1 },
			// Browsers and undici write file names as raw UTF-8, not latin1.
			defParamCharset: 'utf8'
		});
	} catch (error) {
		throw new MultipartError(`The form data’s boundary is not usable (${(error as Error).message}).`);
	}

	const queue: Event[] = [];
	let wake: (() => void) | null = null;
	const push = (e: Event) => {
		queue.push(e);
		wake?.();
		wake = null;
	};
	let partsSeen = 0;
	let openFile: Readable | null = null;

	/** busboy's words for what went wrong, in ours. */
	const explain = (error: unknown): unknown => {
		if (!(error instanceof Error) || error instanceof MultipartError) return error;
		switch (error.message) {
			case 'Unexpected end of form':
			case 'Unexpected end of file':
				if (openFile) return new MultipartError('The form data ends inside a part (the upload was cut off).');
				return new MultipartError(partsSeen === 0 ? 'The form data has no parts.' : 'The form data ends early (the upload was cut off).');
			case 'Malformed part header':
				return new MultipartError('A form part’s headers are malformed or too long.');
			default:
				// Anything else (the connection reset, say) is not the form's fault: pass it on as it is.
				return error;
		}
	};

	bb.on('field', (name, value, info) => {
		partsSeen++;
		push({ kind: 'field', name, value, truncated: info.valueTruncated });
	});
	// The first error of the form as a whole, for a file stream that busboy destroyed with a less
	// telling one, or before anyone read it.
	let formError: unknown = null;
	const fileErrors = new WeakMap<Readable, unknown>();
	bb.on('file', (name, stream, info) => {
		partsSeen++;
		openFile = stream;
		stream.once('end', () => {
			if (openFile === stream) openFile = null;
		});
		// busboy destroys a file stream with an error when the body ends inside it, which may be
		// before (or without) anyone reading it: an 'error' event nobody listens to ends the process.
		stream.on('error', (error) => fileErrors.set(stream, error));
		push({ kind: 'file', name, stream, filename: info.filename, mimeType: info.mimeType });
	});
	// Listeners stay for the whole body: an error after the caller stopped listening must not crash.
	bb.on('error', (error) => {
		const explained = explain(error);
		formError ??= explained;
		push({ kind: 'error', error: explained });
	});
	bb.on('finish', () => push({ kind: 'end' }));

	let stopped = false;
	const stop = () => {
		if (stopped) return;
		stopped = true;
		bb.destroy();
	};
	// The caller gave up on the body (a refused upload): stop reading it; nothing is reported.
	if (signal) {
		if (signal.aborted) stop();
		else signal.addEventListener('abort', stop, { once: true });
	}

	// Feeds the body to busboy, waiting whenever it says its buffer is full.
	const pump = async () => {
		try {
			for await (const chunk of source) {
				if (stopped || bb.destroyed) return;
				if (!bb.write(chunk))
					await new Promise<void>((resolve) => {
						const done = () => {
							bb.off('drain', done);
							bb.off('close', done);
							resolve();
						};
						bb.on('drain', done);
						bb.on('close', done);
					});
				if (stopped || bb.destroyed) return;
			}
			bb.end();
		} catch (error) {
			// The body itself failed: the open file stream (or the next part asked for) gets the error.
			if (!bb.destroyed) bb.destroy(error as Error);
			else push({ kind: 'error', error });
		}
	};
	void pump();

	let handedOutFile = false;
	try {
		for (;;) {
			while (queue.length === 0) await new Promise<void>((r) => (wake = r));
			const e = queue.shift()!;
			if (e.kind === 'end') return;
			if (e.kind === 'error') throw e.error;
			if (e.name === undefined || e.name === '') throw new MultipartError('A form part has no name.');
			if (e.kind === 'field') {
				if (e.truncated) throw new MultipartError(`The form field "${e.name}" is larger than ${fieldLimit >= 1024 ? `${Math.round(fieldLimit / 1024)} KB` : `${fieldLimit} bytes`}.`, e.name);
				yield { kind: 'field', name: e.name, value: e.value };
				continue;
			}
			let started = false;
			const stream = e.stream;
			const body: AsyncIterable<Buffer> = {
				async *[Symbol.asyncIterator]() {
					started = true;
					let ended = false;
					try {
						if (fileErrors.has(stream)) throw fileErrors.get(stream);
						for await (const chunk of stream) yield chunk as Buffer;
						if (fileErrors.has(stream)) throw fileErrors.get(stream);
						ended = true;
					} catch (error) {
						// busboy may hand the file stream a generic error ("premature close") when the
						// form failed: the form's own error says more.
						throw formError && !(error instanceof MultipartError) && isStreamNoise(error) ? formError : explain(error);
					} finally {
						// A reader that gives up half way: stop reading the request body too.
						if (!ended) stop();
					}
				}
			};
			handedOutFile = true;
			yield { kind: 'file', name: e.name, filename: e.filename ?? null, contentType: e.mimeType || null, body };
			handedOutFile = false;
			if (!started) stream.resume();
		}
	} finally {
		// Stopping early is fine unless a file part is still out there being read.
		if (!handedOutFile) stop();
	}
}
