// Demo data from an invented scenario: Kestrel Field Flying Club (fictional), its three aircraft,
// a member for every role, a recorder with a known demo token, and flights from samples/.
// Loads only into an empty database; always prints the demo sign-ins and a simulator command.
import { and, count, eq, gte, lt, sql } from 'drizzle-orm';
import { closeDb, db } from '../src/lib/server/db';
import { aircraft, flightFigures, flights as flightsTable, memberships, organisations, pumpReceipts, recorders, users, watches } from '../src/lib/server/db/schema';
import { hashPassword } from '../src/lib/server/auth';
import { hashToken } from '../src/lib/server/tokens';
import { fromLitres, toLitres, defaultDensityKgPerL } from '../src/lib/units';
import { DEMO } from './demo-scenario';
import { loadDemoFlights } from './demo-flights';

async function isEmpty(): Promise<boolean> {
	const [{ n }] = await db.select({ n: count() }).from(users);
	return n === 0;
}

async function load(): Promise<void> {
	const passwordHash = await hashPassword(DEMO.password);
	await db.transaction(async (tx) => {
		for (const u of DEMO.users) await tx.insert(users).values({ id: u.id, email: u.email, name: u.name, passwordHash });
		for (const o of DEMO.organisations) {
			await tx.insert(organisations).values({ id: o.id, name: o.name, slug: o.slug });
			for (const [userId, role] of o.members) await tx.insert(memberships).values({ orgId: o.id, userId, role });
		}
		for (const a of DEMO.aircraft) {
			const density = defaultDensityKgPerL(a.fuelType);
			const L = (x: number | null) => (x === null ? null : toLitres(x, a.displayUnit, density));
			await tx.insert(aircraft).values({
				id: a.id,
				orgId: a.orgId,
				registration: a.registration,
				type: a.type,
				engine: a.engine,
				fuelType: a.fuelType,
				densityKgPerL: density,
				displayUnit: a.displayUnit,
				capacityL: L(a.capacity)!,
				lowerLevelL: L(a.lowerLevel),
				unusableL: L(a.unusable) ?? 0,
				meterFactor: a.meterFactor,
				kFactor: a.kFactor,
				lowFuelL: L(a.lowFuel),
				lowEnduranceMin: a.lowEnduranceMin,
				reserveRule: a.reserveRule,
				baselineCruiseLph: L(a.baselineCruise),
				lastOnBoardL: L(a.lastOnBoard)
			});
		}
		for (const r of DEMO.recorders) {
			await tx.insert(recorders).values({ id: r.id, orgId: r.orgId, aircraftId: r.aircraftId, name: r.name, tokenHash: hashToken(r.token), tokenHint: r.token.slice(0, 12) });
		}
		for (const w of DEMO.watches) await tx.insert(watches).values(w);
	});
	const flights = await loadDemoFlights();
	await seedPumpReceipts();
	console.log(`seed: loaded ${DEMO.users.length} users, ${DEMO.aircraft.length} aircraft, ${flights} flights`);
}

/**
 * The trainer's pump receipts (invented): filled to full before the leaned Merrow trip, a top-up
 * between, full again after the rich one, the pump giving 6 % more than Burndown computed for the
 * two flights in between, so the owner finds a reconciliation to look at on the first start.
 */
async function seedPumpReceipts(): Promise<void> {
	const a = await db.query.aircraft.findFirst({ where: eq(aircraft.registration, 'BD-KTR') });
	if (!a) return;
	const first = new Date('2026-06-27T12:30:00Z');
	const second = new Date('2026-07-05T09:00:00Z');
	const [{ computed }] = await db
		.select({ computed: sql<number>`coalesce(sum(${flightFigures.fuelUsedL}), 0)::float8` })
		.from(flightsTable)
		.innerJoin(flightFigures, eq(flightFigures.flightId, flightsTable.id))
		.where(and(eq(flightsTable.aircraftId, a.id), gte(flightsTable.startedAt, first), lt(flightsTable.startedAt, second)));
	const gal = (l: number) => Math.round(fromLitres(l, 'usgal', a.densityKgPerL) * 10) / 10;
	const topUp = 8;
	const rest = Math.max(1, Math.round((gal(computed * 1.06) - topUp) * 10) / 10);
	const receipt = (at: Date, amount: number, filledToFull: boolean, note: string) => ({
		aircraftId: a.id,
		at,
		airfield: 'Kestrel Field',
		amount,
		unit: 'usgal' as const,
		amountL: toLitres(amount, 'usgal', a.densityKgPerL),
		filledToFull,
		note,
		createdBy: 'demo-admin'
	});
	await db.insert(pumpReceipts).values([
		receipt(first, 22.4, true, 'Club pump, filled to full'),
		receipt(new Date('2026-07-01T10:00:00Z'), topUp, false, 'Top-up before a lesson'),
		receipt(second, rest, true, 'Club pump, filled to full')
	]);
}

function printSignIns(origin: string): void {
	const recorder = DEMO.recorders[0];
	const reg = DEMO.aircraft.find((a) => a.id === recorder.aircraftId)!.registration;
	console.log(`
Demo sign-ins (password: ${DEMO.password})
${DEMO.users.map((u) => `  ${u.email.padEnd(30)} ${u.blurb}`).join('\n')}

Watch a live flight: sign in, open ${origin}/o/${DEMO.organisations[0].slug}, then in another terminal
  npm run simulate -- --file samples/${DEMO.liveSample} --token ${recorder.token} --speed 30 --now --url ${origin}
(the recorder token of ${reg}; demo mode only).`);
}

const origin = process.env.ORIGIN ?? 'http://127.0.0.1:5180';
try {
	if (await isEmpty()) await load();
	else console.log('seed: database has data already; demo data not loaded again');
	const [{ n }] = await db.select({ n: count() }).from(users).where(eq(users.email, DEMO.users[0].email));
	if (n > 0) printSignIns(origin);
} finally {
	await closeDb();
}
