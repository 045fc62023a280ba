// Loads demo flights from samples/ through the same ingest path an upload takes, then adds what a
// pilot would have entered afterwards: the refuel at the middle stop and the instructor.
// The diesel panel log and the broken file stay out, so a visitor can try the column mapper and
// the error report with them.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { eq } from 'drizzle-orm';
import { db } from '../src/lib/server/db';
import { aircraft, flights, recorders } from '../src/lib/server/db/schema';
import { parseRecorderText } from '../src/lib/csv';
import type { Declaration } from '../src/lib/fuel';
import { closeByRecorder, openByRecorder } from '../src/lib/server/live/flights';
import { ingestBatch } from '../src/lib/server/live/ingest';
import { backgroundSettled } from '../src/lib/server/mail';
import { ingestRecorderFile } from '../src/lib/server/ingest/ingest';
import type { DeclarationInput } from '../src/lib/server/ingest/declaration';
import { addFuelEvent, addNote } from '../src/lib/server/flights/edit';
import { createWaitingPlan, savePlan } from '../src/lib/server/plans';
import { checkProfile, resolveDeclaration } from '../src/lib/fuel/declaration';
import { engineInputsOf, fuelSetupOf } from '../src/lib/flight-inputs';
import { DEFAULT_TOLERANCE_PERCENT } from '../src/lib/fuel/plan-actual';
import { toLitres } from '../src/lib/units';
import { DEMO, DEMO_ORG_ID } from './demo-scenario';

const samplesDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', 'samples');

interface DemoFlight {
	file: string;
	registration: string;
	pilot: string;
	instructor?: string;
	title: string;
	declaration: DeclarationInput;
	/** A refuel entered after landing, at a time during a stop (UTC). */
	refuel?: { at: string; kind: 'toFull' | 'toLower'; note: string };
	/**
	 * Followed live rather than uploaded: the file goes through the live ingest path, in batches
	 * as the recorder would send them, so its alarms are raised and e-mailed to the watchers
	 * (DEMO.watches) exactly as in flight.
	 */
	liveRecorderId?: string;
}

// Oldest first, so each upload is the aircraft's newest and "unchanged" follows the last one.
const FLIGHTS: DemoFlight[] = [
	{ file: 'kestrel-local-training.csv', registration: 'BD-KTR', pilot: 'demo-student', instructor: 'demo-instructor', title: 'Local training area and circuits', declaration: { kind: 'lower', amount: null } },
	{ file: 'kestrel-tourer-dropout.csv', registration: 'BD-KTT', pilot: 'demo-pilot', title: 'Fenway and back (recorder connector came loose)', declaration: { kind: 'full', amount: null } },
	{
		file: 'kestrel-crosscountry-3leg.csv',
		registration: 'BD-KTT',
		pilot: 'demo-student',
		instructor: 'demo-instructor',
		title: 'Solo cross-country: Kestrel Field – Saltmere – Bramble Down – Kestrel Field',
		declaration: { kind: 'unchanged', amount: null },
		refuel: { at: '2026-06-20T09:50:00Z', kind: 'toFull', note: 'Filled to full at Saltmere' }
	},
	{ file: 'kestrel-trainer-merrow-leaned.csv', registration: 'BD-KTR', pilot: 'demo-pilot', title: 'Merrow and back, leaned in cruise', declaration: { kind: 'full', amount: null } },
	{ file: 'kestrel-trainer-merrow-rich.csv', registration: 'BD-KTR', pilot: 'demo-pilot', title: 'Merrow and back, never leaned', declaration: { kind: 'full', amount: null } },
	// Lands below its 30 min reserve: the verdict, the flights list, the alarm and the instructor's
	// alarm e-mail say so. Followed live, as the trainer's recorder sent it.
	{
		file: 'kestrel-trainer-long-way-round.csv',
		registration: 'BD-KTR',
		pilot: 'demo-student',
		instructor: 'demo-instructor',
		title: 'The long way round against a headwind, filled to the tabs',
		declaration: { kind: 'lower', amount: null },
		liveRecorderId: '9c7e5b10-3a2d-4e8f-b1c4-000000000002'
	}
];

/** Samples per batch, about what a recorder sends each minute at 1 Hz. */
const LIVE_BATCH = 60;

/**
 * A demo flight through the live path: opened by its recorder with the pilot and the declaration,
 * sent in batches, closed. Alarm e-mails go out in the background; the caller waits for them.
 */
async function followLive(f: DemoFlight, recorderId: string): Promise<string> {
	const recorder = await db.query.recorders.findFirst({ where: eq(recorders.id, recorderId) });
	if (!recorder) throw new Error(`demo recorder ${recorderId} is missing`);
	const pilot = DEMO.users.find((u) => u.id === f.pilot);
	if (!pilot) throw new Error(`demo pilot ${f.pilot} is missing`);
	const parsed = await parseRecorderText(fs.readFileSync(path.join(samplesDir, f.file), 'utf8'), null, { densityKgPerL: 0.72 });
	if (!parsed.ok) throw new Error(`demo flight ${f.file} does not parse: ${parsed.problems[0]?.message}`);
	const { flight } = await openByRecorder(recorder, { declaration: { kind: f.declaration.kind } as Declaration, pilot: pilot.email, title: f.title });
	const rows = parsed.rows;
	for (let from = 0; from < rows.length; from += LIVE_BATCH) {
		const samples = rows.slice(from, from + LIVE_BATCH).map(({ line: _line, ...r }, i) => ({ ...r, seq: from + i }));
		await ingestBatch(recorder, { flightId: flight.id, firstSeq: 0, samples });
	}
	await closeByRecorder(recorder, flight.id);
	return flight.id;
}

export async function loadDemoFlights(): Promise<number> {
	let stored = 0;
	for (const f of FLIGHTS) {
		const a = await db.query.aircraft.findFirst({ where: eq(aircraft.registration, f.registration) });
		if (!a || a.orgId !== DEMO_ORG_ID) throw new Error(`demo aircraft ${f.registration} is missing`);
		let result: { flightId: string };
		if (f.liveRecorderId) result = { flightId: await followLive(f, f.liveRecorderId) };
		else {
			const uploaded = await ingestRecorderFile({
				orgId: a.orgId,
				aircraft: a,
				userId: f.pilot,
				fileName: f.file,
				source: fs.createReadStream(path.join(samplesDir, f.file)),
				declaration: f.declaration,
				title: f.title
			});
			if (uploaded.status !== 'stored') throw new Error(`demo flight ${f.file} was not stored (${uploaded.status}): ${uploaded.message}`);
			result = uploaded;
		}
		if (f.instructor) await db.update(flights).set({ instructorId: f.instructor }).where(eq(flights.id, result.flightId));
		if (f.refuel) {
			const flight = (await db.query.flights.findFirst({ where: eq(flights.id, result.flightId) }))!;
			const saved = await addFuelEvent(flight, { t: new Date(f.refuel.at), kind: f.refuel.kind, amountL: null, note: f.refuel.note }, f.pilot);
			if (!saved.ok) throw new Error(`demo refuel on ${f.file}: ${saved.message}`);
		}
		const plan = DEMO.crossCountryPlan;
		if (plan.file === f.file) {
			const L = (gal: number) => toLitres(gal, a.displayUnit, a.densityKgPerL);
			const flight = { id: result.flightId, orgId: a.orgId, aircraftId: a.id };
			// The plan starts from the fuel the flight declared at engine start (the engine's own
			// reading of its declaration), so the legs differ only where the flying did.
			const stored = (await db.query.flights.findFirst({ where: eq(flights.id, result.flightId) }))!;
			const inputs = engineInputsOf(fuelSetupOf(a), stored, []);
			const startOnBoardL = resolveDeclaration(inputs.declaration, checkProfile(inputs.profile).profile, inputs.previousOnBoardL).onBoardL;
			const planInput = {
				startOnBoardL,
				taxiL: L(plan.taxi),
				climbL: L(plan.climb),
				reserveRule: plan.reserveRule,
				reserveCustomMin: null,
				reserveFlowLph: L(plan.reserveFlow),
				tolerancePercent: DEFAULT_TOLERANCE_PERCENT,
				legs: plan.legs.map((l) => ({ to: l.to, distanceNm: l.distanceNm, gsKt: l.gsKt, timeMin: null, flowLph: L(l.flow), fuelL: null, refuelToL: 'refuelTo' in l ? L(l.refuelTo) : null }))
			};
			await savePlan(flight, planInput, f.pilot);
			// The student's next cross-country, planned ahead for tomorrow morning: it waits for its flight.
			const tomorrow = new Date();
			tomorrow.setUTCDate(tomorrow.getUTCDate() + 1);
			tomorrow.setUTCHours(9, 0, 0, 0);
			await createWaitingPlan(a.orgId, { aircraft: a.id, departure: tomorrow, pilot: f.pilot }, { ...planInput, startOnBoardL: L(plan.startOnBoard) }, f.instructor ?? f.pilot);
			await addNote(flight, { body: plan.note.body, at: new Date(plan.note.at) }, f.instructor ?? f.pilot);
		}
		stored++;
	}
	// The alarm e-mails of the flight followed live, sent before the seed's connection closes.
	await backgroundSettled();
	return stored;
}
