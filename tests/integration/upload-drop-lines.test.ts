// Storing a recorder file without its bad lines, only by the uploader's explicit choice: the
// default still refuses and lists every line and stores nothing; with dropBadLines=1 the file is
// stored, the lines left out are in the upload report and on the flight; a request body that is
// itself cut off mid-file is still refused, choice or not (the file is incomplete, not one line).
import { beforeAll, describe, expect, it } from 'vitest';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { droppedLinesOf } from '$lib/server/flights/upload-report';
import { db } from '$lib/server/db';
import { flights } from '$lib/server/db/schema';
import { eq } from 'drizzle-orm';
import { apiEvent, makeClub, multipartRequest, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Forgiving Club');
});

/** 300 good samples with a letter in line 40's flow cell and the last line cut off mid-cell. */
function damaged(start: number): string {
	const lines = steadyFile({ start, seconds: 300, flowUsgph: 8 }).trimEnd().split('\n');
	lines[39] = lines[39].replace(',8,', ',8x,');
	const last = lines.length - 1;
	lines[last] = lines[last].slice(0, 30);
	return lines.join('\n');
}

describe('bad lines left out by choice', () => {
	it('refuses by default, lists both lines with their likely cause, and stores nothing', async () => {
		const before = await tableCounts();
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: damaged(Date.UTC(2026, 6, 1, 9)) });
		expect(res.status).toBe(400);
		expect(res.body).toMatchObject({ outcome: 'rejected', problemCount: 2, droppable: true });
		expect(res.body.problems.map((p: { line: number }) => p.line)).toEqual([40, 302]);
		expect(res.body.problems[1].message).toMatch(/cut off when the recorder lost power/);
		expect(res.body.detail).toMatch(/you may store the file without them/);
		expect(await tableCounts()).toEqual(before);
	});

	it('with dropBadLines=1 stores the rest and lists the lines left out, in the report and on the flight', async () => {
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: damaged(Date.UTC(2026, 6, 2, 9)), fields: { dropBadLines: '1' } });
		expect(res.status).toBe(201);
		expect(res.body.rows).toBe(299);
		expect(res.body.report.droppedLines.map((p: { line: number }) => p.line)).toEqual([40, 302]);
		const [f] = await db.select().from(flights).where(eq(flights.id, res.body.flightId));
		expect(f.sampleCount).toBe(299);
		expect((await droppedLinesOf(f)).map((p) => p.line)).toEqual([40, 302]);
	});

	it('a good file stored with the choice lists nothing', async () => {
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 6, 3, 9), seconds: 60, flowUsgph: 8 }), fields: { dropBadLines: '1' } });
		expect(res.status).toBe(201);
		expect(res.body.report.droppedLines).toEqual([]);
	});

	it('refuses an unknown value of the choice with the field named', async () => {
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 6, 4, 9), seconds: 60, flowUsgph: 8 }), fields: { dropBadLines: 'yes' } });
		expect(res.status).toBe(400);
		expect(res.body.field).toBe('dropBadLines');
	});

	it('a request body cut off mid-file is still refused with the choice, and stores nothing', async () => {
		const req = multipartRequest({ aircraftId: club.trainer.id, file: steadyFile({ start: Date.UTC(2026, 6, 5, 9), seconds: 300, flowUsgph: 8 }), fields: { dropBadLines: '1' } });
		const bytes = new Uint8Array(await req.arrayBuffer());
		const cut = bytes.subarray(0, Math.floor(bytes.length * 0.6));
		const before = await tableCounts();
		const stream = new ReadableStream<Uint8Array>({
			start(controller) {
				controller.enqueue(cut.slice());
				controller.close();
			}
		});
		const sent = new Request('http://127.0.0.1:4173/api/v1/flights', { method: 'POST', body: stream, headers: { 'content-type': req.headers.get('content-type')! }, duplex: 'half' } as RequestInit);
		const res = await POST(apiEvent(sent, club.pilot) as never);
		const body = await res.json();
		expect(res.status).toBe(400);
		expect(body.detail).toMatch(/cut off/);
		expect(await tableCounts()).toEqual(before);
	});
});
