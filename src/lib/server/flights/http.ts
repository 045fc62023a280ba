// Small pieces the flight API routes share: reading a query string with zod into a 400 that
// names the parameter, compressing a large body when the client accepts gzip, and streaming a
// long text body piece by piece (gzipped on the way when accepted).
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import type { z } from 'zod';
import { problem } from '../problem';

const gzipAsync = promisify(gzip);

export type QueryResult<T> = { ok: true; data: T } | { ok: false; response: Response };

export function parseQuery<S extends z.ZodType>(schema: S, url: URL): QueryResult<z.output<S>> {
	const result = schema.safeParse(Object.fromEntries(url.searchParams));
	if (result.success) return { ok: true, data: result.data };
	const errors = result.error.issues.map((i) => ({ field: i.path.join('.') || 'query', detail: i.message }));
	const first = errors[0];
	return { ok: false, response: problem(400, `Query parameter ${first.field}: ${first.detail}`, { errors, instance: url.pathname }) };
}

/** Bodies smaller than this go out as they are: compressing them costs more than it saves. */
const MIN_GZIP_BYTES = 8 * 1024;

/**
 * A response body, gzipped when the request accepts it. The Node adapter sends dynamic
 * responses uncompressed, and the samples of a long flight are megabytes.
 */
export async function maybeGzip(request: Request, body: Uint8Array<ArrayBuffer> | string, headers: Record<string, string>): Promise<Response> {
	const bytes = typeof body === 'string' ? new TextEncoder().encode(body) : body;
	const h = new Headers(headers);
	h.set('vary', 'accept-encoding');
	const accepts = /\bgzip\b/.test(request.headers.get('accept-encoding') ?? '');
	if (accepts && bytes.length >= MIN_GZIP_BYTES) {
		const packed = await gzipAsync(bytes, { level: 6 });
		h.set('content-encoding', 'gzip');
		h.set('content-length', String(packed.length));
		return new Response(new Uint8Array(packed), { headers: h });
	}
	h.set('content-length', String(bytes.length));
	return new Response(bytes, { headers: h });
}

/**
 * A text body written piece by piece as the client reads it (so only a piece or two is in memory
 * at a time), gzipped on the way when the request accepts it. `onEnd` runs once, when the body was
 * sent, failed or the client went away.
 */
export function streamText(request: Request, pieces: Iterator<string>, headers: Record<string, string>, onEnd: () => void = () => {}): Response {
	const encoder = new TextEncoder();
	let ended = false;
	const end = () => {
		if (ended) return;
		ended = true;
		onEnd();
	};
	let source: ReadableStream<Uint8Array> = new ReadableStream<Uint8Array>(
		{
			pull(controller) {
				try {
					const next = pieces.next();
					if (next.done) {
						controller.close();
						end();
					} else controller.enqueue(encoder.encode(next.value));
				} catch (error) {
					end();
					controller.error(error);
				}
			},
			cancel() {
				pieces.return?.();
				end();
			}
		},
		// One piece queued ahead at most: the client's pace sets the server's.
		{ highWaterMark: 1 }
	);
	const h = new Headers(headers);
	h.set('vary', 'accept-encoding');
	if (/\bgzip\b/.test(request.headers.get('accept-encoding') ?? '')) {
		source = source.pipeThrough(new CompressionStream('gzip') as unknown as ReadableWritablePair<Uint8Array, Uint8Array>);
		h.set('content-encoding', 'gzip');
	}
	return new Response(source, { headers: h });
}
