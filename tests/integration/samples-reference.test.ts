// samples.flight_id is checked by statement-level triggers instead of a foreign key (migration
// 0002): a sample of a flight that does not exist is refused, and deleting a flight takes its
// samples with it, exactly as the foreign key did.
import { describe, expect, it } from 'vitest';
import { count, eq, sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { aircraft, flights, organisations, samples } from '$lib/server/db/schema';

async function aFlight() {
	const [org] = await db.insert(organisations).values({ name: 'Reference Test', slug: `ref-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}` }).returning();
	const [a] = await db
		.insert(aircraft)
		.values({ orgId: org.id, registration: 'RF-ONE', type: 'Trainer', fuelType: 'avgas', densityKgPerL: 0.72, capacityL: 150, displayUnit: 'l', reserveRule: 'faa-91.151-vfr-day' })
		.returning();
	const [f] = await db
		.insert(flights)
		.values({ orgId: org.id, aircraftId: a.id, source: 'upload', status: 'closed', startedAt: new Date(), declaration: { kind: 'full' } })
		.returning();
	return f.id;
}

/** The database's own error behind Drizzle's "Failed query" wrapper. */
const refusal = (run: Promise<unknown>) => run.then(() => null, (e: Error & { cause?: { message: string; code?: string } }) => e.cause ?? e);

const sampleCount = async (flightId: string) => (await db.select({ n: count() }).from(samples).where(eq(samples.flightId, flightId)))[0].n;

describe('samples refer to their flight', () => {
	it('stores samples of an existing flight', async () => {
		const id = await aFlight();
		await db.insert(samples).values([0, 1, 2].map((seq) => ({ flightId: id, seq, t: new Date(1_780_000_000_000 + seq * 1000), flow: 30 })));
		expect(await sampleCount(id)).toBe(3);
	});

	it('refuses samples of a flight that does not exist, storing none of the statement', async () => {
		const id = await aFlight();
		const ghost = '00000000-0000-4000-8000-000000000000';
		const e = await refusal(
			db.insert(samples).values([
				{ flightId: id, seq: 0, t: new Date(), flow: 30 },
				{ flightId: ghost, seq: 0, t: new Date(), flow: 30 }
			])
		);
		expect(e).toMatchObject({ code: '23503', message: `samples refer to flight ${ghost} that does not exist` });
		expect(await sampleCount(id)).toBe(0);
	});

	it('refuses moving samples to a flight that does not exist', async () => {
		const id = await aFlight();
		await db.insert(samples).values({ flightId: id, seq: 0, t: new Date(), flow: 30 });
		const e = await refusal(db.update(samples).set({ flightId: '00000000-0000-4000-8000-000000000001' }).where(eq(samples.flightId, id)));
		expect(e).toMatchObject({ code: '23503', message: expect.stringContaining('does not exist') });
		expect(await sampleCount(id)).toBe(1);
	});

	it('deletes a flight’s samples with the flight, and leaves other flights’ samples', async () => {
		const [gone, kept] = [await aFlight(), await aFlight()];
		for (const id of [gone, kept]) await db.insert(samples).values([0, 1].map((seq) => ({ flightId: id, seq, t: new Date(1_780_000_000_000 + seq * 1000), flow: 30 })));
		await db.delete(flights).where(eq(flights.id, gone));
		expect(await sampleCount(gone)).toBe(0);
		expect(await sampleCount(kept)).toBe(2);
	});

	it('keeps a flight id fixed', async () => {
		const id = await aFlight();
		expect(await refusal(db.execute(sql`update flights set id = gen_random_uuid() where id = ${id}`))).toMatchObject({ message: 'a flight id cannot change' });
		// Other columns still change as before.
		await db.update(flights).set({ title: 'renamed' }).where(eq(flights.id, id));
		expect((await db.query.flights.findFirst({ where: eq(flights.id, id) }))?.title).toBe('renamed');
	});
});
