// A streaming multipart/form-data reader (RFC 7578): text fields come back as strings, the file
// part as a stream of byte chunks, so a 100 MB upload never sits in memory whole. Request.formData()
// would buffer the entire body first.

export class MultipartError extends Error {}

export interface MultipartPart {
	name: string;
	/** Set for file parts. */
	filename: string | null;
	contentType: string | null;
	/** The part's bytes; read it to the end (or call skip) before asking for the next part. */
	body: AsyncIterable<Buffer>;
}

/** The boundary from a Content-Type header, or null when it is not multipart/form-data. */
export function multipartBoundary(contentType: string | null): string | null {
	if (!contentType || !/^multipart\/form-data\b/i.test(contentType)) return null;
	const m = /;\s*boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
	const b = m ? (m[1] ?? m[2]) : null;
	return b && b.length <= 70 ? b : null;
}

const CRLF = Buffer.from('\r\n');
const HEADER_END = Buffer.from('\r\n\r\n');
const MAX_HEADER_BYTES = 16 * 1024;

function parseHeaders(text: string): { name: string; filename: string | null; contentType: string | null } {
	let name: string | null = null;
	let filename: string | null = null;
	let contentType: string | null = null;
	for (const line of text.split('\r\n')) {
		const colon = line.indexOf(':');
		if (colon < 0) continue;
		const key = line.slice(0, colon).trim().toLowerCase();
		const value = line.slice(colon + 1).trim();
		if (key === 'content-disposition') {
			const n = /(?:^|;)\s*name="((?:[^"\\]|\\.)*)"/i.exec(value) ?? /(?:^|;)\s*name=([^;\s]+)/i.exec(value);
			if (n) name = n[1];
			const f = /(?:^|;)\s*filename="((?:[^"\\]|\\.)*)"/i.exec(value) ?? /(?:^|;)\s*filename=([^;\s]+)/i.exec(value);
			if (f) filename = f[1].replace(/\\(.)/g, '$1');
		} else if (key === 'content-type') contentType = value;
	}
	if (name === null) throw new MultipartError('A form part has no name.');
	return { name, filename, contentType };
}

/**
 * The parts of a multipart body in order. Each part's body must be consumed before the iterator
 * moves on; a part left unread is skipped.
 */
export async function* readMultipart(source: AsyncIterable<Uint8Array>, boundary: string): AsyncGenerator<MultipartPart> {
	const it = source[Symbol.asyncIterator]();
	// The first boundary has no line break before it; pretend it does so every delimiter looks alike.
	let buf: Buffer = Buffer.from(CRLF);
	const delimiter = Buffer.from(`\r\n--${boundary}`);
	let ended = false;

	const more = async (): Promise<boolean> => {
		if (ended) return false;
		const next = await it.next();
		if (next.done) {
			ended = true;
			return false;
		}
		const chunk = Buffer.from(next.value.buffer, next.value.byteOffset, next.value.byteLength);
		buf = buf.length === 0 ? chunk : Buffer.concat([buf, chunk]);
		return true;
	};

	// Skip the preamble up to the first delimiter.
	for (;;) {
		const at = buf.indexOf(delimiter);
		if (at >= 0) {
			buf = buf.subarray(at + delimiter.length);
			break;
		}
		if (buf.length > delimiter.length) buf = buf.subarray(buf.length - delimiter.length);
		if (!(await more())) throw new MultipartError('The form data has no parts.');
	}

	for (;;) {
		// After a delimiter: "--" ends the body, a line break starts a part.
		while (buf.length < 2) if (!(await more())) throw new MultipartError('The form data ends early.');
		if (buf[0] === 0x2d && buf[1] === 0x2d) return;
		let headerEnd: number;
		for (;;) {
			headerEnd = buf.indexOf(HEADER_END);
			if (headerEnd >= 0) break;
			if (buf.length > MAX_HEADER_BYTES) throw new MultipartError('A form part’s headers are too long.');
			if (!(await more())) throw new MultipartError('The form data ends inside a part’s headers.');
		}
		// Anything between the delimiter and the line break (transport padding) is ignored.
		const headerStart = buf.indexOf(CRLF);
		const headers = parseHeaders(buf.subarray(headerStart + 2, headerEnd).toString('utf8'));
		buf = buf.subarray(headerEnd + 4);

		let partDone = false;
		/** The next piece of this part's body, or null at its end. */
		const nextPiece = async (): Promise<Buffer | null> => {
			for (;;) {
				if (partDone) return null;
				const at = buf.indexOf(delimiter);
				if (at >= 0) {
					const out = buf.subarray(0, at);
					buf = buf.subarray(at + delimiter.length);
					partDone = true;
					return out;
				}
				// Keep the tail that could be the start of a delimiter split across chunks.
				const keep = delimiter.length - 1;
				if (buf.length > keep) {
					const out = buf.subarray(0, buf.length - keep);
					buf = buf.subarray(buf.length - keep);
					return out;
				}
				if (!(await more())) throw new MultipartError('The form data ends inside a part (the upload was cut off).');
			}
		};
		const body: AsyncIterable<Buffer> = {
			async *[Symbol.asyncIterator]() {
				for (let piece = await nextPiece(); piece !== null; piece = await nextPiece()) if (piece.length > 0) yield piece;
			}
		};
		yield { ...headers, body };
		while (!partDone) await nextPiece();
	}
}

/** A small text field, read whole; refuses one larger than `limit` bytes. */
export async function readField(part: MultipartPart, limit = 256 * 1024): Promise<string> {
	const pieces: Buffer[] = [];
	let size = 0;
	for await (const piece of part.body) {
		size += piece.length;
		if (size > limit) throw new MultipartError(`The form field "${part.name}" is larger than ${Math.round(limit / 1024)} KB.`);
		pieces.push(Buffer.from(piece));
	}
	return Buffer.concat(pieces).toString('utf8');
}
