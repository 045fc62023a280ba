// Uploads under a crowd, against the real handler and database: slow uploads in flight while the
// rest of the app keeps answering (they must hold no database connection), the limits on uploads
// in progress per account and per organisation, bodies that stall or trickle, and parallel
// uploads to one aircraft (same file, different files, overlapping files), which must never
// deadlock or answer 500.
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { flights, memberships, uploads } from '$lib/server/db/schema';
import type { AuthUser } from '$lib/server/auth';
import { POST } from '../../src/routes/api/v1/flights/+server';
import { GET as samplesGET } from '../../src/routes/api/v1/flights/[id]/samples/+server';
import { GET as exportGET } from '../../src/routes/api/v1/flights/[id]/export/+server';
import { apiEvent, makeClub, makeUser, multipartRequest, steadyFile, tableCounts, upload, type Club } from './upload-fixture';

const env = { ...process.env };
afterEach(() => {
	for (const k of Object.keys(process.env)) if (k.startsWith('UPLOAD_')) delete process.env[k];
	Object.assign(process.env, Object.fromEntries(Object.entries(env).filter(([k]) => k.startsWith('UPLOAD_'))));
});

const hour = (day: number, h: number) => Date.UTC(2026, 6, day, h);

async function addPilot(club: Club, name: string): Promise<AuthUser> {
	const u = await makeUser(name);
	await db.insert(memberships).values({ orgId: club.orgId, userId: u.id, role: 'pilot' });
	return u;
}

/** An upload whose body the test sends slowly: the fields and the first lines, then a line at a time until released. */
function slowUpload(user: AuthUser, aircraftId: string, file: string) {
	const bytes = new TextEncoder().encode(file);
	const template = multipartRequest({ aircraftId, file: bytes });
	let isReleased = false;
	let release!: () => void;
	const released = new Promise<void>((r) => (release = () => ((isReleased = true), r())));
	const state = { pulls: 0 };
	const whole = template.arrayBuffer().then((b) => new Uint8Array(b));
	let at = 0;
	const body = new ReadableStream<Uint8Array>({
		async pull(controller) {
			const all = await whole;
			state.pulls++;
			// The fields, the file's headers and a few lines at once; then 64 bytes per 50 ms until released.
			const size = at === 0 ? 1200 : 64;
			if (at > 0) await Promise.race([released, new Promise((r) => setTimeout(r, 50))]);
			let end = Math.min(all.length, at + size);
			// Once released, the rest at once.
			if (isReleased) end = all.length;
			controller.enqueue(all.slice(at, end));
			at = end;
			if (at >= all.length) controller.close();
		}
	});
	const req = new Request(template.url, { method: 'POST', body, headers: { 'content-type': template.headers.get('content-type')! }, duplex: 'half' } as RequestInit);
	const answer = Promise.resolve(POST(apiEvent(req, user) as never)).then(async (res: Response) => ({ status: res.status, body: await res.json() }));
	return { state, release, answer };
}

function getEvent(user: AuthUser, url: string, id: string) {
	const e = apiEvent(new Request(url), user) as unknown as { params: Record<string, string> };
	e.params = { id };
	return e as never;
}

describe('slow uploads do not starve the app', () => {
	it('twelve uploads trickling in hold no connection: pages and the API keep answering, and the uploads are stored when they end', async () => {
		process.env.UPLOAD_MAX_TOTAL = '13';
		// The minimum-rate rule is the next test's: here the trickle must live as long as the test does.
		process.env.UPLOAD_MIN_RATE_AFTER_S = '600';
		const clubs = [await makeClub('Slow A'), await makeClub('Slow B'), await makeClub('Slow C')];
		// Another club using the app meanwhile, with a stored flight to look at.
		const other = await makeClub('Busy Neighbours');
		const stored = await upload(other.pilot, { aircraftId: other.trainer.id, file: steadyFile({ start: hour(1, 9), seconds: 600, flowUsgph: 8 }) });
		expect(stored.status).toBe(201);
		const flightId = stored.body.flightId as string;

		const slow: ReturnType<typeof slowUpload>[] = [];
		let day = 2;
		for (const club of clubs) {
			const second = await addPilot(club, 'Second Pilot');
			for (const [user, aircraftId] of [
				[club.pilot, club.trainer.id],
				[club.pilot, club.tourer.id],
				[second, club.diesel.id],
				[second, club.trainer.id]
			] as const)
				slow.push(slowUpload(user, aircraftId, steadyFile({ start: hour(day++, 9), seconds: 1200, flowUsgph: 8 })));
		}
		// Every slow body has been read past its fields (polling, not timing: the loop ends as soon as it is so).
		// On a loaded machine (the whole suite, other work) this can take seconds: wait, then say so if not.
		for (let i = 0; i < 1200 && slow.some((s) => s.state.pulls < 3); i++) await new Promise((r) => setTimeout(r, 50));
		expect(slow.filter((s) => s.state.pulls < 3).length, 'slow uploads not yet past their fields').toBe(0);

		// More than the per-account and per-organisation limits: refused at once with what and why.
		const third = await upload(clubs[0].pilot, { aircraftId: clubs[0].trainer.id, file: steadyFile({ start: hour(20, 9), seconds: 60, flowUsgph: 8 }) });
		expect(third.status).toBe(429);
		expect(third.body).toMatchObject({ outcome: 'busy', status: 429, type: '/api-docs#problem-busy' });
		expect(third.body.detail).toMatch(/You already have 2 uploads in progress/);
		const thirdPilot = await addPilot(clubs[1], 'Third Pilot');
		const orgFull = await upload(thirdPilot, { aircraftId: clubs[1].trainer.id, file: steadyFile({ start: hour(21, 9), seconds: 60, flowUsgph: 8 }) });
		expect(orgFull.status).toBe(429);
		expect(orgFull.body.detail).toMatch(/Your organisation already has 4 uploads in progress/);

		// While all twelve are open: the API and plain queries answer (they would wait for ever if the uploads held the pool).
		const base = `http://127.0.0.1:4173/api/v1/flights/${flightId}`;
		const answers = await Promise.all([
			...Array.from({ length: 6 }, async () => (await samplesGET(getEvent(other.pilot, `${base}/samples`, flightId))).status),
			...Array.from({ length: 6 }, async () => (await exportGET(getEvent(other.viewer, `${base}/export?what=summary`, flightId))).status),
			...Array.from({ length: 12 }, () => db.select({ n: sql<number>`count(*)::int` }).from(flights).then(() => 200))
		]);
		expect(answers).toEqual(Array(24).fill(200));
		expect(slow.every((s) => s.state.pulls >= 3)).toBe(true);
		// An upload of the neighbours is not held up by the others' slow ones either.
		const neighbour = await upload(other.pilot, { aircraftId: other.tourer.id, file: steadyFile({ start: hour(22, 9), seconds: 60, flowUsgph: 8 }) });
		expect(neighbour.status).toBe(201);

		for (const s of slow) s.release();
		const results = await Promise.all(slow.map((s) => s.answer));
		expect(results.map((r) => r.status)).toEqual(Array(12).fill(201));
	}, 120_000);

	it('stops a body that stalls, and one that trickles below the minimum rate, with 408 and nothing stored', async () => {
		const club = await makeClub('Stall Club');
		const before = await tableCounts();
		process.env.UPLOAD_IDLE_TIMEOUT_S = '0.3';
		const steady = slowUpload(club.pilot, club.trainer.id, steadyFile({ start: hour(3, 9), seconds: 600, flowUsgph: 8 }));
		// That one keeps sending every 50 ms and lives on; this one stops after its first piece.
		const stalledReq = (() => {
			const bytes = new TextEncoder().encode(steadyFile({ start: hour(4, 9), seconds: 600, flowUsgph: 8 }));
			const template = multipartRequest({ aircraftId: club.trainer.id, file: bytes });
			let sent = false;
			const body = new ReadableStream<Uint8Array>({
				async pull(controller) {
					const all = new Uint8Array(await template.clone().arrayBuffer());
					if (!sent) {
						sent = true;
						controller.enqueue(all.slice(0, 2000));
					}
					// …and then nothing, without closing.
					await new Promise(() => {});
				}
			});
			return new Request(template.url, { method: 'POST', body, headers: { 'content-type': template.headers.get('content-type')! }, duplex: 'half' } as RequestInit);
		})();
		const res = await POST(apiEvent(stalledReq, club.pilot) as never);
		expect(res.status).toBe(408);
		const body = await res.json();
		expect(body).toMatchObject({ outcome: 'timeout', status: 408, field: 'file' });
		expect(body.detail).toMatch(/No data arrived for 0.3 s/);
		steady.release();
		expect((await steady.answer).status).toBe(201);

		delete process.env.UPLOAD_IDLE_TIMEOUT_S;
		process.env.UPLOAD_MIN_BYTES_PER_S = '100000';
		process.env.UPLOAD_MIN_RATE_AFTER_S = '0.2';
		const trickle = slowUpload(club.pilot, club.tourer.id, steadyFile({ start: hour(5, 9), seconds: 600, flowUsgph: 8 }));
		const slowAnswer = await trickle.answer;
		expect(slowAnswer.status).toBe(408);
		expect(slowAnswer.body.detail).toMatch(/arrived too slowly .* at least 100000 needed/);
		trickle.release();
		// Only the one good upload above was stored.
		const after = await tableCounts();
		expect(after.flights - before.flights).toBe(1);
		expect(after.uploads - before.uploads).toBe(1);
	}, 30_000);
});

describe('parallel uploads to one aircraft', () => {
	it('never deadlock or answer 500: one flight per distinct file, the rest duplicate or overlap', async () => {
		// Let them all reach the database together, where they used to deadlock.
		process.env.UPLOAD_MAX_PER_ACCOUNT = '50';
		process.env.UPLOAD_MAX_PER_ORG = '50';
		process.env.UPLOAD_MAX_TOTAL = '50';
		process.env.UPLOAD_DB_CONNECTIONS = '8';
		const club = await makeClub('Race Club');
		const files = [0, 1, 2, 3].map((i) => steadyFile({ start: hour(10 + i, 9), seconds: 3000, flowUsgph: 8 }));
		// Overlaps the first file by half an hour, without being the same file.
		const overlapping = steadyFile({ start: hour(10, 9) + 1800_000, seconds: 3000, flowUsgph: 9 });
		const send = (file: string) =>
			upload(club.pilot, { aircraftId: club.trainer.id, file }).catch((e: unknown) => ({ status: 500, body: { detail: String(e) } }));
		const jobs = [
			...Array.from({ length: 4 }, () => send(files[0])),
			...files.slice(1).flatMap((f) => [send(f), send(f)]),
			send(overlapping)
		];
		const results = await Promise.all(jobs);
		for (const r of results) {
			expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBeLessThan(500);
			expect([200, 201, 409]).toContain(r.status);
		}
		const stored = await db.select({ sha256: uploads.sha256 }).from(uploads).innerJoin(flights, eq(flights.uploadId, uploads.id)).where(eq(flights.aircraftId, club.trainer.id));
		const shas = stored.map((s) => s.sha256);
		// Exactly one flight per distinct file; the overlapping one and the first file: one of the two.
		expect(new Set(shas).size).toBe(shas.length);
		expect(shas.length).toBe(4);
		expect(results.filter((r) => r.status === 201)).toHaveLength(4);
		expect(results.filter((r) => r.status === 200).every((r) => r.body.outcome === 'duplicate')).toBe(true);
		const conflicts = results.filter((r) => r.status === 409);
		expect(conflicts.length).toBeGreaterThanOrEqual(1);
		for (const c of conflicts) expect(c.body.detail).toMatch(/overlaps another flight of BD-TST/);
	}, 60_000);
});
