// Grouped commits of plain appends. Nearly every live batch is the next samples of an open
// flight, right after what is stored. Such batches wait here (never longer than the group before
// them takes) and one transaction stores those of many flights at once: one statement each to
// lock the flights, insert every sample, advance every head, read the fuel inputs, touch the
// recorders and NOTIFY — instead of a dozen statements and a commit per batch. Each batch is
// answered only after its group committed. A batch that turns out not to be a plain append
// (a retry, a gap, a closed flight, anything unusual) or whose group failed is handed back, and
// ingest.ts stores it alone with every check.
import { inArray, sql } from 'drizzle-orm';
import { db, type Tx } from '../db';
import { aircraft as aircraftTable, flights, type Flight, type Recorder } from '../db/schema';
import { mailAlarms, syncAlarms, type NewAlarm } from './alarms';
import { inBackground } from '../mail';
import type { Batch, LiveSample } from './batch';
import { appendGroupLimits } from './config';
import { alarmsSynced, computationsFor, dropComputation, noteAlarmsSynced } from './computation';
import { notifyAll } from './flights';
import type { Ack } from './ingest';
import type { LiveNotice } from './protocol';
import { insertSamplesOf } from './samples';

interface Waiting {
	recorder: Recorder;
	batch: Batch & { flightId: string };
	/** null: not stored here, store it alone. */
	done(ack: Ack | null): void;
	fail(error: unknown): void;
}

export interface AppendStats {
	groups: number;
	batches: number;
	handedBack: number;
	failedGroups: number;
	largest: number;
}

const queue: Waiting[] = [];
/** Flights in a group being committed now: a second batch of one waits for the next group. */
const busy = new Set<string>();
let running = 0;
const stats: AppendStats = { groups: 0, batches: 0, handedBack: 0, failedGroups: 0, largest: 0 };

export function appendStats(): AppendStats {
	return { ...stats };
}

/** A batch that can be a plain append: it names its flight (every batch after a recorder's first does). */
export function appendable(batch: Batch): batch is Batch & { flightId: string } {
	return typeof batch.flightId === 'string' && batch.samples.length > 0;
}

/** Stores the batch in the next group; null when it must be stored alone (ingest.ts). */
export function appendInGroup(recorder: Recorder, batch: Batch & { flightId: string }): Promise<Ack | null> {
	return new Promise((done, fail) => {
		queue.push({ recorder, batch, done, fail });
		startGroups();
	});
}

function startGroups(): void {
	const { maxGroups, maxBatches } = appendGroupLimits();
	while (running < maxGroups && queue.length > 0) {
		const group: Waiting[] = [];
		const inGroup = new Set<string>();
		for (let i = 0; i < queue.length && group.length < maxBatches; ) {
			const w = queue[i];
			const id = w.batch.flightId;
			if (busy.has(id) || inGroup.has(id)) {
				i++;
				continue;
			}
			inGroup.add(id);
			group.push(w);
			queue.splice(i, 1);
		}
		if (group.length === 0) return;
		for (const id of inGroup) busy.add(id);
		running++;
		void commitGroup(group).finally(() => {
			for (const id of inGroup) busy.delete(id);
			running--;
			startGroups();
		});
	}
}

interface Planned {
	w: Waiting;
	flight: Flight;
	samples: readonly LiveSample[];
	/** The flight row as this group leaves it. */
	after: Flight;
}

async function commitGroup(group: Waiting[]): Promise<void> {
	stats.groups++;
	stats.largest = Math.max(stats.largest, group.length);
	const mails: { flightId: string; alarms: NewAlarm[] }[] = [];
	let planned: Planned[] = [];
	let acks: Map<Waiting, Ack>;
	try {
		acks = await db.transaction(async (tx) => {
			planned = await plan(tx, group);
			if (planned.length === 0) return new Map();
			const stored = await insertSamplesOf(
				tx,
				planned.map((p) => ({ flightId: p.flight.id, samples: p.samples }))
			);
			const expected = planned.reduce((n, p) => n + p.samples.length, 0);
			// The flights are locked and nothing was stored at or above their heads: anything else is a bug to roll back.
			if (stored !== expected) throw new Error(`grouped append stored ${stored} of ${expected} samples`);
			await advanceHeads(tx, planned);
			const alarmsChanged = await bringAlarmsInLine(tx, planned, mails);
			await tx.execute(sql`update recorders set last_contact_at = now() where id = any(${sql.param([...new Set(planned.map((p) => p.w.recorder.id))])}::uuid[])`);
			const at = Date.now();
			await notifyAll(
				tx,
				planned.map((p): LiveNotice => ({ f: p.flight.id, s: p.after.lastSeq, at, ...(alarmsChanged.has(p.flight.id) ? { m: 1 as const } : {}) }))
			);
			return new Map(
				planned.map((p) => [
					p.w,
					{
						flightId: p.flight.id,
						ack: p.after.lastSeq,
						highest: p.after.lastSeq,
						stored: p.samples.length,
						duplicates: 0,
						opened: false,
						declarationConfirmed: p.after.declarationConfirmed
					} satisfies Ack
				])
			);
		});
	} catch (error) {
		// Nothing of the group was stored: each batch is stored alone, with every check.
		stats.failedGroups++;
		console.error(`[live] a group of ${group.length} batches failed and is stored batch by batch:`, (error as Error).message);
		for (const p of planned) dropComputation(p.flight.id);
		for (const w of group) w.done(null);
		stats.handedBack += group.length;
		return;
	}
	for (const w of group) {
		const ack = acks.get(w) ?? null;
		if (ack) stats.batches++;
		else stats.handedBack++;
		w.done(ack);
	}
	for (const m of mails)
		// After the answer, as every e-mail; backgroundSettled() waits for it.
		inBackground('live alarm mail', async () => {
			await mailAlarms(m.flightId, m.alarms);
		});
}

/**
 * Locks the group's flights (in id order, so two groups never wait on each other in a circle)
 * and keeps the batches that are plain appends: an open live flight of the recorder's aircraft,
 * the batch starting right after the head, nothing stored above the head, and its first sample
 * later than the head's. The others are answered null at once.
 */
async function plan(tx: Tx, group: Waiting[]): Promise<Planned[]> {
	const ids = group.map((w) => w.batch.flightId);
	const rows = await tx
		.select({
			flight: flights,
			highest: sql<number | null>`(select max(s.seq) from samples s where s.flight_id = ${flights.id})`,
			headMs: sql<number | null>`(select (extract(epoch from s.t) * 1000)::float8 from samples s where s.flight_id = ${flights.id} and s.seq = ${flights.lastSeq})`,
			// An archived aircraft takes no samples: such a batch is handed back and refused there.
			active: sql<boolean>`exists (select 1 from aircraft a where a.id = ${flights.aircraftId} and a.org_id = ${flights.orgId} and a.archived_at is null)`
		})
		.from(flights)
		.where(inArray(flights.id, ids))
		.orderBy(flights.id)
		.for('update', { of: flights });
	const byId = new Map(rows.map((r) => [r.flight.id, r]));
	const out: Planned[] = [];
	for (const w of group) {
		const r = byId.get(w.batch.flightId);
		const s = w.batch.samples;
		const f = r?.flight;
		const plain =
			f !== undefined &&
			f.aircraftId === w.recorder.aircraftId &&
			f.orgId === w.recorder.orgId &&
			f.source === 'live' &&
			f.status === 'open' &&
			r!.active &&
			s[0].seq === f.lastSeq + 1 &&
			(r!.highest === null || Number(r!.highest) <= f.lastSeq) &&
			(r!.headMs === null || Math.round(Number(r!.headMs)) < s[0].tMs);
		if (!plain) {
			w.done(null);
			stats.handedBack++;
			continue;
		}
		const first = new Date(s[0].tMs);
		const last = new Date(s[s.length - 1].tMs);
		const after: Flight = {
			...f,
			lastSeq: s[s.length - 1].seq,
			sampleCount: f.sampleCount + s.length,
			lastSampleAt: f.lastSampleAt && f.lastSampleAt > last ? f.lastSampleAt : last,
			// An explicit open stamps the server's clock; the samples' own first time wins.
			startedAt: f.sampleCount === 0 || first < f.startedAt ? first : f.startedAt,
			updatedAt: new Date()
		};
		out.push({ w, flight: f, samples: s, after });
	}
	// Answered already: not part of what this group commits.
	group.splice(0, group.length, ...out.map((p) => p.w));
	return out;
}

/** Every flight's new head, counts and times in one statement (the values plan() worked out under the lock). */
async function advanceHeads(tx: Tx, planned: Planned[]): Promise<void> {
	const col = <T>(f: (p: Flight) => T) => sql.param(planned.map((p) => f(p.after)));
	await tx.execute(sql`
		update flights set last_seq = v.last_seq, sample_count = v.sample_count, last_sample_at = v.last_sample_at,
			started_at = v.started_at, updated_at = v.updated_at
		from unnest(
			${col((f) => f.id)}::uuid[], ${col((f) => f.lastSeq)}::int[], ${col((f) => f.sampleCount)}::int[],
			${col((f) => f.lastSampleAt!.toISOString())}::timestamptz[], ${col((f) => f.startedAt.toISOString())}::timestamptz[],
			${col((f) => f.updatedAt.toISOString())}::timestamptz[]
		) as v(id, last_seq, sample_count, last_sample_at, started_at, updated_at)
		where flights.id = v.id`);
}

/** Alarm detection over the new samples; rows written only for flights whose episodes changed. Returns those flights. */
async function bringAlarmsInLine(tx: Tx, planned: Planned[], mails: { flightId: string; alarms: NewAlarm[] }[]): Promise<Set<string>> {
	const aircraftIds = [...new Set(planned.map((p) => p.flight.aircraftId))];
	const planes = await tx.select().from(aircraftTable).where(inArray(aircraftTable.id, aircraftIds));
	const byId = new Map(planes.map((a) => [a.id, a]));
	const asks = planned.map((p) => {
		const a = byId.get(p.flight.aircraftId);
		if (!a || a.orgId !== p.flight.orgId) throw new Error(`the aircraft of flight ${p.flight.id} is missing`);
		return { flight: p.after, aircraft: a, appended: p.samples };
	});
	const computed = await computationsFor(tx, asks);
	const changed = new Set<string>();
	for (let i = 0; i < planned.length; i++) {
		const flight = planned[i].after;
		const c = computed[i];
		if (alarmsSynced(flight.id, c.comp)) continue;
		const synced = await syncAlarms(tx, flight, c);
		noteAlarmsSynced(flight.id, c.comp);
		if (synced.changed) changed.add(flight.id);
		if (synced.toMail.length > 0) mails.push({ flightId: flight.id, alarms: synced.toMail });
	}
	return changed;
}
