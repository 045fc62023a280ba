// Flights stored by an older derivation are brought up to date at start: every closed flight whose
// derived_version is below DERIVED_VERSION gets its summary and history figures recomputed from
// its samples, once; flights already current and open flights are left alone.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, flightFigures, flights, organisations, users } from '$lib/server/db/schema';
import { loadFlight } from '$lib/server/flights/load';
import { refreshStaleFlights } from '$lib/server/flights/refresh';
import { computeLoaded, DERIVED_VERSION, recomputeSummary } from '$lib/server/flights/summary';
import { LITRES_PER_US_GALLON } from '$lib/units';
import type { FlightSummary } from '$lib/fuel';
import { generateFlight, insertFlight } from './replay-fixture';

const stamp = Date.now().toString(36);
const plain = <T>(x: T): T => JSON.parse(JSON.stringify(x));
let neverComputed = '';
let olderVersion = '';
let current = '';
let open = '';

async function row(id: string) {
	const [r] = await db.select({ summary: flights.summary, derivedVersion: flights.derivedVersion }).from(flights).where(eq(flights.id, id));
	return r;
}

beforeAll(async () => {
	const pilotId = `rd-pilot-${stamp}`;
	await db.insert(users).values({ id: pilotId, email: `pilot-${stamp}@refresh.example`, name: 'Rae Refresh', passwordHash: 'not-a-real-hash' });
	const [org] = await db.insert(organisations).values({ name: 'Refresh Flying Group', slug: `refresh-${stamp}` }).returning();
	const [a] = await db
		.insert(aircraft)
		.values({
			orgId: org.id,
			registration: 'RD-ONE',
			type: 'Four-seat trainer',
			fuelType: 'avgas',
			densityKgPerL: 0.719,
			// 40 US gal usable; 1 US gal = 3.785411784 L (NIST Handbook 44, Appendix C).
			capacityL: 40 * LITRES_PER_US_GALLON,
			displayUnit: 'usgal',
			reserveRule: 'faa-91.151-vfr-day',
			baselineCruiseLph: 31
		})
		.returning();
	const f = (day: number) => generateFlight({ start: Date.UTC(2025, 6, day, 9, 0, 0) / 1000, cruiseS: 1500 });
	const base = { orgId: org.id, aircraftId: a.id, pilotId, declaration: { kind: 'full' as const } };
	// Stored before there were stored figures at all (summary null, version 0).
	neverComputed = await insertFlight(pool, base, f(1));
	// Stored by an older derivation: its figures differ from what the engine now gives.
	olderVersion = await insertFlight(pool, base, f(2));
	await recomputeSummary(olderVersion);
	const [o] = await db.select({ summary: flights.summary }).from(flights).where(eq(flights.id, olderVersion));
	await db
		.update(flights)
		.set({ summary: { ...o.summary!, fuelUsedL: 1 }, derivedVersion: DERIVED_VERSION - 1 })
		.where(eq(flights.id, olderVersion));
	// Current: marked so that a needless recompute would show.
	current = await insertFlight(pool, base, f(3));
	await recomputeSummary(current);
	const [c] = await db.select({ summary: flights.summary }).from(flights).where(eq(flights.id, current));
	// A field no derivation writes: a needless recompute would drop it.
	await db.update(flights).set({ summary: { ...c.summary!, marker: 'left alone' } as FlightSummary }).where(eq(flights.id, current));
	// Open: its figures are live, none are stored.
	open = await insertFlight(pool, base, f(4));
	await db.update(flights).set({ status: 'open', source: 'live' }).where(eq(flights.id, open));
});

describe('stored figures written by an older derivation', () => {
	it('are recomputed once, for closed flights below the current version only', async () => {
		expect(await refreshStaleFlights()).toBe(2);
		for (const id of [neverComputed, olderVersion]) {
			const r = await row(id);
			expect(r.derivedVersion).toBe(DERIVED_VERSION);
			expect(plain(r.summary)).toEqual(plain(computeLoaded((await loadFlight(id))!).summary));
			const figures = await db.select().from(flightFigures).where(eq(flightFigures.flightId, id));
			expect(figures).toHaveLength(1);
		}
		expect((await row(olderVersion)).summary).not.toMatchObject({ fuelUsedL: 1 });
		expect((await row(current)).summary).toMatchObject({ marker: 'left alone' });
		const o = await row(open);
		expect(o.summary).toBeNull();
		expect(o.derivedVersion).toBe(0);
	});

	it('a second run finds nothing to do', async () => {
		expect(await refreshStaleFlights()).toBe(0);
	});
});
