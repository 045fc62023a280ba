// The recorder-facing HTTP API (POST /api/v1/live/samples, /open, /close): the bearer recorder
// token found here (the auth hook leaves /api/v1/live/* to us; the routes ask through
// requireRecorder of access.ts), the body read with its own size limit, validated whole, and every
// refusal answered as JSON saying what and where.
import { json } from '@sveltejs/kit';
import { jsonPointer } from '$lib/wire/problem';
import { problem } from '../problem';
import { toDeclaration } from '$lib/schemas/declaration';
import { db } from '../db';
import type { Aircraft, Recorder } from '../db/schema';
import { readCsvBatch, readJsonBatch, closeSchema, openSchema, type Batch, type BatchProblem } from './batch';
import { MAX_BATCH_BYTES, MAX_BATCH_LABEL } from './config';
import { activeAircraftOf, closeByRecorder, LiveRefusal, openByRecorder, touchRecorder } from './flights';
import { ingestBatch } from './ingest';

export { RECORDER_TOKEN_PREFIX } from '../access';

const unauthorized = () =>
	problem(401, 'Unknown or revoked recorder token: send Authorization: Bearer bdr_… as shown when the recorder was registered.', { headers: { 'www-authenticate': 'Bearer realm="burndown-live"' } });

class BodyTooLarge extends Error {}

/** The body as text, refusing more than `limit` bytes while it streams in. */
async function readText(request: Request, limit: number): Promise<string> {
	const declared = Number(request.headers.get('content-length') ?? NaN);
	if (declared > limit) throw new BodyTooLarge();
	if (!request.body) return '';
	const reader = request.body.getReader();
	const parts: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.length;
		if (size > limit) {
			await reader.cancel().catch(() => {});
			throw new BodyTooLarge();
		}
		parts.push(value);
	}
	const all = new Uint8Array(size);
	let at = 0;
	for (const p of parts) {
		all.set(p, at);
		at += p.length;
	}
	try {
		return new TextDecoder('utf-8', { fatal: true }).decode(all);
	} catch {
		const at = firstInvalidUtf8(all);
		throw new LiveRefusal(400, {
			error: `The body is not valid UTF-8: byte ${at} (counting from 0) is 0x${(all[at] ?? 0).toString(16).padStart(2, '0')}, which does not belong there. Send the batch encoded as UTF-8.`,
			field: 'body',
			offset: at
		});
	}
}

/**
 * Offset of the first byte that breaks UTF-8 (RFC 3629: no overlong forms, no surrogates, nothing
 * above U+10FFFF), or of the lead byte of a sequence cut short at the end.
 */
export function firstInvalidUtf8(b: Uint8Array): number {
	let i = 0;
	while (i < b.length) {
		const c = b[i];
		if (c < 0x80) {
			i++;
			continue;
		}
		let n: number;
		let lo = 0x80;
		let hi = 0xbf;
		if (c >= 0xc2 && c <= 0xdf) n = 1;
		else if (c >= 0xe0 && c <= 0xef) {
			n = 2;
			if (c === 0xe0) lo = 0xa0;
			if (c === 0xed) hi = 0x9f;
		} else if (c >= 0xf0 && c <= 0xf4) {
			n = 3;
			if (c === 0xf0) lo = 0x90;
			if (c === 0xf4) hi = 0x8f;
		} else return i;
		for (let k = 1; k <= n; k++) {
			if (i + k >= b.length) return i;
			const d = b[i + k];
			if (d < (k === 1 ? lo : 0x80) || d > (k === 1 ? hi : 0xbf)) return i + k;
		}
		i += n + 1;
	}
	return b.length;
}

const tooLarge = () => problem(413, `The batch is larger than ${MAX_BATCH_LABEL}: send fewer samples per batch.`, { errors: [{ pointer: '', detail: `larger than ${MAX_BATCH_LABEL}` }], extra: { field: 'body' } });

function refused(error: unknown): Response {
	if (error instanceof LiveRefusal) {
		const { error: detail, ...extra } = error.body;
		return problem(error.status, detail, { kind: Array.isArray(extra.problems) ? 'rows-rejected' : undefined, extra });
	}
	if (error instanceof BodyTooLarge) return tooLarge();
	throw error;
}

async function jsonBody(request: Request): Promise<unknown> {
	const text = await readText(request, MAX_BATCH_BYTES);
	if (text.trim() === '') return {};
	try {
		return JSON.parse(text);
	} catch (e) {
		throw new LiveRefusal(400, { error: `The body is not valid JSON: ${(e as Error).message}`, field: 'body' });
	}
}

const badBatch = (problems: BatchProblem[]) =>
	problem(400, `The batch was not stored: ${problems.length === 1 ? 'one problem' : `${problems.length} problems`}. Nothing of it was stored.`, { kind: 'rows-rejected', extra: { problems } });

/**
 * POST /api/v1/live/samples. JSON ({ flightId?, firstSeq?, units?, samples: [...] }) or text/csv
 * (a header line of our recorder format with its seq column, then sample lines; flightId and
 * firstSeq in the query string). Answers the Ack of ingest.ts.
 */
export async function handleSamples(request: Request, url: URL, recorder: Recorder | null): Promise<Response> {
	if (!recorder) return unauthorized();
	// The recorder's last contact is stamped with what it sent: by ingestBatch when a batch is
	// stored (for plain appends in their grouped commit), here when it is refused before that.
	let handedOver = false;
	const store = (batch: Batch) => {
		handedOver = true;
		return ingestBatch(recorder, batch);
	};
	let answer: Response;
	try {
		answer = await answerSamples(request, url, recorder, store);
	} catch (error) {
		answer = refused(error);
	}
	if (!handedOver) await touchRecorder(recorder.id);
	return answer;
}

/**
 * The recorder's aircraft as a batch is read with (its density converts mass flows), remembered
 * for a few seconds per instance: longer than a recorder's usual interval, so one query fewer per
 * batch. The answer that counts is given where the batch is stored (the aircraft not archived,
 * checked in its transaction), so archiving takes effect at once and a restored aircraft records
 * at once; a density changed within those seconds reads a mass-flow batch as one sent just before
 * the change would have been (the aircraft was always read outside the storing transaction).
 */
const parseAircraft = new Map<string, { a: Aircraft; at: number }>();
const PARSE_AIRCRAFT_MS = 5000;

async function aircraftForReading(recorder: Recorder): Promise<Aircraft> {
	const now = Date.now();
	const known = parseAircraft.get(recorder.aircraftId);
	if (known && now - known.at < PARSE_AIRCRAFT_MS && known.a.orgId === recorder.orgId) return known.a;
	const a = await activeAircraftOf(db, recorder);
	if (parseAircraft.size > 10_000) parseAircraft.clear();
	parseAircraft.set(a.id, { a, at: now });
	return a;
}

async function answerSamples(request: Request, url: URL, recorder: Recorder, store: (batch: Batch) => Promise<unknown>): Promise<Response> {
	const a = await aircraftForReading(recorder);
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	let result;
	if (type === 'text/csv' || type === 'text/plain') {
		const flightId = url.searchParams.get('flightId');
		const firstSeq = Number(url.searchParams.get('firstSeq') ?? 0);
		if (flightId !== null && !/^[0-9a-f-]{36}$/i.test(flightId)) return problem(400, 'flightId must be the id an earlier answer gave.', { errors: [{ field: 'flightId', detail: 'not an id an earlier answer gave' }], extra: { field: 'flightId' } });
		if (!Number.isInteger(firstSeq) || firstSeq < 0) return problem(400, 'firstSeq must be a whole number, 0 or more.', { errors: [{ field: 'firstSeq', detail: 'not a whole number, 0 or more' }], extra: { field: 'firstSeq' } });
		result = readCsvBatch(await readText(request, MAX_BATCH_BYTES), { flightId, firstSeq, densityKgPerL: a.densityKgPerL });
	} else if (type === 'application/json' || type === '') {
		result = readJsonBatch(await jsonBody(request), a.densityKgPerL);
	} else {
		return problem(415, `Send the batch as application/json or text/csv (got ${type}).`, { extra: { field: 'content-type' } });
	}
	if (!result.ok) return badBatch(result.problems);
	return json(await store(result.batch));
}

/** POST /api/v1/live/open: { declaration?, firstSeq?, title?, pilot? } → 201 { flightId, … }. */
export async function handleOpen(request: Request, recorder: Recorder | null): Promise<Response> {
	if (!recorder) return unauthorized();
	try {
		await touchRecorder(recorder.id);
		const parsed = openSchema.safeParse(await jsonBody(request));
		if (!parsed.success)
			return problem(400, 'The open request was not understood.', {
				errors: parsed.error.issues.map((i) => ({ pointer: jsonPointer(i.path), detail: i.message })),
				extra: { problems: parsed.error.issues.map((i) => ({ field: i.path.join('.'), message: i.message })) }
			});
		const a = await activeAircraftOf(db, recorder);
		const o = parsed.data;
		const { flight, closedFlightId } = await openByRecorder(recorder, {
			declaration: o.declaration ? toDeclaration(o.declaration, a) : null,
			firstSeq: o.firstSeq,
			title: o.title,
			pilot: o.pilot
		});
		return json(
			{ flightId: flight.id, firstSeq: flight.lastSeq + 1, declarationConfirmed: flight.declarationConfirmed, closedFlightId },
			{ status: 201 }
		);
	} catch (error) {
		return refused(error);
	}
}

/** POST /api/v1/live/close: { flightId? } → { flightId, closed }. */
export async function handleClose(request: Request, recorder: Recorder | null): Promise<Response> {
	if (!recorder) return unauthorized();
	try {
		await touchRecorder(recorder.id);
		const parsed = closeSchema.safeParse(await jsonBody(request));
		if (!parsed.success) return problem(400, 'flightId must be the id an earlier answer gave.', { errors: [{ field: 'flightId', detail: 'not an id an earlier answer gave' }], extra: { field: 'flightId' } });
		return json(await closeByRecorder(recorder, parsed.data.flightId));
	} catch (error) {
		return refused(error);
	}
}
