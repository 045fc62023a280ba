// An upload request, from the page or a script: the form fields (aircraft, declaration, mapping or
// import profile) and the file as a byte stream. multipart/form-data with the fields before the
// file part, or the raw file (text/csv) with the fields in the query string.
import { z } from 'zod';
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_LABEL, columnMappingSchema, type ColumnMapping } from '$lib/csv';
import { plainText } from '$lib/schemas/text';
import { declarationInputSchema, type DeclarationInput } from './declaration';
import { FIELD_LIMIT_BYTES, MultipartError, multipartBoundary, readMultipart, type MultipartPart } from './multipart';

/** Room for the form fields and part headers around the file in a multipart body. */
export const MULTIPART_OVERHEAD_BYTES = 1024 * 1024;

export class UploadRequestError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly field: string | null = null,
		readonly errors: Record<string, string> = {}
	) {
		super(message);
	}
}

const optionalText = (max: number) => plainText(max).optional();
const optionalUuid = z
	.string()
	.trim()
	.optional()
	.transform((v) => (v ? v : undefined))
	.pipe(z.uuid('Not a valid id.').optional());

/** The fields of an upload, as text; mapping is JSON. */
export const uploadFieldsSchema = z.object({
	aircraftId: z.uuid('Choose the aircraft (its id).'),
	declaration: declarationInputSchema.shape.kind,
	amount: z.string().optional(),
	unit: z.string().optional(),
	mapping: z
		.string()
		.optional()
		.transform((raw, ctx): ColumnMapping | null => {
			if (!raw || raw.trim() === '') return null;
			let json: unknown;
			try {
				json = JSON.parse(raw);
			} catch {
				ctx.addIssue({ code: 'custom', message: 'The mapping is not valid JSON.' });
				return z.NEVER;
			}
			const m = columnMappingSchema.safeParse(json);
			if (!m.success) {
				const issue = m.error.issues[0];
				ctx.addIssue({ code: 'custom', message: `Mapping ${issue.path.join('.') || 'value'}: ${issue.message}` });
				return z.NEVER;
			}
			return m.data;
		}),
	profileId: optionalUuid,
	timeDate: optionalText(10),
	timeStart: optionalText(40),
	title: optionalText(120),
	/** "1": store the file without its bad lines (up to MAX_DROPPED_LINES), never by default. */
	dropBadLines: z.enum(['', '0', '1'], 'Send dropBadLines as 1 (leave bad lines out) or 0.').optional(),
	notes: optionalText(4000),
	fileName: optionalText(255)
});

export interface UploadFields {
	aircraftId: string;
	declaration: DeclarationInput;
	mapping: ColumnMapping | null;
	profileId: string | null;
	timeBase: { date?: string; start?: string };
	title?: string;
	notes?: string;
	dropBadLines: boolean;
}

/** Checks the fields; an UploadRequestError names every field that is wrong. */
export function checkFields(raw: Record<string, string>): UploadFields {
	const parsed = uploadFieldsSchema.safeParse(raw);
	const errors: Record<string, string> = {};
	if (!parsed.success) for (const i of parsed.error.issues) errors[String(i.path[0] ?? 'form')] ??= i.message;
	const decl = declarationInputSchema.safeParse({ kind: raw.declaration, amount: raw.amount, unit: raw.unit || undefined });
	if (!decl.success) for (const i of decl.error.issues) errors[i.path[0] === 'kind' ? 'declaration' : String(i.path[0] ?? 'declaration')] ??= i.message;
	if (!parsed.success || !decl.success) {
		const [field, message] = Object.entries(errors)[0];
		throw new UploadRequestError(400, message, field, errors);
	}
	const f = parsed.data;
	return {
		aircraftId: f.aircraftId,
		declaration: decl.data,
		mapping: f.mapping,
		profileId: f.profileId ?? null,
		timeBase: { date: f.timeDate || undefined, start: f.timeStart || undefined },
		title: f.title,
		notes: f.notes,
		dropBadLines: f.dropBadLines === '1'
	};
}

/** The pace a request body must keep (see uploadLimits). */
export interface BodyPace {
	idleMs: number;
	minBytesPerS: number;
	graceMs: number;
}

const seconds = (ms: number) => `${Math.round(ms / 100) / 10} s`;

/**
 * A web ReadableStream as an async iterable of byte chunks. With `pace`, a body that stalls or
 * trickles is stopped with a 408, so a slow client cannot hold the upload's resources for ever.
 * `signal` stops reading when the caller gives up on the body. The body is left unread rather
 * than cancelled: cancelling the request stream would close the connection before the answer
 * (the answer asks for the connection to be closed instead, see handleUpload).
 */
export async function* bytesOf(stream: ReadableStream<Uint8Array> | null, o: { pace?: BodyPace; signal?: AbortSignal } = {}): AsyncGenerator<Uint8Array> {
	if (!stream) return;
	const reader = stream.getReader();
	const { pace, signal } = o;
	const started = Date.now();
	let total = 0;
	const release = () => {
		try {
			// A read still waiting is rejected by this, and handled where it is awaited.
			reader.releaseLock();
		} catch {
			/* released already */
		}
	};
	signal?.addEventListener('abort', release, { once: true });
	try {
		for (;;) {
			if (signal?.aborted) return;
			const read = reader.read();
			// Never an unhandled rejection, whoever stops waiting for this read first.
			read.catch(() => {});
			let timer: ReturnType<typeof setTimeout> | undefined;
			let next: ReadableStreamReadResult<Uint8Array>;
			try {
				next = pace
					? await Promise.race([
							read,
							new Promise<never>((_, reject) => {
								timer = setTimeout(
									() => reject(new UploadRequestError(408, `No data arrived for ${seconds(pace.idleMs)}: the upload was stopped and nothing was stored. Send the file again.`, 'file')),
									pace.idleMs
								);
							})
						])
					: await read;
			} catch (error) {
				if (signal?.aborted) return;
				if (error instanceof UploadRequestError) throw error;
				// The connection failed or the client hung up: the client's doing, not a server error.
				throw new UploadRequestError(400, `The upload was interrupted before the file ended (${(error as Error)?.message ?? 'connection closed'}); nothing was stored.`, 'file');
			} finally {
				clearTimeout(timer);
			}
			if (next.done) return;
			const value = next.value;
			if (!value || value.length === 0) continue;
			total += value.length;
			if (pace && pace.minBytesPerS > 0) {
				const elapsed = Date.now() - started;
				if (elapsed > pace.graceMs && total / (elapsed / 1000) < pace.minBytesPerS)
					throw new UploadRequestError(
						408,
						`The upload arrived too slowly (${Math.round(total / (elapsed / 1000))} bytes/s on average, at least ${pace.minBytesPerS} needed): it was stopped and nothing was stored.`,
						'file'
					);
			}
			yield value;
		}
	} finally {
		signal?.removeEventListener('abort', release);
		release();
	}
}

async function* oneChunk(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

/**
 * The file part's bytes, then the rest of the form: the body must end properly after the file
 * (its closing boundary), or the upload was cut off and must not be stored. A form that breaks
 * inside or after the file answers 400, not 500.
 */
async function* fileThenEnd(body: AsyncIterable<Uint8Array>, rest: AsyncGenerator<MultipartPart>): AsyncGenerator<Uint8Array> {
	try {
		yield* body;
		const after = await rest.next();
		if (!after.done) {
			await rest.return(undefined);
			throw new UploadRequestError(400, `Send the recorder file as the last part of the form (a part "${after.value.name}" came after it). Nothing was stored.`, 'file');
		}
	} catch (error) {
		if (error instanceof MultipartError) throw new UploadRequestError(400, error.message, 'file');
		throw error;
	}
}

export interface UploadRequest {
	fields: Record<string, string>;
	fileName: string;
	file: AsyncIterable<Uint8Array>;
	/** Stops reading the body (an upload refused before or while its file is read). */
	discard(): void;
}

const RAW_TYPES = /^(text\/csv|text\/plain|application\/csv|application\/octet-stream)\b/i;

/**
 * Reads the fields and finds the file in the request, without reading the file itself.
 * Refuses early what can be refused from the headers alone (a Content-Length over the limit).
 */
export async function openUploadRequest(request: Request, url: URL, pace?: BodyPace): Promise<UploadRequest> {
	const contentType = request.headers.get('content-type');
	const length = Number(request.headers.get('content-length'));
	const boundary = multipartBoundary(contentType);
	if (Number.isFinite(length) && length > MAX_UPLOAD_BYTES + (boundary ? MULTIPART_OVERHEAD_BYTES : 0))
		throw new UploadRequestError(413, `The file is larger than the ${MAX_UPLOAD_LABEL} limit; nothing was stored.`, 'file');

	const stop = new AbortController();
	const discard = () => stop.abort();
	if (boundary) {
		const fields: Record<string, string> = {};
		const parts = readMultipart(bytesOf(request.body, { pace, signal: stop.signal }), boundary, FIELD_LIMIT_BYTES, stop.signal);
		try {
			// Not for-await: leaving that loop would end the parts generator, which the file still needs.
			for (let next = await parts.next(); !next.done; next = await parts.next()) {
				const part = next.value;
				if (part.kind === 'file' || part.name === 'file') {
					if (part.name !== 'file') throw new UploadRequestError(400, `Send the recorder file in the form field "file" (got "${part.name}").`, 'file');
					// curl -F 'file=<flight.csv' sends the file as a text part without a file name; it fits the field limit.
					const body = part.kind === 'field' ? oneChunk(Buffer.from(part.value)) : part.body;
					return { fields, fileName: fields.fileName || (part.kind === 'file' ? part.filename : null) || 'upload.csv', file: fileThenEnd(body, parts), discard };
				}
				fields[part.name] = part.value;
			}
		} catch (error) {
			discard();
			if (error instanceof MultipartError && error.field === 'file')
				throw new UploadRequestError(400, `Send the recorder file as a file part with a file name (curl -F "file=@flight.csv"); a text field "file" holds at most ${FIELD_LIMIT_BYTES / 1024} KB.`, 'file');
			if (error instanceof MultipartError) throw new UploadRequestError(400, error.message, 'file');
			throw error;
		}
		throw new UploadRequestError(400, 'No file in the form data: send it in the field "file", after the other fields.', 'file');
	}
	if (contentType && RAW_TYPES.test(contentType)) {
		const fields = Object.fromEntries(url.searchParams.entries());
		return { fields, fileName: fields.fileName || 'upload.csv', file: bytesOf(request.body, { pace, signal: stop.signal }), discard };
	}
	throw new UploadRequestError(415, 'Send the file as multipart/form-data (field "file") or as text/csv with the fields in the query string.', 'file');
}
