// The upload answer, shared by the API route and the upload page: the same ingest result as a JSON
// body with its HTTP status, or as a stream of NDJSON lines (progress, then the result) for a
// browser that shows the server's parsing and storing as it happens.
import { eq } from 'drizzle-orm';
import { error, isHttpError, json, type RequestEvent } from '@sveltejs/kit';
import { problemBody, problemResponse } from '../problem';
import { MAX_UPLOAD_BYTES } from '$lib/csv';
import type { UploadAnswer, UploadLine, UploadRefusal } from '$lib/wire/upload';
import { requireAircraft, requireUser } from '../access';
import { db } from '../db';
import { aircraft, organisations } from '../db/schema';
import { ingestRecorderFile, type IngestProgress, type IngestResult } from './ingest';

export type { UploadAnswer, UploadLine };
import { UploadRequestError, checkFields, openUploadRequest, type UploadRequest } from './request';
import { BusyError, takeUploadSlot, uploadLimits } from '../limits';

export const NDJSON = 'application/x-ndjson';

/** An upload refusal: the problem with the upload's own extension members. */
function refusal(status: number, outcome: UploadRefusal['outcome'], detail: string, extra: Record<string, unknown>, errors?: Record<string, string>): { httpStatus: number; body: UploadRefusal } {
	const kind = outcome === 'rejected' ? 'rows-rejected' : undefined;
	const fieldErrors = errors ? Object.entries(errors).map(([field, d]) => ({ field, detail: d })) : undefined;
	return { httpStatus: status, body: problemBody(status, detail, { kind, instance: UPLOAD_PATH, errors: fieldErrors, extra: { outcome, ...extra } }) as UploadRefusal };
}

const UPLOAD_PATH = '/api/v1/flights';

function answerOf(result: IngestResult, slug: string): { httpStatus: number; body: UploadAnswer } {
	const url = (id: string) => `/o/${slug}/flights/${id}`;
	switch (result.status) {
		case 'stored':
			return {
				httpStatus: 201,
				body: { outcome: 'stored', flightId: result.flightId, uploadId: result.uploadId, url: url(result.flightId), rows: result.report.rows, report: result.report, summary: result.summary }
			};
		case 'duplicate':
			return { httpStatus: 200, body: { outcome: 'duplicate', flightId: result.flightId, uploadId: result.uploadId, url: url(result.flightId), message: result.message } };
		case 'rejected':
			return refusal(400, 'rejected', result.message, { problems: result.problems, problemCount: result.problemCount });
		case 'invalid':
			return refusal(result.field === 'file' ? 409 : 400, 'invalid', result.message, { field: result.field }, { [result.field]: result.message });
		case 'tooLarge':
			return refusal(413, 'tooLarge', result.message, { field: 'file', limitBytes: result.limitBytes });
	}
}

/** The answer to an upload refused for what the request is or how it arrived; null for anything else. */
function refusalOf(e: unknown): { httpStatus: number; body: UploadRefusal } | null {
	if (e instanceof UploadRequestError) {
		const outcome = e.status === 413 ? 'tooLarge' : e.status === 408 ? 'timeout' : 'invalid';
		return refusal(e.status, outcome, e.message, { field: e.field, ...(e.status === 413 ? { limitBytes: MAX_UPLOAD_BYTES } : {}) }, e.errors);
	}
	if (e instanceof BusyError) return refusal(429, 'busy', e.message, { field: null, retryAfterS: e.retryAfterS });
	if (isHttpError(e)) return refusal(e.status, e.status === 404 ? 'invalid' : 'error', e.body.message, { field: e.status === 404 ? 'aircraftId' : null });
	return null;
}

/** The organisation of an aircraft, so the usual membership check can run; unknown id → 404. */
async function orgSlugOfAircraft(aircraftId: string): Promise<string> {
	const [row] = await db
		.select({ slug: organisations.slug })
		.from(aircraft)
		.innerJoin(organisations, eq(organisations.id, aircraft.orgId))
		.where(eq(aircraft.id, aircraftId))
		.limit(1);
	if (!row) error(404, 'Aircraft not found.');
	return row.slug;
}

/**
 * Handles an upload request from start to answer. The caller must be a member of the aircraft's
 * organisation with the upload permission; to anyone else the aircraft is "not found".
 */
export async function handleUpload(event: Pick<RequestEvent, 'request' | 'url' | 'locals' | 'route'>): Promise<Response> {
	let upload: UploadRequest | undefined;
	try {
		// Who is asking comes first: nobody reads a stranger's upload.
		requireUser(event);
		const limits = uploadLimits();
		upload = await openUploadRequest(event.request, event.url, limits);
		const fields = checkFields(upload.fields);
		const slug = await orgSlugOfAircraft(fields.aircraftId);
		let ctx;
		try {
			ctx = await requireAircraft(event, slug, fields.aircraftId, 'upload');
		} catch (e) {
			// A member of another organisation learns nothing about the aircraft, not even its club.
			if (isHttpError(e) && e.status === 404) error(404, 'Aircraft not found.');
			throw e;
		}
		if (ctx.aircraft.archivedAt) throw new UploadRequestError(409, `${ctx.aircraft.registration} is archived; restore it before uploading flights.`, 'aircraftId');
		// Before the file is read: a crowd of uploads is refused, not queued on the server's resources.
		const releaseSlot = takeUploadSlot(ctx.user.id, ctx.org.id, limits);
		const file = upload;
		const finish = () => {
			releaseSlot();
			file.discard();
		};
		const run = (onProgress?: (p: IngestProgress) => void) =>
			ingestRecorderFile({
				orgId: ctx.org.id,
				aircraft: ctx.aircraft,
				userId: ctx.user.id,
				fileName: file.fileName,
				source: file.file,
				declaration: fields.declaration,
				mapping: fields.mapping,
				profileId: fields.profileId,
				timeBase: fields.timeBase,
				title: fields.title,
				notes: fields.notes,
				onProgress
			}).finally(finish);

		if ((event.request.headers.get('accept') ?? '').includes(NDJSON)) {
			const encoder = new TextEncoder();
			let open = true;
			const stream = new ReadableStream<Uint8Array>({
				start(controller) {
					const send = (line: UploadLine) => {
						if (open) controller.enqueue(encoder.encode(JSON.stringify(line) + '\n'));
					};
					run((progress) => send({ kind: 'progress', progress }))
						.then((result) => {
							const { httpStatus, body } = answerOf(result, ctx.org.slug);
							send({ kind: 'result', httpStatus, answer: body });
						})
						.catch((e) => {
							// A body cut off, stalled or garbled while the file was read: the same answer as without NDJSON.
							const refused = refusalOf(e);
							if (refused) return send({ kind: 'result', httpStatus: refused.httpStatus, answer: refused.body });
							console.error('[upload]', e);
							send({ kind: 'result', httpStatus: 500, answer: refusal(500, 'error', 'Something went wrong on our side. Nothing was stored.', { field: null }).body });
						})
						.finally(() => {
							if (open) controller.close();
							open = false;
						});
				},
				cancel() {
					// The browser went away; the ingest notices when the request body ends early.
					open = false;
				}
			});
			// The connection closes after the answer: when the file was refused part way (too large,
			// stalled), the rest of the body is never read, and must not be taken for a next request.
			return new Response(stream, { status: 200, headers: { 'content-type': NDJSON, 'cache-control': 'no-store', 'x-content-type-options': 'nosniff', connection: 'close' } });
		}
		const { httpStatus, body } = answerOf(await run(), ctx.org.slug);
		// A file over the limit was not read to its end: close the connection after the answer.
		if ('type' in body) return problemResponse(body, body.outcome === 'tooLarge' ? { connection: 'close' } : {});
		return json(body, { status: httpStatus });
	} catch (e) {
		// Refused before or while the file was read: stop reading the rest of the body, and close
		// the connection after the answer, so the unread rest is not taken for the next request.
		upload?.discard();
		const close = { connection: 'close' };
		const refused = refusalOf(e);
		if (refused) return problemResponse(refused.body, refused.body.outcome === 'busy' ? { ...close, 'retry-after': String(refused.body.retryAfterS) } : close);
		throw e;
	}
}
