// The organisation's overview: flights in the air now and the latest closed ones, of those the
// member may see (the flights list's visibility rule).
import { and, desc, eq } from 'drizzle-orm';
import { db } from '../db';
import { aircraft, flights, users } from '../db/schema';
import { visibleFlights, type ListViewer } from './list';

const columns = {
	id: flights.id,
	title: flights.title,
	status: flights.status,
	source: flights.source,
	startedAt: flights.startedAt,
	lastSampleAt: flights.lastSampleAt,
	summary: flights.summary,
	registration: aircraft.registration,
	displayUnit: aircraft.displayUnit,
	densityKgPerL: aircraft.densityKgPerL,
	pilot: users.name
};

/** Up to 20 open flights and the 8 latest closed ones, newest first. */
export async function overviewFlights(v: ListViewer) {
	const visible = visibleFlights(v);
	const base = () => db.select(columns).from(flights).innerJoin(aircraft, eq(aircraft.id, flights.aircraftId)).leftJoin(users, eq(users.id, flights.pilotId));
	const [live, recent] = await Promise.all([
		base().where(and(visible, eq(flights.status, 'open'))).orderBy(desc(flights.startedAt)).limit(20),
		base().where(and(visible, eq(flights.status, 'closed'))).orderBy(desc(flights.startedAt)).limit(8)
	]);
	return { live, recent };
}
