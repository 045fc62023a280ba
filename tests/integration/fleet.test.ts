// The fleet view: one calendar month (UTC) of every aircraft side by side, from the stored
// per-flight figures. Flights are flown at a steady flow, so each figure has a closed form: fuel
// used = flow × engine time × meter factor (the integral of a constant; the trapezoid rule is exact
// for it), and the month's fuel per engine hour = Σ fuel ÷ Σ time.
import { beforeAll, describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db, pool } from '$lib/server/db';
import { aircraft, memberships, organisations, pumpReceipts, users } from '$lib/server/db/schema';
import { fleetView } from '$lib/server/aircraft/fleet';
import { writeEntry } from '$lib/server/calibration/factors';
import { recomputeSummary } from '$lib/server/flights/summary';
import { fleetQuerySchema } from '$lib/schemas/fleet';
import type { FleetRow } from '$lib/wire/fleet';
import { load } from '../../src/routes/o/[org]/aircraft/+page.server';
import { insertFlight, type FixtureSamples } from './replay-fixture';
import { routeEvent } from './route-event';

const stamp = Date.now().toString(36);
const person = (key: string, name: string) => ({ id: `fl-${key}-${stamp}`, email: `${key}-${stamp}@fleet.example`, name, prefFuelUnit: null, timeZone: null });
const U = { admin: person('admin', 'Ada Admin'), pilot: person('pilot', 'Pia Pilot'), other: person('other', 'Otto Other'), viewer: person('viewer', 'Vic Viewer') };

let orgId = '';
let slug = '';
const ac = { a: '', b: '' };
const at = (month: number, d: number, h = 9, min = 0) => Date.UTC(2025, month - 1, d, h, min) / 1000;

/** A steady cruise: `seconds` of engine time at `flowLph`, level at 3,000 ft and 100 kt. */
function steady(start: number, seconds: number, flowLph: number): FixtureSamples {
	const n = seconds + 1;
	const s: FixtureSamples = { t: new Float64Array(n), flow: new Float64Array(n), gs: new Float64Array(n), dtg: new Float64Array(n), alt: new Float64Array(n), wpt: new Array(n).fill(null) };
	for (let i = 0; i < n; i++) {
		s.t[i] = start + i;
		s.flow[i] = flowLph;
		s.gs[i] = 100;
		s.dtg[i] = Math.max(0, 200 - (100 * i) / 3600);
		s.alt[i] = 3000;
	}
	return s;
}

async function fly(aircraftId: string, pilotId: string, start: number, seconds: number, flowLph: number, title: string): Promise<string> {
	const id = await insertFlight(pool, { orgId, aircraftId, pilotId, title, declaration: { kind: 'full' } }, steady(start, seconds, flowLph));
	await recomputeSummary(id);
	return id;
}

const view = async (role: 'admin' | 'pilot' | 'viewer', userId: string, month: string) => fleetView({ orgId, userId, role }, fleetQuerySchema().parse({ month }));
const rowOf = (rows: FleetRow[], id: string) => rows.find((r) => r.id === id)!;

beforeAll(async () => {
	await db.insert(users).values(Object.values(U).map((u) => ({ id: u.id, email: u.email, name: u.name, passwordHash: 'not-a-real-hash' })));
	const [org] = await db.insert(organisations).values({ name: 'Fleet Moor Flying Group', slug: `fleet-${stamp}` }).returning();
	const [foreign] = await db.insert(organisations).values({ name: 'Elsewhere Group', slug: `else-${stamp}` }).returning();
	orgId = org.id;
	slug = org.slug;
	await db.insert(memberships).values([
		{ orgId, userId: U.admin.id, role: 'admin' },
		{ orgId, userId: U.pilot.id, role: 'pilot' },
		{ orgId, userId: U.viewer.id, role: 'viewer' },
		{ orgId: foreign.id, userId: U.other.id, role: 'admin' }
	]);
	const base = { type: 'Trainer', fuelType: 'avgas' as const, densityKgPerL: 0.719, capacityL: 200, displayUnit: 'l' as const, reserveRule: 'easa-nco.op.125-vfr-day' as const };
	const [a, b] = await db
		.insert(aircraft)
		.values([
			{ orgId, registration: 'FL-AAA', ...base },
			{ orgId, registration: 'FL-BBB', ...base, kFactor: 68_000 }
		])
		.returning();
	await db.insert(aircraft).values({ orgId: foreign.id, registration: 'EL-SEW', ...base });
	ac.a = a.id;
	ac.b = b.id;
	// Four usual flights in February (1 h at 30 L/h), then March: 1 h at 30 L/h (the pilot's),
	// 1 h 30 min at 40 L/h (the admin's, a third over usual), one the minute before March began
	// and one at the first instant of April (neither counts in March).
	for (let d = 1; d <= 4; d++) await fly(a.id, U.admin.id, at(2, d), 3600, 30, `usual ${d}`);
	await fly(a.id, U.admin.id, at(2, 28, 23, 59), 3600, 30, 'into March');
	await fly(a.id, U.pilot.id, at(3, 10), 3600, 30, 'March usual');
	await fly(a.id, U.admin.id, at(3, 20), 5400, 40, 'March rich');
	await fly(a.id, U.admin.id, at(4, 1, 0, 0), 3600, 30, 'April');
	// Two fills to full make a reconciliation of FL-AAA; FL-BBB gets a calibration entry by hand.
	await db.insert(pumpReceipts).values([
		{ aircraftId: a.id, at: new Date(at(3, 1) * 1000), amount: 100, unit: 'l', amountL: 100, filledToFull: true },
		{ aircraftId: a.id, at: new Date(at(3, 25) * 1000), amount: 90, unit: 'l', amountL: 90, filledToFull: true },
		{ aircraftId: b.id, at: new Date(at(3, 2) * 1000), amount: 50, unit: 'l', amountL: 50, filledToFull: true }
	]);
	const w = await writeEntry(b, { source: 'hand', inForceFrom: new Date(at(1, 1) * 1000), factors: { meterFactor: 1.05, kFactor: 64_761.9 } }, U.admin.id);
	if (!w.ok) throw new Error(w.message);
});

describe('fleet view', () => {
	it("adds up the month's hours and fuel, places fuel per engine hour in the usual band, and counts the flights marked", async () => {
		const v = await view('admin', U.admin.id, '2025-03');
		expect(v.rows.map((r) => r.registration)).toEqual(['FL-AAA', 'FL-BBB']);
		const a = rowOf(v.rows, ac.a);
		expect(a.month.flights).toBe(2);
		// 1 h + 1.5 h; 30 L/h × 1 h + 40 L/h × 1.5 h = 90 L (integral of a constant flow).
		expect(a.month.engineTimeS).toBeCloseTo(9000, 6);
		expect(a.month.fuelUsedL).toBeCloseTo(90, 6);
		expect(a.month.fuelPerEngineHourLph).toBeCloseTo(36, 6);
		// Eight flights at 30, 30, …, 40 L/h: median 30, median absolute deviation 0 → band 30–30.
		expect(a.usual?.centreLph).toBeCloseTo(30, 6);
		expect(a.usual?.highLph).toBeCloseTo(30, 6);
		expect(a.usual?.flights).toBe(8);
		expect(a.position).toBe('above');
		// 40 against a usual cruise of 30 L/h: 33 % over our 10 % default marks it; 30 does not.
		expect(a.month.highBurnFlights).toBe(1);
		expect(a.meterFactor).toBe(1);
		expect(a.lastChecked).toEqual({ at: new Date(at(3, 25) * 1000), by: 'reconciliation' });

		const b = rowOf(v.rows, ac.b);
		expect(b.month).toEqual({ flights: 0, engineTimeS: 0, fuelUsedL: 0, fuelPerEngineHourLph: null, highBurnFlights: 0 });
		expect(b.usual).toBeNull();
		expect(b.position).toBeNull();
		// One fill to full is no reconciliation; the hand entry is the check.
		expect(b.meterFactor).toBe(1.05);
		expect(b.kFactor).toBe(64_761.9);
		expect(b.lastChecked?.by).toBe('calibration');
	});

	it('names the month of the newest flight, so an empty month can point to it', async () => {
		const empty = await view('admin', U.admin.id, '2025-09');
		expect(empty.rows.every((r) => r.month.flights === 0)).toBe(true);
		expect(empty.latestFlightMonth).toBe('2025-04');
	});

	it('counts a flight in the month of its engine start, in UTC', async () => {
		const feb = rowOf((await view('admin', U.admin.id, '2025-02')).rows, ac.a);
		expect(feb.month.flights).toBe(5);
		expect(feb.month.fuelUsedL).toBeCloseTo(150, 6);
		const apr = rowOf((await view('admin', U.admin.id, '2025-04')).rows, ac.a);
		expect(apr.month.flights).toBe(1);
		expect(apr.month.fuelPerEngineHourLph).toBeCloseTo(30, 6);
		expect(apr.position).toBe('within');
	});

	it("follows a new meter factor: the month's fuel is recomputed with it", async () => {
		const [a] = await db.select().from(aircraft).where(eq(aircraft.id, ac.a));
		const w = await writeEntry(a, { source: 'hand', inForceFrom: new Date(at(3, 15) * 1000), factors: { meterFactor: 1.1, kFactor: null } }, U.admin.id);
		expect(w.ok && w.range.flights).toBe(2);
		const row = rowOf((await view('admin', U.admin.id, '2025-03')).rows, ac.a);
		// 30 L from before the factor, 60 L × 1.1 after it.
		expect(row.month.fuelUsedL).toBeCloseTo(30 + 66, 6);
		expect(row.meterFactor).toBe(1.1);
		expect(row.lastChecked?.by).toBe('calibration');
	});

	it('shows a pilot only their own flights, and the page to every member including the maintenance viewer', async () => {
		const mine = rowOf((await view('pilot', U.pilot.id, '2025-03')).rows, ac.a);
		expect(mine.month.flights).toBe(1);
		expect(mine.month.fuelUsedL).toBeCloseTo(30, 6);
		const page = (await load(routeEvent(U.viewer, '/o/[org]/aircraft', { org: slug }, undefined, '?month=2025-03') as never)) as unknown as { fleet: { month: string; allFlights: boolean; rows: FleetRow[] } };
		expect(page.fleet.month).toBe('2025-03');
		expect(page.fleet.allFlights).toBe(true);
		expect(rowOf(page.fleet.rows, ac.a).month.flights).toBe(2);
		// A bad month falls back to the current one rather than failing.
		const lenient = (await load(routeEvent(U.viewer, '/o/[org]/aircraft', { org: slug }, undefined, '?month=2025-13') as never)) as unknown as { fleet: { month: string } };
		expect(lenient.fleet.month).toBe(new Date().toISOString().slice(0, 7));
		const outsider = await Promise.resolve(load(routeEvent(U.other, '/o/[org]/aircraft', { org: slug }) as never)).catch((e) => e);
		expect(isHttpError(outsider) && outsider.status).toBe(404);
	});
});
