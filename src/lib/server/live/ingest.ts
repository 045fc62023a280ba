// Storing one live batch: in one transaction, the recorder's flight found or opened, the samples
// stored once whatever the retries (ON CONFLICT DO NOTHING on flight + seq), the contiguous head
// advanced, alarms detected with the incremental engine, and one NOTIFY for the other instances.
// Outside it, after the commit, the alarm e-mails. Plain appends to an open flight take the same
// steps for many flights at once in appends.ts.
import { eq, sql } from 'drizzle-orm';
import { formatTimeMs } from '$lib/csv';
import { db, type Tx } from '../db';
import { flights, type Flight, type Recorder } from '../db/schema';
import { mailAlarms, syncAlarms, type NewAlarm } from './alarms';
import { inBackground } from '../mail';
import type { Batch, BatchProblem } from './batch';
import { computationFor, dropComputation } from './computation';
import { activeAircraftOf, aircraftOf, createFlight, LiveRefusal, lockFlight, lockRecorder, notify, openFlightOf, touchRecorder } from './flights';
import { appendable, appendInGroup } from './appends';
import { contiguousFrom, differingFields, insertSamples, neighbours } from './samples';

/** The answer to a batch: what is safely stored, so the recorder knows what to send again. */
export interface Ack {
	flightId: string;
	/** Highest contiguous sequence stored: everything up to it is safe; resend what is above. */
	ack: number;
	/** Highest sequence stored at all (above ack there are holes). */
	highest: number;
	/** Samples of this batch stored now, and those that were stored already. */
	stored: number;
	duplicates: number;
	/** True when this batch opened the flight. */
	opened: boolean;
	declarationConfirmed: boolean;
}

/** The flight a batch goes to: the one it names, the recorder's open one, or a new one. */
async function targetFlight(tx: Tx, recorder: Recorder, batch: Batch) {
	if (batch.flightId) {
		const [f] = await tx.select().from(flights).where(eq(flights.id, batch.flightId)).for('update').limit(1);
		if (!f) throw new LiveRefusal(404, { error: 'No such flight: send the flightId an earlier answer gave, or leave it out.', field: 'flightId' });
		if (f.aircraftId !== recorder.aircraftId || f.source !== 'live')
			throw new LiveRefusal(403, { error: 'This recorder writes only to live flights of its own aircraft.', field: 'flightId' });
		if (f.status !== 'open') throw new LiveRefusal(409, { error: 'This flight is closed; leave flightId out (or call open) to start a new one.', field: 'flightId', flightId: f.id });
		return { flight: f, opened: false };
	}
	const open = await openFlightOf(tx, recorder.id);
	if (open) return { flight: open, opened: false };
	const a = await activeAircraftOf(tx, recorder);
	const flight = await createFlight(tx, recorder, a, { declaration: null, firstSeq: batch.firstSeq, startedAt: new Date(batch.samples[0].tMs) });
	return { flight, opened: true };
}

/**
 * Stores a validated batch; throws LiveRefusal for a batch that does not fit the flight. A plain
 * append goes into the next grouped commit (appends.ts); anything else, and an append the group
 * handed back, is stored alone here. Either way the answer comes after the commit.
 */
export async function ingestBatch(recorder: Recorder, batch: Batch): Promise<Ack> {
	if (appendable(batch)) {
		const ack = await appendInGroup(recorder, batch);
		if (ack) return ack;
	}
	await touchRecorder(recorder.id);
	return ingestAlone(recorder, batch);
}

async function ingestAlone(recorder: Recorder, batch: Batch): Promise<Ack> {
	const samples = batch.samples;
	const lo = samples[0].seq;
	const hi = samples[samples.length - 1].seq;
	let flightId: string | null = null;
	let toMail: NewAlarm[] = [];
	try {
		const ack = await db.transaction(async (tx) => {
			await lockRecorder(tx, recorder.id);
			// Checked here, where it counts: the batch was read with an aircraft remembered for a moment (api.ts).
			await activeAircraftOf(tx, recorder);
			const { flight, opened } = await targetFlight(tx, recorder, batch);
			flightId = flight.id;
			await lockFlight(tx, flight.id);

			const nb = await neighbours(tx, flight.id, lo, hi);
			const problems: BatchProblem[] = [];
			// Same time, other values: not a retry (a retry is byte-for-byte the same sample).
			let changed: { index: number; seq: number; fields: string[] } | null = null;
			samples.forEach((s, i) => {
				const stored = nb.same.get(s.seq);
				if (stored === undefined) return;
				if (stored.tMs !== s.tMs) {
					if (problems.length < 50)
						problems.push({ index: i, seq: s.seq, field: 't', value: formatTimeMs(s.tMs), message: `seq ${s.seq} is stored already with the time ${formatTimeMs(stored.tMs)}.` });
					return;
				}
				if (changed === null) {
					const fields = differingFields(stored, s);
					if (fields.length > 0) changed = { index: i, seq: s.seq, fields };
				}
			});
			if (problems.length > 0)
				throw new LiveRefusal(409, {
					error: `Sequence numbers of this batch already hold other samples in the open flight: the recorder seems to have started a new flight. Call POST /api/v1/live/open first, or send the right flightId.`,
					flightId: flight.id,
					problems
				});
			if (changed !== null) {
				const c: { index: number; seq: number; fields: string[] } = changed;
				throw new LiveRefusal(409, {
					error: `seq ${c.seq} is stored already with the same time but other values (${c.fields.join(', ')}): a resent batch must repeat its samples exactly. Nothing of this batch was stored.`,
					flightId: flight.id,
					seq: c.seq,
					problems: [{ index: c.index, seq: c.seq, field: c.fields[0], message: `seq ${c.seq} differs from the stored sample in ${c.fields.join(', ')}.` }]
				});
			}
			if (nb.below && samples[0].tMs <= nb.below.tMs)
				throw new LiveRefusal(400, {
					error: 'The batch was not stored: its first sample is not later than the stored sample before it.',
					problems: [{ index: 0, seq: lo, field: 't', value: formatTimeMs(samples[0].tMs), message: `seq ${lo} at ${formatTimeMs(samples[0].tMs)} is not after seq ${nb.below.seq} at ${formatTimeMs(nb.below.tMs)}.` }]
				});
			if (nb.above && samples[samples.length - 1].tMs >= nb.above.tMs)
				throw new LiveRefusal(400, {
					error: 'The batch was not stored: its last sample is not earlier than the stored sample after it.',
					problems: [{ index: samples.length - 1, seq: hi, field: 't', value: formatTimeMs(samples[samples.length - 1].tMs), message: `seq ${hi} is not before seq ${nb.above.seq} at ${formatTimeMs(nb.above.tMs)}.` }]
				});

			const stored = await insertSamples(tx, flight.id, samples);
			let current: Flight = flight;
			if (stored > 0) {
				const head = await contiguousFrom(tx, flight.id, flight.lastSeq);
				const first = new Date(samples[0].tMs);
				const last = new Date(samples[samples.length - 1].tMs);
				[current] = await tx
					.update(flights)
					.set({
						lastSeq: head,
						sampleCount: sql`${flights.sampleCount} + ${stored}`,
						lastSampleAt: sql`greatest(${flights.lastSampleAt}, ${last.toISOString()}::timestamptz)`,
						// An explicit open stamps the server's clock; the samples' own first time wins.
						startedAt: flight.sampleCount === 0 ? first : sql`least(${flights.startedAt}, ${first.toISOString()}::timestamptz)`,
						updatedAt: new Date()
					})
					.where(eq(flights.id, flight.id))
					.returning();
				let alarmsChanged = false;
				if (head > flight.lastSeq) {
					const computed = await computationFor(tx, current, await aircraftOf(tx, recorder));
					const synced = await syncAlarms(tx, current, computed);
					alarmsChanged = synced.changed;
					toMail = synced.toMail;
				}
				await notify(tx, { f: flight.id, s: head, at: Date.now(), ...(alarmsChanged || opened ? { m: 1 as const } : {}) });
			} else {
				await tx.update(flights).set({ updatedAt: new Date() }).where(eq(flights.id, flight.id));
			}
			return {
				flightId: flight.id,
				ack: current.lastSeq,
				highest: Math.max(nb.highest, hi),
				stored,
				duplicates: samples.length - stored,
				opened,
				declarationConfirmed: current.declarationConfirmed
			} satisfies Ack;
		});
		if (toMail.length > 0) {
			const id = ack.flightId;
			const mails = toMail;
			// After the answer, as every e-mail; backgroundSettled() waits for it (the demo seed does).
			inBackground('live alarm mail', async () => {
				await mailAlarms(id, mails);
			});
		}
		return ack;
	} catch (error) {
		// The in-memory computation may hold samples of the rolled-back batch.
		if (flightId) dropComputation(flightId);
		throw error;
	}
}
