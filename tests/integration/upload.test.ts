// Good uploads against the real database: every demo file stored with the right counts and
// figures, original bytes kept exactly, duplicates recognised, the aircraft's last fuel figure
// moved only by its newest flight, and the script paths (text/csv, NDJSON progress).
import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { asc, count, eq } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, flightFigures, flightPhaseFigures, flights, samples, uploadChunks, uploads } from '$lib/server/db/schema';
import { LITRES_PER_US_GALLON } from '$lib/units';
import { readUploadOriginal } from '$lib/server/ingest/ingest';
import { recomputeSummary } from '$lib/server/flights/summary';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { apiEvent, makeClub, sample, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

let club: Club;
beforeAll(async () => {
	club = await makeClub('Upload Club');
});

const sampleCount = async (flightId: string) => (await db.select({ n: count() }).from(samples).where(eq(samples.flightId, flightId)))[0].n;
const dataLines = (buf: Buffer) => buf.toString('utf8').split('\n').filter((l) => l.trim() !== '' && !l.startsWith('#')).length - 1;

describe('good files', () => {
	it('stores a Burndown recorder CSV with every sample, in canonical units, and its figures', async () => {
		const file = sample('kestrel-crosscountry-3leg.csv');
		const res = await upload(club.pilot, { aircraftId: club.tourer.id, file, fileName: 'kestrel-crosscountry-3leg.csv', declaration: 'lower' });
		expect(res.status).toBe(201);
		expect(res.body.outcome).toBe('stored');
		const id = res.body.flightId as string;
		expect(res.body.url).toBe(`/o/${club.slug}/flights/${id}`);

		const rows = dataLines(file);
		expect(res.body.rows).toBe(rows);
		expect(await sampleCount(id)).toBe(rows);
		const f = (await db.select().from(flights).where(eq(flights.id, id)))[0];
		expect(f).toMatchObject({ source: 'upload', status: 'closed', sampleCount: rows, pilotId: club.pilot.id, title: 'kestrel-crosscountry-3leg', declaration: { kind: 'lower' } });
		expect(f.startedAt.toISOString()).toBe('2026-06-20T08:42:00.000Z');
		expect(f.endedAt?.toISOString()).toBe(f.lastSampleAt?.toISOString());
		// The file's own sequence numbers are kept: 100000 onwards.
		expect(f.lastSeq).toBe(100_000 + rows - 1);

		// Line 2 of the file: 2026-06-20T08:42:00Z,0.00,0.0,36.22,CAIRNS,… ; a cruise row converts
		// US gal/h to L/h by 3.785411784 L per gal (NIST Handbook 44, Appendix C).
		const first = (await db.select().from(samples).where(eq(samples.flightId, id)).orderBy(asc(samples.seq)).limit(1))[0];
		expect(first).toMatchObject({ seq: 100_000, flow: 0, gs: 0, dtg: 36.22, wpt: 'CAIRNS', lat: 47.2, lon: -31.4, alt: 240 });
		const line = file.toString('utf8').split('\n')[2000].split(',');
		const stored = (await db.select().from(samples).where(eq(samples.flightId, id)).orderBy(asc(samples.seq)).offset(1999).limit(1))[0];
		expect(stored.t.toISOString().replace('.000Z', 'Z')).toBe(line[0]);
		expect(stored.flow).toBeCloseTo(Number(line[1]) * 3.785411784, 10);

		const summary = f.summary as { fuelUsedL: number; onBoardAtShutdownL: number; gapCount: number };
		expect(summary.gapCount).toBe(2); // the two stops, recorder off
		expect(summary.onBoardAtShutdownL).toBeCloseTo(club.tourer.lowerLevelL! - summary.fuelUsedL, 6);
		expect(summary.fuelUsedL / LITRES_PER_US_GALLON).toBeGreaterThan(15);
	});

	it('gets the fuel used exactly right for a steady flow (trapezoid rule over whole seconds)', async () => {
		// 9.5 US gal/h for exactly one hour is 9.5 US gal = 35.961411948 L (NIST Handbook 44 gallon).
		const file = steadyFile({ start: Date.UTC(2026, 2, 1, 10), seconds: 3600, flowUsgph: 9.5 });
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file, declaration: 'onBoard', amount: '30' });
		expect(res.status).toBe(201);
		const s = res.body.summary as { fuelUsedL: number; onBoardAtShutdownL: number };
		expect(s.fuelUsedL).toBeCloseTo(9.5 * 3.785411784, 9);
		expect(s.onBoardAtShutdownL).toBeCloseTo((30 - 9.5) * 3.785411784, 9);
		const f = (await db.select().from(flights).where(eq(flights.id, res.body.flightId)))[0];
		expect(f.declaration).toEqual({ kind: 'onBoard', amountL: 30 * 3.785411784 });
		// No recorder sequence in the file: the row's place is its number, 0 … 3600.
		expect(f.lastSeq).toBe(3600);
	});

	it('keeps the original bytes exactly, in 1 MiB pieces, under the file’s SHA-256', async () => {
		// Big enough for several pieces, with a BOM and CRLF line ends to make "exactly" mean something.
		const text = '\uFEFF' + steadyFile({ start: Date.UTC(2026, 2, 2, 10), seconds: 40_000, flowUsgph: 8 }).replace(/\n/g, '\r\n');
		const bytes = Buffer.from(text, 'utf8');
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file: bytes, declaration: 'full' });
		expect(res.status).toBe(201);
		const u = (await db.select().from(uploads).where(eq(uploads.id, res.body.uploadId)))[0];
		expect(u.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
		expect(u.sizeBytes).toBe(bytes.length);
		const pieces = await db.select({ n: uploadChunks.n }).from(uploadChunks).where(eq(uploadChunks.uploadId, u.id));
		expect(pieces.length).toBe(Math.ceil(bytes.length / (1 << 20)));
		const back: Buffer[] = [];
		for await (const piece of readUploadOriginal(u.id)) back.push(piece);
		expect(Buffer.concat(back).equals(bytes)).toBe(true);
		expect(await sampleCount(res.body.flightId)).toBe(40_001);
	});

	it('stores every demo file in our format', async () => {
		for (const [name, a] of [
			['kestrel-local-training.csv', club.trainer],
			['kestrel-trainer-merrow-leaned.csv', club.trainer],
			['kestrel-trainer-merrow-rich.csv', club.trainer],
			['kestrel-tourer-dropout.csv', club.tourer]
		] as const) {
			const file = sample(name);
			const res = await upload(club.pilot, { aircraftId: a.id, file, fileName: name, declaration: 'full' });
			expect(res.status, `${name}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(201);
			expect(await sampleCount(res.body.flightId)).toBe(dataLines(file));
		}
		// The summary stored with the upload is the one the replay side computes from the stored rows.
		for (const f of await db.select().from(flights).where(eq(flights.orgId, club.orgId))) {
			const stored = f.summary;
			expect(await recomputeSummary(f.id), f.title).toEqual(stored);
		}
		// The rich flight burnt more than the leaned one over the same route (the demo's point).
		const byTitle = async (t: string) => ((await db.select().from(flights).where(eq(flights.title, t)))[0].summary as { fuelUsedL: number }).fuelUsedL;
		expect(await byTitle('kestrel-trainer-merrow-rich')).toBeGreaterThan(1.2 * (await byTitle('kestrel-trainer-merrow-leaned')));
		// The dropout shows as gaps: the 400 s without samples and the 45 s of blank flow cells.
		const drop = (await db.select().from(flights).where(eq(flights.title, 'kestrel-tourer-dropout')))[0];
		expect((drop.summary as { gapCount: number }).gapCount).toBe(2);
		const blanks = await pool.query('SELECT count(*)::int AS n FROM samples WHERE flight_id = $1 AND flow IS NULL', [drop.id]);
		expect(blanks.rows[0].n).toBe(45);
	});
});

describe('duplicates', () => {
	it('recognises the same file for the same aircraft and points to the existing flight', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 3, 1, 10), seconds: 600, flowUsgph: 7 });
		const first = await upload(club.pilot, { aircraftId: club.trainer.id, file });
		expect(first.status).toBe(201);
		const before = await tableCounts();
		const again = await upload(club.pilot, { aircraftId: club.trainer.id, file, fileName: 'renamed.csv' });
		expect(again.status).toBe(200);
		expect(again.body).toMatchObject({ outcome: 'duplicate', flightId: first.body.flightId, uploadId: first.body.uploadId, url: first.body.url });
		expect(await tableCounts()).toEqual(before);
	});

	it('takes the same file again once its flight was deleted', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 3, 2, 10), seconds: 300, flowUsgph: 7 });
		const first = await upload(club.pilot, { aircraftId: club.trainer.id, file });
		await db.delete(flights).where(eq(flights.id, first.body.flightId));
		const again = await upload(club.pilot, { aircraftId: club.trainer.id, file });
		expect(again.status).toBe(201);
		expect(again.body.flightId).not.toBe(first.body.flightId);
		expect((await db.select({ n: count() }).from(uploads).where(eq(uploads.id, first.body.uploadId)))[0].n).toBe(0);
	});
});

describe('fuel on board before the flight', () => {
	it('moves the aircraft’s last fuel figure only for its newest flight', async () => {
		const c = await makeClub('Fuel Order Club');
		await db.update(aircraft).set({ lastOnBoardL: 100 }).where(eq(aircraft.id, c.trainer.id));
		const newer = await upload(c.pilot, { aircraftId: c.trainer.id, file: steadyFile({ start: Date.UTC(2026, 4, 10, 10), seconds: 1800, flowUsgph: 10 }), declaration: 'unchanged' });
		expect(newer.status).toBe(201);
		const newerFlight = (await db.select().from(flights).where(eq(flights.id, newer.body.flightId)))[0];
		// "Unchanged" for the newest flight starts from the aircraft's figure: 100 L, less 5 US gal.
		expect(newerFlight.previousOnBoardL).toBe(100);
		const after = 100 - 5 * LITRES_PER_US_GALLON;
		expect((newerFlight.summary as { onBoardAtShutdownL: number }).onBoardAtShutdownL).toBeCloseTo(after, 9);
		expect((await db.select().from(aircraft).where(eq(aircraft.id, c.trainer.id)))[0].lastOnBoardL).toBeCloseTo(after, 9);

		// An older flight uploaded afterwards leaves the aircraft's figure alone.
		const older = await upload(c.pilot, { aircraftId: c.trainer.id, file: steadyFile({ start: Date.UTC(2026, 4, 1, 10), seconds: 1800, flowUsgph: 10 }), declaration: 'full' });
		expect(older.status).toBe(201);
		expect((await db.select().from(aircraft).where(eq(aircraft.id, c.trainer.id)))[0].lastOnBoardL).toBeCloseTo(after, 9);

		// A flight between the two, declared "unchanged", starts from the older flight's shutdown fuel.
		const middle = await upload(c.pilot, { aircraftId: c.trainer.id, file: steadyFile({ start: Date.UTC(2026, 4, 5, 10), seconds: 600, flowUsgph: 10 }), declaration: 'unchanged' });
		expect(middle.status).toBe(201);
		const m = (await db.select().from(flights).where(eq(flights.id, middle.body.flightId)))[0];
		expect(m.previousOnBoardL).toBeCloseTo(c.trainer.capacityL - 5 * LITRES_PER_US_GALLON, 9);
		expect((await db.select().from(aircraft).where(eq(aircraft.id, c.trainer.id)))[0].lastOnBoardL).toBeCloseTo(after, 9);
	});
});

describe('script paths', () => {
	it('takes the raw file as text/csv with the fields in the query string', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 3, 5, 10), seconds: 120, flowUsgph: 6 });
		const url = `http://127.0.0.1:4173/api/v1/flights?aircraftId=${club.trainer.id}&declaration=onBoard&amount=${encodeURIComponent('20,5')}&fileName=raw.csv`;
		const res = await POST(apiEvent(new Request(url, { method: 'POST', body: file, headers: { 'content-type': 'text/csv' } }), club.pilot) as never);
		expect(res.status).toBe(201);
		const body = await res.json();
		const f = (await db.select().from(flights).where(eq(flights.id, body.flightId)))[0];
		expect(f.title).toBe('raw');
		// A decimal comma in the amount is read as 20.5 US gal (the aircraft's display unit).
		expect(f.declaration).toEqual({ kind: 'onBoard', amountL: 20.5 * 3.785411784 });
	});

	it('streams progress lines, then the result, to a client that asks for NDJSON', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 3, 6, 10), seconds: 20_000, flowUsgph: 6 });
		const { multipartRequest } = await import('./upload-fixture');
		const res = await POST(apiEvent(multipartRequest({ aircraftId: club.trainer.id, file, accept: 'application/x-ndjson' }), club.pilot) as never);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/x-ndjson');
		const lines = (await res.text()).trim().split('\n').map((l) => JSON.parse(l));
		const last = lines.at(-1);
		expect(last).toMatchObject({ kind: 'result', httpStatus: 201, answer: { outcome: 'stored', rows: 20_001 } });
		const progress = lines.filter((l) => l.kind === 'progress').map((l) => l.progress);
		const reading = progress.filter((p) => p.phase === 'reading');
		expect(reading.length).toBeGreaterThan(0);
		expect(reading.at(-1)).toMatchObject({ bytes: Buffer.byteLength(file), rows: 20_001 });
		expect(progress.filter((p) => p.phase === 'storing').map((p) => p.step)).toEqual(['checks', 'summary', 'original', 'flight', 'commit']);
	});
	it('stores the history figures per flight and phase with the upload, from its own summary', async () => {
		const file = steadyFile({ start: Date.UTC(2026, 3, 8, 10), seconds: 3600, flowUsgph: 6 });
		const res = await upload(club.pilot, { aircraftId: club.trainer.id, file });
		expect(res.status).toBe(201);
		const [f] = await db.select({ id: flights.id, summary: flights.summary }).from(flights).where(eq(flights.id, res.body.flightId));
		const summary = f.summary as { fuelUsedL: number; engineTimeS: number; phases: { name: string; fuelL: number }[] };
		const [fig] = await db.select().from(flightFigures).where(eq(flightFigures.flightId, f.id));
		expect(fig.fuelUsedL).toBeCloseTo(summary.fuelUsedL, 9);
		expect(fig.engineTimeS).toBeCloseTo(summary.engineTimeS, 9);
		const phases = await db.select().from(flightPhaseFigures).where(eq(flightPhaseFigures.flightId, f.id));
		expect(phases.map((p) => p.phase).sort()).toEqual(summary.phases.map((p) => p.name).sort());
	});
});
