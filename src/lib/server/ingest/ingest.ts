// Storing a recorder file as a flight: the bytes stream in once, are counted against the size
// limit, hashed, spooled to a temporary file and parsed as they arrive, the samples encoded for
// binary COPY into a second spool file. Only then, for a file without problems, does the upload
// take a database connection: the samples go by COPY into the samples table inside one
// transaction with their flight row, then the upload, its original bytes and the real flight
// figures join them and the transaction commits; anything wrong rolls all of it back, so nobody
// ever sees part of a file.
//
// Why no staging table: COPY has no ON CONFLICT, which matters for live batches, but an upload's
// flight is new in this very transaction, so no sample can conflict. Measured here with 1,000,000
// rows, COPY into a temporary table then INSERT … SELECT took 1.4 s + 5.6 s against 6.7 s for one
// COPY: INSERT … SELECT does not batch rows the way COPY does, and each row's foreign-key check
// costs the same either way.
import { createHash, randomUUID } from 'node:crypto';
import { open, unlink, type FileHandle } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { finished } from 'node:stream/promises';
import { eq } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/node-postgres';
import { from as copyFrom } from 'pg-copy-streams';
import type pg from 'pg';
import {
	MAX_UPLOAD_BYTES,
	MAX_UPLOAD_LABEL,
	burndownMapping,
	columnMappingSchema,
	parseRecorderCsv,
	type ColumnMapping,
	type MappingChoice,
	type MappingOrigin,
	type MappingResolver,
	type ParseSummary,
	type RecorderRow,
	type RowProblem,
	type UploadProgress
} from '$lib/csv';
import { computeFlight, summarize, WPT_NONE, type FlightSummary, type SampleColumns } from '$lib/fuel';
import { engineInputsOf, fuelSetupOf } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from '../flights/recent-cruise';
import { declarationProblem, toDeclaration } from '$lib/schemas/declaration';
import { db as poolDb, pool } from '../db';
import { uploadConnections } from '../limits';
import * as schema from '../db/schema';
import { aircraft as aircraftTable, flights, importProfiles, uploads, type Aircraft, type ImportProfile } from '../db/schema';
import { storeComputedFigures } from '../flights/figures';
import { attachWaitingPlan } from '../plans';
import { SAMPLE_COPY_COLUMNS, SampleCopyEncoder, chunkTuple, copyHeader, copyTrailer, writeWithBackpressure } from './binary-copy';
import type { DeclarationInput } from './declaration';

/** Size of the pieces the original file is kept in (upload_chunks rows). */
export const CHUNK_BYTES = 1 << 20;

export class UploadTooLargeError extends Error {
	constructor() {
		super(`The file is larger than the ${MAX_UPLOAD_LABEL} limit; nothing was stored. Split the recording, or leave out columns Burndown does not use.`);
	}
}

export type IngestProgress = UploadProgress;

export interface IngestRequest {
	orgId: string;
	aircraft: Aircraft;
	userId: string | null;
	fileName: string;
	/** The file's bytes in order. */
	source: AsyncIterable<Uint8Array>;
	declaration: DeclarationInput;
	/** A mapping from the column mapper; null for our format or a matching import profile. */
	mapping?: ColumnMapping | null;
	/** An import profile of the organisation to apply. */
	profileId?: string | null;
	/** The date (clock times) or start (elapsed seconds) of this file, for a profile that needs it. */
	timeBase?: { date?: string; start?: string };
	title?: string;
	notes?: string;
	onProgress?: (progress: IngestProgress) => void;
}

/** What is kept in uploads.report, and answered to the uploader. */
export interface UploadReport {
	fileName: string;
	sizeBytes: number;
	sha256: string;
	origin: MappingOrigin;
	mapping: ColumnMapping;
	headerLine: number;
	columns: string[];
	ignoredColumns: string[];
	rows: number;
	lines: number;
	blankLines: number;
	blankCells: ParseSummary['blankCells'];
	firstSampleAt: string;
	lastSampleAt: string;
	gapCount: number;
	gapTimeS: number;
	warnings: string[];
	parseMs: number;
	storeMs: number;
}

export type IngestResult =
	| { status: 'stored'; flightId: string; uploadId: string; report: UploadReport; summary: FlightSummary }
	| { status: 'duplicate'; flightId: string; uploadId: string; message: string }
	| { status: 'rejected'; problems: RowProblem[]; problemCount: number; message: string }
	| { status: 'invalid'; field: string; message: string }
	| { status: 'tooLarge'; limitBytes: number; message: string };

const SAMPLES_COPY = `COPY samples (${SAMPLE_COPY_COLUMNS}) FROM STDIN (FORMAT binary)`;

/** Columns for the engine's summary, grown as rows arrive (a few bytes per sample). */
class ColumnBuilder {
	n = 0;
	private cap = 4096;
	t = new Float64Array(this.cap);
	flow = new Float64Array(this.cap);
	gs = new Float64Array(this.cap);
	dtg = new Float64Array(this.cap);
	alt = new Float64Array(this.cap);
	wpt = new Int32Array(this.cap);
	private wptIds = new Map<string, number>();
	private hasAlt = false;

	push(r: RecorderRow): void {
		if (this.n === this.cap) this.grow();
		const i = this.n++;
		this.t[i] = r.tMs / 1000;
		this.flow[i] = r.flow ?? NaN;
		this.gs[i] = r.gs ?? NaN;
		this.dtg[i] = r.dtg ?? NaN;
		this.alt[i] = r.alt ?? NaN;
		if (r.alt !== null) this.hasAlt = true;
		if (r.wpt === null) this.wpt[i] = WPT_NONE;
		else {
			let id = this.wptIds.get(r.wpt);
			if (id === undefined) this.wptIds.set(r.wpt, (id = this.wptIds.size));
			this.wpt[i] = id;
		}
	}

	private grow(): void {
		this.cap *= 2;
		const f = (a: Float64Array) => {
			const b = new Float64Array(this.cap);
			b.set(a);
			return b;
		};
		this.t = f(this.t);
		this.flow = f(this.flow);
		this.gs = f(this.gs);
		this.dtg = f(this.dtg);
		this.alt = f(this.alt);
		const w = new Int32Array(this.cap);
		w.set(this.wpt);
		this.wpt = w;
	}

	/**
	 * The columns as the replay's loader builds them from the stored rows (altitude and waypoints
	 * only when the flight has any, ids in order of first appearance), so the summary stored
	 * here is the one a later recompute gives.
	 */
	columns(): SampleColumns {
		const n = this.n;
		const cols: SampleColumns = { t: this.t.subarray(0, n), flow: this.flow.subarray(0, n), gs: this.gs.subarray(0, n), dtg: this.dtg.subarray(0, n) };
		if (this.hasAlt) cols.alt = this.alt.subarray(0, n);
		if (this.wptIds.size > 0) cols.wpt = this.wpt.subarray(0, n);
		return cols;
	}
}

function titleFrom(fileName: string): string {
	return fileName.replace(/\.(csv|txt|log)$/i, '').slice(0, 120);
}

type Profile = Pick<ImportProfile, 'id' | 'name' | 'headerSignature' | 'mapping' | 'createdAt'>;

/**
 * Picks the mapping: the one given, the chosen profile, our own format, or the newest profile
 * matching the header. The profiles are read before the upload takes its connection: a query
 * needing a second connection while every pooled one waits for it would never finish.
 */
function mappingResolver(req: IngestRequest, profiles: readonly Profile[]): MappingResolver {
	const withTimeBase = (m: ColumnMapping, origin: MappingOrigin, line: number): MappingChoice => {
		const merged = { ...m, time: { ...m.time, ...(req.timeBase?.date ? { date: req.timeBase.date } : {}), ...(req.timeBase?.start ? { start: req.timeBase.start } : {}) } };
		const checked = columnMappingSchema.safeParse(merged);
		if (checked.success) return { mapping: checked.data, origin };
		const issue = checked.error.issues[0];
		return { problem: { line, column: '', value: '', message: `${origin.profileName ? `Import profile "${origin.profileName}": ` : ''}${issue.message}` } };
	};
	const fromProfile = (p: Profile, line: number) => withTimeBase(p.mapping as ColumnMapping, { kind: 'profile', profileId: p.id, profileName: p.name }, line);
	return (header) => {
		if (req.mapping) return withTimeBase(req.mapping, { kind: 'given' }, header.line);
		if (req.profileId) {
			const p = profiles.find((x) => x.id === req.profileId);
			if (!p) return { problem: { line: header.line, column: '', value: req.profileId, message: 'The chosen import profile does not exist in this organisation.' } };
			return fromProfile(p, header.line);
		}
		const ours = burndownMapping(header.names);
		if ('mapping' in ours) return { mapping: ours.mapping, origin: { kind: 'burndown' } };
		const match = profiles.filter((x) => x.headerSignature === header.signature).sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())[0];
		if (match) return fromProfile(match, header.line);
		return {
			problem: {
				line: header.line,
				column: '',
				value: header.names.join(header.layout.delimiter).slice(0, 200),
				message: `${ours.message} No import profile of this organisation matches these columns either: map the columns on the upload page, or send a mapping.`
			}
		};
	};
}

/** A temporary file with no name: whatever ends this process, no copy of the upload stays behind. */
async function anonymousFile(): Promise<FileHandle> {
	const path = join(tmpdir(), `burndown-upload-${randomUUID()}`);
	const file = await open(path, 'w+', 0o600);
	try {
		await unlink(path);
	} catch (error) {
		await file.close().catch(() => {});
		throw error;
	}
	return file;
}

/** Advisory lock class (two-key form) for the checks and writes of one aircraft's uploads. */
const LOCK_AIRCRAFT_UPLOAD = 5_120_003;

/**
 * Stores a recorder file as a flight of `aircraft`, or says exactly why not.
 *
 * Two phases, so a slow or hostile client never holds a database connection: first the body is
 * received, counted, hashed and kept in a spool file while it is parsed, its samples encoded for
 * COPY into a second spool file (a rejected file ends here, having touched no connection); then,
 * with one of the few connections uploads may use (uploadConnections), everything goes into the
 * database in one transaction at the speed of the disk.
 */
export async function ingestRecorderFile(req: IngestRequest): Promise<IngestResult> {
	const startedAt = performance.now();
	const profiles = await poolDb
		.select({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature, mapping: importProfiles.mapping, createdAt: importProfiles.createdAt })
		.from(importProfiles)
		.where(eq(importProfiles.orgId, req.orgId));
	const spool = await anonymousFile();
	let copySpool: FileHandle;
	try {
		copySpool = await anonymousFile();
	} catch (error) {
		await spool.close().catch(() => {});
		throw error;
	}
	try {
		return await ingestSpooled(req, profiles, spool, copySpool, startedAt);
	} finally {
		await spool.close().catch(() => {});
		await copySpool.close().catch(() => {});
	}
}

async function ingestSpooled(req: IngestRequest, profiles: Profile[], spool: FileHandle, copySpool: FileHandle, startedAt: number): Promise<IngestResult> {
	let spooled = 0;
	let copyBytes = 0;
	const hash = createHash('sha256');
	let bytes = 0;
	let rows = 0;
	let lastProgress = 0;
	const progress = (p: IngestProgress) => req.onProgress?.(p);

	async function* tap(): AsyncGenerator<Uint8Array> {
		for await (const chunk of req.source) {
			bytes += chunk.length;
			if (bytes > MAX_UPLOAD_BYTES) throw new UploadTooLargeError();
			hash.update(chunk);
			await spool.write(chunk, 0, chunk.length, spooled);
			spooled += chunk.length;
			yield chunk;
		}
	}
	const keep = async (piece: Buffer) => {
		await copySpool.write(piece, 0, piece.length, copyBytes);
		copyBytes += piece.length;
	};

	const uploadId = randomUUID();
	const flightId = randomUUID();
	const encoder = new SampleCopyEncoder(flightId);
	const columns = new ColumnBuilder();
	let rowIndex = 0;
	let lastSeq = -1;

	// ---- phase 1: receive and parse, no database connection --------------------------------------
	let summary: ParseSummary;
	try {
		summary = await parseRecorderCsv(tap(), mappingResolver(req, profiles), {
			densityKgPerL: req.aircraft.densityKgPerL,
			onRows: async (batch) => {
				for (const r of batch) {
					if (!encoder.hasRoom()) await keep(encoder.take()!);
					// Without the recorder's own numbers, the row's place in the file is its sequence.
					lastSeq = r.seq ?? rowIndex;
					encoder.push(r, lastSeq);
					rowIndex++;
					columns.push(r);
				}
			},
			// Per chunk of input, good rows or not, so a file full of problems shows progress too.
			onProgress: (p) => {
				rows = p.rows;
				const now = performance.now();
				if (now - lastProgress > 100) {
					lastProgress = now;
					progress({ phase: 'reading', bytes, rows });
				}
			}
		});
	} catch (error) {
		if (error instanceof UploadTooLargeError) return { status: 'tooLarge', limitBytes: MAX_UPLOAD_BYTES, message: error.message };
		throw error;
	}
	const rest = encoder.take();
	if (rest) await keep(rest);
	progress({ phase: 'reading', bytes, rows });
	const parseMs = performance.now() - startedAt;

	if (!summary.ok) {
		return {
			status: 'rejected',
			problems: summary.problems,
			problemCount: summary.problemCount,
			message: `The file was not stored: ${summary.problemCount} ${summary.problemCount === 1 ? 'problem' : 'problems'} found.`
		};
	}
	const sha256 = hash.digest('hex');

	// ---- phase 2: one transaction on one of the connections uploads may use ------------------------
	const releaseSlot = await uploadConnections.acquire();
	let client: pg.PoolClient;
	try {
		client = await pool.connect();
	} catch (error) {
		releaseSlot();
		throw error;
	}
	let clientBroken = false;
	// A checked-out client has no 'error' listener of the pool's: without this one, a connection
	// dropped by the server mid-transaction would be an unhandled error that ends the process.
	const onClientError = (e: Error) => {
		clientBroken = true;
		console.error('[upload] database connection failed', e.message);
	};
	client.on('error', onClientError);
	const db = drizzle(client, { schema, casing: 'snake_case' });
	let copy: ReturnType<typeof copyFrom> | null = null;
	try {
		await client.query('BEGIN');
		// The samples need their flight row first; its real figures are set once the checks pass.
		await db.insert(flights).values({ id: flightId, orgId: req.orgId, aircraftId: req.aircraft.id, source: 'upload', status: 'closed', startedAt: new Date(), declaration: {} });
		const stream = client.query(copyFrom(SAMPLES_COPY));
		copy = stream;
		const copyFailure: { error: Error | null } = { error: null };
		stream.on('error', (e: Error) => (copyFailure.error = e));
		await writeWithBackpressure(stream, copyHeader());
		for (let at = 0; at < copyBytes; at += CHUNK_BYTES) {
			if (copyFailure.error) throw copyFailure.error;
			// A fresh buffer per piece: the COPY stream may still hold the previous one.
			const piece = Buffer.allocUnsafe(Math.min(CHUNK_BYTES, copyBytes - at));
			const { bytesRead } = await copySpool.read(piece, 0, piece.length, at);
			if (bytesRead !== piece.length) throw new Error('The spooled samples were shorter than what was written.');
			await writeWithBackpressure(stream, piece);
		}
		await writeWithBackpressure(stream, copyTrailer());
		stream.end();
		await finished(stream);
		copy = null;
		if (copyFailure.error) throw copyFailure.error;

		progress({ phase: 'storing', step: 'checks', rows });
		const a = req.aircraft;
		// Uploads for one aircraft take turns from here on, so the duplicate, overlap and "newest
		// flight" checks cannot race each other. An advisory lock rather than a row lock on the
		// aircraft: every transaction here already holds a key-share lock on that row (its flight's
		// foreign key), and two of them upgrading it to FOR UPDATE deadlock.
		await client.query('SELECT pg_advisory_xact_lock($1, hashtext($2))', [LOCK_AIRCRAFT_UPLOAD, a.id]);
		const dup = await client.query<{ upload_id: string; flight_id: string | null }>(
			'SELECT u.id AS upload_id, f.id AS flight_id FROM uploads u LEFT JOIN flights f ON f.upload_id = u.id WHERE u.aircraft_id = $1 AND u.sha256 = $2 LIMIT 1',
			[a.id, sha256]
		);
		if (dup.rows[0]?.flight_id) {
			await client.query('ROLLBACK');
			return { status: 'duplicate', flightId: dup.rows[0].flight_id, uploadId: dup.rows[0].upload_id, message: 'This file was uploaded for this aircraft before; here is that flight.' };
		}
		// The flight made from it was deleted: the old upload goes, the new one takes its place.
		if (dup.rows[0]) await client.query('DELETE FROM uploads WHERE id = $1', [dup.rows[0].upload_id]);

		const first = new Date(summary.firstTMs!);
		const last = new Date(summary.lastTMs!);
		const overlap = await client.query<{ id: string; started_at: Date }>(
			'SELECT id, started_at FROM flights WHERE aircraft_id = $1 AND id <> $4 AND started_at <= $3 AND coalesce(ended_at, last_sample_at, started_at) >= $2 LIMIT 1',
			[a.id, first, last, flightId]
		);
		if (overlap.rows[0]) {
			await client.query('ROLLBACK');
			return {
				status: 'invalid',
				field: 'file',
				message: `This recording overlaps another flight of ${a.registration} (started ${overlap.rows[0].started_at.toISOString().slice(0, 16).replace('T', ' ')}Z); an aircraft flies one flight at a time.`
			};
		}
		// The aircraft's figures as they are now, not as they were when this request began: another
		// upload may have moved them while this one waited for the lock.
		const [current] = await db.select().from(aircraftTable).where(eq(aircraftTable.id, a.id)).limit(1);
		const ac = current ?? a;
		const later = await client.query('SELECT 1 FROM flights WHERE aircraft_id = $1 AND id <> $3 AND started_at > $2 LIMIT 1', [a.id, first, flightId]);
		const newest = later.rowCount === 0;
		const before = await client.query<{ on_board: number | null }>(
			"SELECT (summary->>'onBoardAtShutdownL')::float8 AS on_board FROM flights WHERE aircraft_id = $1 AND id <> $3 AND started_at < $2 ORDER BY started_at DESC LIMIT 1",
			[a.id, first, flightId]
		);
		const previousFlightL = before.rows[0]?.on_board ?? null;
		// The aircraft's own figure is "after the last flight": it only describes the time before
		// this one when this is the newest flight.
		const previousOnBoardL = newest ? (ac.lastOnBoardL ?? previousFlightL) : previousFlightL;
		const problem = declarationProblem(req.declaration, ac, previousOnBoardL);
		if (problem) {
			await client.query('ROLLBACK');
			return { status: 'invalid', field: 'declaration', message: problem };
		}
		const declaration = toDeclaration(req.declaration, ac);

		progress({ phase: 'storing', step: 'summary', rows });
		// Earlier flights only, committed before this upload: read outside this transaction.
		const recent = await recentCruiseFlowLph(ac.id, { id: flightId, startedAt: first });
		const flightColumns = columns.columns();
		const computation = computeFlight({ columns: flightColumns, ...engineInputsOf(fuelSetupOf(ac, recent), { declaration, previousOnBoardL }, []) });
		const flightSummary = summarize(computation);
		const warnings = [...computation.warnings.map((w) => w.message), ...computation.problems.slice(0, 10).map((p) => p.message)];

		progress({ phase: 'storing', step: 'original', rows });
		const report: UploadReport = {
			fileName: req.fileName,
			sizeBytes: bytes,
			sha256,
			origin: summary.origin!,
			mapping: summary.mapping!,
			headerLine: summary.header!.line,
			columns: summary.header!.names,
			ignoredColumns: summary.ignoredColumns,
			rows: summary.rowCount,
			lines: summary.lineCount,
			blankLines: summary.blankLines,
			blankCells: summary.blankCells,
			firstSampleAt: first.toISOString(),
			lastSampleAt: last.toISOString(),
			gapCount: flightSummary.gapCount,
			gapTimeS: flightSummary.gapTimeS,
			warnings,
			parseMs: Math.round(parseMs),
			storeMs: 0
		};
		await db.insert(uploads).values({ id: uploadId, orgId: req.orgId, aircraftId: a.id, uploadedBy: req.userId, fileName: req.fileName.slice(0, 255), sizeBytes: bytes, sha256, report });
		await storeOriginal(client, uploadId, spool, spooled);

		progress({ phase: 'storing', step: 'flight', rows });
		await db
			.update(flights)
			.set({
				pilotId: req.userId,
				title: req.title?.trim() || titleFrom(req.fileName),
				uploadId,
				startedAt: first,
				endedAt: last,
				declaration,
				previousOnBoardL,
				notes: req.notes?.trim() ?? '',
				sampleCount: summary.rowCount,
				lastSeq,
				lastSampleAt: last,
				summary: flightSummary,
				updatedAt: new Date()
			})
			.where(eq(flights.id, flightId));
		// A plan made before this flight for this aircraft and about this time becomes its plan.
		await attachWaitingPlan(db, { id: flightId, aircraftId: a.id, startedAt: first });
		// The history's per-flight and per-phase figures, as recomputeSummary stores them.
		await storeComputedFigures(flightId, { computation, summary: flightSummary }, flightColumns, ac.meterFactor, db);
		if (newest && flightSummary.onBoardAtShutdownL !== null)
			await db.update(aircraftTable).set({ lastOnBoardL: flightSummary.onBoardAtShutdownL, updatedAt: new Date() }).where(eq(aircraftTable.id, a.id));

		report.storeMs = Math.round(performance.now() - startedAt - parseMs);
		await db.update(uploads).set({ report }).where(eq(uploads.id, uploadId));
		progress({ phase: 'storing', step: 'commit', rows });
		await client.query('COMMIT');
		return { status: 'stored', flightId, uploadId, report, summary: flightSummary };
	} catch (error) {
		if (copy) {
			// Abandon the COPY (the server answers CopyFail with an error) before rolling back.
			const c = copy;
			await new Promise<void>((resolve) => {
				c.once('close', () => resolve());
				c.once('error', () => resolve());
				c.destroy(error instanceof Error ? error : new Error(String(error)));
			});
		}
		try {
			await client.query('ROLLBACK');
		} catch {
			clientBroken = true;
		}
		throw error;
	} finally {
		client.off('error', onClientError);
		client.release(clientBroken ? new Error('connection left in an unknown state') : undefined);
		releaseSlot();
	}
}

/** The original bytes, read back from the spool file into upload_chunks by binary COPY. */
async function storeOriginal(client: pg.PoolClient, uploadId: string, spool: FileHandle, size: number): Promise<void> {
	const stream = client.query(copyFrom('COPY upload_chunks (upload_id, n, bytes) FROM STDIN (FORMAT binary)'));
	const failure: { error: Error | null } = { error: null };
	stream.on('error', (e: Error) => (failure.error = e));
	await writeWithBackpressure(stream, copyHeader());
	let n = 0;
	for (let at = 0; at < size; at += CHUNK_BYTES) {
		if (failure.error) throw failure.error;
		// A fresh buffer per piece: the COPY stream may still hold the previous one.
		const piece = Buffer.allocUnsafe(Math.min(CHUNK_BYTES, size - at));
		const { bytesRead } = await spool.read(piece, 0, piece.length, at);
		if (bytesRead !== piece.length) throw new Error('The spooled upload was shorter than what was received.');
		for (const part of chunkTuple(uploadId, n++, piece)) await writeWithBackpressure(stream, part);
	}
	await writeWithBackpressure(stream, copyTrailer());
	stream.end();
	await finished(stream);
	if (failure.error) throw failure.error;
}

/** The original file of an upload, piece by piece, for download or re-parsing. */
export async function* readUploadOriginal(uploadId: string): AsyncGenerator<Buffer> {
	let n = 0;
	for (;;) {
		// A few pieces at a time keeps memory at a few MB whatever the file size.
		const r = await pool.query<{ bytes: Buffer }>('SELECT bytes FROM upload_chunks WHERE upload_id = $1 AND n >= $2 ORDER BY n LIMIT 4', [uploadId, n]);
		if (r.rows.length === 0) return;
		for (const row of r.rows) yield row.bytes;
		n += r.rows.length;
	}
}
