// Hostile upload bodies against the real handler and database: a valid multipart upload cut off
// at every kind of place (part headers, fields, the file, the closing boundary) and arbitrary
// bytes or mutations of a good body. Each must be answered with a clear 4xx, store nothing, and
// leave the server answering; an error thrown out of the handler or left unhandled on a stream
// would end a Node server (vitest fails the file on any unhandled error).
import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { apiEvent, makeClub, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Cut-off Club');
});

const FILE = steadyFile({ start: Date.UTC(2026, 5, 1, 9), seconds: 120, flowUsgph: 8.5 });

/** A good upload body as the platform's FormData writes it, and where its pieces are. */
async function goodBody(): Promise<{ body: Uint8Array; contentType: string; fileStart: number; closeAt: number; completeAt: number }> {
	const fd = new FormData();
	fd.set('aircraftId', club.trainer.id);
	fd.set('declaration', 'full');
	fd.set('title', 'Cut-off test');
	fd.set('file', new Blob([FILE], { type: 'text/csv' }), 'cut.csv');
	const req = new Request('http://127.0.0.1:4173/api/v1/flights', { method: 'POST', body: fd });
	const body = new Uint8Array(await req.arrayBuffer());
	const contentType = req.headers.get('content-type')!;
	const boundary = /boundary=(.+)$/.exec(contentType)![1];
	const text = Buffer.from(body).toString('latin1');
	const fileStart = text.indexOf('\r\n\r\n', text.indexOf('filename=')) + 4;
	const closeAt = text.lastIndexOf(`\r\n--${boundary}--`);
	return { body, contentType, fileStart, closeAt, completeAt: closeAt + 2 + boundary.length + 4 };
}

/** Sends `bytes` as the whole body (it ends there, as when a client stops sending). */
async function send(bytes: Uint8Array, contentType: string, chunk = 0): Promise<{ status: number; body: any }> {
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			if (chunk <= 0) controller.enqueue(bytes.slice());
			else for (let i = 0; i < bytes.length; i += chunk) controller.enqueue(bytes.slice(i, i + chunk));
			controller.close();
		}
	});
	const req = new Request('http://127.0.0.1:4173/api/v1/flights', { method: 'POST', body: stream, headers: { 'content-type': contentType }, duplex: 'half' } as RequestInit);
	const res = await POST(apiEvent(req, club.pilot) as never);
	const text = await res.text();
	let json: unknown = null;
	try {
		json = JSON.parse(text);
	} catch {
		json = { unparsed: text };
	}
	return { status: res.status, body: json };
}

describe('a multipart upload cut off anywhere', () => {
	it('answers a clear 4xx at every cut, stores nothing, and keeps answering', async () => {
		const { body, contentType, fileStart, closeAt, completeAt } = await goodBody();
		const cuts = new Set<number>();
		// Every byte through the fields and the file part's headers, into the first lines of the file.
		for (let i = 0; i < fileStart + 80; i++) cuts.add(i);
		// Through the file, and every byte of the closing boundary.
		for (let i = fileStart; i < closeAt; i += 211) cuts.add(i);
		for (let i = closeAt - 4; i < completeAt; i++) cuts.add(i);
		const before = await tableCounts();
		const seen = new Map<number, number>();
		for (const cut of [...cuts].sort((a, b) => a - b)) {
			const res = await send(body.subarray(0, cut), contentType, cut % 3 === 0 ? 0 : 97);
			seen.set(res.status, (seen.get(res.status) ?? 0) + 1);
			expect(res.status, `cut at byte ${cut}: ${JSON.stringify(res.body)}`).toBeGreaterThanOrEqual(400);
			expect(res.status, `cut at byte ${cut}: ${JSON.stringify(res.body)}`).toBeLessThan(500);
			expect(typeof res.body.detail, `cut at byte ${cut}`).toBe('string');
		}
		expect(await tableCounts()).toEqual(before);
		// Cuts inside the file say the upload was cut off.
		const inFile = await send(body.subarray(0, Math.floor((fileStart + closeAt) / 2)), contentType);
		expect(inFile).toMatchObject({ status: 400, body: { field: 'file' } });
		expect(inFile.body.detail).toMatch(/cut off/);
		// The upload page asks for NDJSON progress lines: its result line says the same, not a 500.
		const stream = new ReadableStream<Uint8Array>({
			start(controller) {
				controller.enqueue(body.slice(0, Math.floor((fileStart + closeAt) / 2)));
				controller.close();
			}
		});
		const ndjson = await POST(
			apiEvent(new Request('http://127.0.0.1:4173/api/v1/flights', { method: 'POST', body: stream, headers: { 'content-type': contentType, accept: 'application/x-ndjson' }, duplex: 'half' } as RequestInit), club.pilot) as never
		);
		const lines = (await ndjson.text()).trim().split('\n').map((l) => JSON.parse(l));
		expect(lines.at(-1)).toMatchObject({ kind: 'result', httpStatus: 400, answer: { outcome: 'invalid', status: 400, field: 'file' } });
		expect(lines.at(-1).answer.detail).toMatch(/cut off/);
		expect(await tableCounts()).toEqual(before);
		// The whole body is stored: the server (and its pool) still work.
		const ok = await send(body, contentType);
		expect(ok.status, JSON.stringify(ok.body)).toBe(201);
	}, 120_000);
});

describe('arbitrary bodies (fast-check)', () => {
	it('never a 5xx or a thrown error, and nothing stored, for random bytes or mutations of a good body', async () => {
		const { body, contentType, completeAt } = await goodBody();
		const before = await tableCounts();
		await fc.assert(
			fc.asyncProperty(
				fc.oneof(
					fc.uint8Array({ maxLength: 600 }),
					// A good body with a few bytes changed, cut somewhere before its closing boundary is whole.
					fc
						.tuple(fc.array(fc.tuple(fc.nat(body.length - 1), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 6 }), fc.nat(completeAt - 1))
						.map(([edits, cut]) => {
							const b = body.slice(0, cut);
							for (const [at, v] of edits) if (at < b.length) b[at] = v;
							return b;
						})
				),
				fc.integer({ min: 0, max: 300 }),
				async (bytes, chunk) => {
					const res = await send(bytes, contentType, chunk);
					expect(res.status).toBeGreaterThanOrEqual(400);
					expect(res.status).toBeLessThan(500);
				}
			),
			{ numRuns: 120 }
		);
		expect(await tableCounts()).toEqual(before);
		const ok = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 5, 2, 9), seconds: 60, flowUsgph: 8 }) });
		expect(ok.status).toBe(201);
	}, 120_000);
});

describe('arbitrary file contents (fast-check)', () => {
	it('a time far outside the representable range answers 400 with its line (it was a 500)', async () => {
		const mapping = JSON.stringify({ delimiter: ',', decimal: '.', time: { column: 't', format: 'epochS' }, flow: { column: 'ff', unit: 'usgal/h' } });
		const before = await tableCounts();
		const res = await upload(club.pilot, { aircraftId: club.tourer.id, file: 't,ff\n1e300,8.5\n0,8.5\n', fields: { mapping } });
		expect(res.status, JSON.stringify(res.body)).toBe(400);
		expect(res.body.outcome).toBe('rejected');
		expect(res.body.problems[0].line).toBeGreaterThanOrEqual(2);
		expect(await tableCounts()).toEqual(before);
	});

	it('answer 201 or a clear 4xx, never a 5xx; only a 201 stores anything', async () => {
		const cell = fc.oneof(
			fc.constantFrom('', '-1', '1e300', 'NaN', '0x10', '"', '2026-06-03T09:00:00Z', '2026-06-03T09:00:01Z', '275760-09-13T00:00:00Z', '8.5', '100', '40'),
			fc.string({ maxLength: 8 })
		);
		const file = fc
			.array(fc.array(cell, { minLength: 1, maxLength: 5 }), { maxLength: 12 })
			.map((rows) => ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm', ...rows.map((r) => r.join(','))].join('\n'));
		// Mapped files too: epoch seconds far outside the time range once answered 500.
		const mapping = JSON.stringify({ delimiter: ',', decimal: '.', time: { column: 'time_utc', format: 'epochS' }, flow: { column: 'fuel_flow_usgph', unit: 'usgal/h' } });
		let n = 0;
		await fc.assert(
			fc.asyncProperty(file, fc.boolean(), async (text, withMapping) => {
				const before = await tableCounts();
				// A fresh aircraft-day per run, so a stored file never overlaps the next.
				const res = await upload(club.pilot, { aircraftId: club.tourer.id, file: text.replaceAll('2026-06-03', `2027-01-${String(1 + (n++ % 28)).padStart(2, '0')}`), fields: withMapping ? { mapping } : {} });
				expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBeLessThan(500);
				if (res.status !== 201) expect(await tableCounts()).toEqual(before);
			}),
			{ numRuns: 60 }
		);
	}, 120_000);
});
