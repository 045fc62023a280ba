// An upload request, from the page or a script: the form fields (aircraft, declaration, mapping or
// import profile) and the file as a byte stream. multipart/form-data with the fields before the
// file part, or the raw file (text/csv) with the fields in the query string.
import { z } from 'zod';
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_LABEL, columnMappingSchema, type ColumnMapping } from '$lib/csv';
import { plainText } from '$lib/schemas/text';
import { declarationInputSchema, type DeclarationInput } from './declaration';
import { FIELD_LIMIT_BYTES, MultipartError, multipartBoundary, readMultipart } from './multipart';

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
		notes: f.notes
	};
}

/** A web ReadableStream as an async iterable of byte chunks. */
export async function* bytesOf(stream: ReadableStream<Uint8Array> | null): AsyncGenerator<Uint8Array> {
	if (!stream) return;
	const reader = stream.getReader();
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) return;
			if (value && value.length > 0) yield value;
		}
	} finally {
		reader.releaseLock();
	}
}

async function* oneChunk(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

/** The file part's bytes; a form that breaks inside it (a cut-off upload) answers 400, not 500. */
async function* formErrorsAs400(body: AsyncIterable<Buffer>): AsyncGenerator<Uint8Array> {
	try {
		yield* body;
	} catch (error) {
		if (error instanceof MultipartError) throw new UploadRequestError(400, error.message, 'file');
		throw error;
	}
}

export interface UploadRequest {
	fields: Record<string, string>;
	fileName: string;
	file: AsyncIterable<Uint8Array>;
}

const RAW_TYPES = /^(text\/csv|text\/plain|application\/csv|application\/octet-stream)\b/i;

/**
 * Reads the fields and finds the file in the request, without reading the file itself.
 * Refuses early what can be refused from the headers alone (a Content-Length over the limit).
 */
export async function openUploadRequest(request: Request, url: URL): Promise<UploadRequest> {
	const contentType = request.headers.get('content-type');
	const length = Number(request.headers.get('content-length'));
	const boundary = multipartBoundary(contentType);
	if (Number.isFinite(length) && length > MAX_UPLOAD_BYTES + (boundary ? MULTIPART_OVERHEAD_BYTES : 0))
		throw new UploadRequestError(413, `The file is larger than the ${MAX_UPLOAD_LABEL} limit; nothing was stored.`, 'file');

	if (boundary) {
		const fields: Record<string, string> = {};
		const parts = readMultipart(bytesOf(request.body), boundary);
		try {
			for await (const part of parts) {
				if (part.kind === 'file' || part.name === 'file') {
					if (part.name !== 'file') throw new UploadRequestError(400, `Send the recorder file in the form field "file" (got "${part.name}").`, 'file');
					// curl -F 'file=<flight.csv' sends the file as a text part without a file name; it fits the field limit.
					if (part.kind === 'field') return { fields, fileName: fields.fileName || 'upload.csv', file: oneChunk(Buffer.from(part.value)) };
					return { fields, fileName: fields.fileName || part.filename || 'upload.csv', file: formErrorsAs400(part.body) };
				}
				fields[part.name] = part.value;
			}
		} catch (error) {
			if (error instanceof MultipartError && error.field === 'file')
				throw new UploadRequestError(400, `Send the recorder file as a file part with a file name (curl -F "file=@flight.csv"); a text field "file" holds at most ${FIELD_LIMIT_BYTES / 1024} KB.`, 'file');
			if (error instanceof MultipartError) throw new UploadRequestError(400, error.message, 'file');
			throw error;
		}
		throw new UploadRequestError(400, 'No file in the form data: send it in the field "file", after the other fields.', 'file');
	}
	if (contentType && RAW_TYPES.test(contentType)) {
		const fields = Object.fromEntries(url.searchParams.entries());
		return { fields, fileName: fields.fileName || 'upload.csv', file: bytesOf(request.body) };
	}
	throw new UploadRequestError(415, 'Send the file as multipart/form-data (field "file") or as text/csv with the fields in the query string.', 'file');
}
