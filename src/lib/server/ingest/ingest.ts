// Storing a recorder file as a flight: the bytes stream in once, are counted against the size
// limit, hashed, spooled to a temporary file and parsed as they arrive, the samples encoded for
// binary COPY into a second spool file (spool.ts). Only then, for a file without problems, does the
// upload take a database connection (connection.ts): the samples go by COPY into the samples
// table inside one transaction with their flight row (copy-in.ts), the flight is placed among its
// aircraft's others (placement.ts: duplicate, overlap, newest), then the upload, its original
// bytes and the flight's figures (flights/summary.ts, the one derivation) join them and the
// transaction commits; anything wrong rolls all of it back, so nobody ever sees part of a file.
//
// Why no staging table: COPY has no ON CONFLICT, which matters for live batches, but an upload's
// flight is new in this very transaction, so no sample can conflict. Measured here with 1,000,000
// rows, COPY into a temporary table then INSERT … SELECT took 1.4 s + 5.6 s against 6.7 s for one
// COPY: INSERT … SELECT does not batch rows the way COPY does, and each row's foreign-key check
// costs the same either way.
import { utcDateTime } from '$lib/format';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import type pg from 'pg';
import {
	MAX_UPLOAD_BYTES,
	parseRecorderCsv,
	type ColumnMapping,
	type MappingOrigin,
	type ParseSummary,
	type RowProblem
} from '$lib/csv';
import type { UploadProgress } from '$lib/wire/upload';
import { ColumnBuilder, type FlightInput, type FlightSummary } from '$lib/fuel';
import { engineInputsOf, fuelSetupOf } from '$lib/flight-inputs';
import { aircraftAt } from '../calibration/in-force';
import { declarationProblem, toDeclaration } from '$lib/schemas/declaration';
import { pool } from '../db';
import { flights, uploads, type Aircraft } from '../db/schema';
import { recentCruiseFlowLph } from '../flights/recent-cruise';
import { computeInput, storeDerived, type Computed } from '../flights/summary';
import { attachWaitingPlan } from '../plans';
import { SampleCopyEncoder } from './binary-copy';
import { inUploadTransaction, type UploadDb } from './connection';
import { copyOriginalIn, copySamplesIn } from './copy-in';
import type { DeclarationInput } from './declaration';
import { lockAircraftUploads, placeUpload } from './placement';
import { mappingResolver, profilesForMatching, type MappingRequest, type ProfileForMatching } from './profiles';
import { ReceivedBody, UploadTooLargeError, withSpools, type Spool } from './spool';

export { CHUNK_BYTES, UploadTooLargeError } from './spool';

export type IngestProgress = UploadProgress;

export interface IngestRequest extends MappingRequest {
	orgId: string;
	aircraft: Aircraft;
	userId: string | null;
	fileName: string;
	/** The file's bytes in order. */
	source: AsyncIterable<Uint8Array>;
	declaration: DeclarationInput;
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

function titleFrom(fileName: string): string {
	return fileName.replace(/\.(csv|txt|log)$/i, '').slice(0, 120);
}

/**
 * Stores a recorder file as a flight of `aircraft`, or says exactly why not.
 *
 * Two phases, so a slow or hostile client never holds a database connection: first the body is
 * received, counted, hashed and kept in a spool file while it is parsed, its samples encoded for
 * COPY into a second spool file (a rejected file ends here, having touched no connection); then,
 * with one of the few connections uploads may use, everything goes into the database in one
 * transaction at the speed of the disk.
 */
export async function ingestRecorderFile(req: IngestRequest): Promise<IngestResult> {
	const startedAt = performance.now();
	// Read before the upload takes its connection: a query needing a second connection while every
	// pooled one waits for it would never finish.
	const profiles = await profilesForMatching(req.orgId);
	return withSpools(async (bodySpool, copySpool) => {
		const parsed = await receive(req, profiles, bodySpool, copySpool, startedAt);
		if (!('sha256' in parsed)) return parsed;
		return inUploadTransaction(
			(client, db) => store(req, parsed, { client, db, bodySpool, copySpool }, startedAt),
			(result) => result.status === 'stored'
		);
	});
}

/** A file received and parsed without problems, its samples spooled for COPY. */
interface Received {
	flightId: string;
	summary: ParseSummary;
	columns: ColumnBuilder;
	sha256: string;
	bytes: number;
	rows: number;
	lastSeq: number;
	parseMs: number;
}

// ---- phase 1: receive and parse, no database connection ----------------------------------------
async function receive(req: IngestRequest, profiles: ProfileForMatching[], bodySpool: Spool, copySpool: Spool, startedAt: number): Promise<Received | IngestResult> {
	const body = new ReceivedBody(req.source, bodySpool);
	const flightId = randomUUID();
	const encoder = new SampleCopyEncoder(flightId);
	const columns = new ColumnBuilder();
	let rows = 0;
	let rowIndex = 0;
	let lastSeq = -1;
	let lastProgress = 0;
	let summary: ParseSummary;
	try {
		summary = await parseRecorderCsv(body.chunks(), mappingResolver(req, profiles), {
			densityKgPerL: req.aircraft.densityKgPerL,
			onRows: async (batch) => {
				for (const r of batch) {
					if (!encoder.hasRoom()) await copySpool.append(encoder.take()!);
					// Without the recorder's own numbers, the row's place in the file is its sequence.
					lastSeq = r.seq ?? rowIndex;
					encoder.push(r, lastSeq);
					rowIndex++;
					columns.push(lastSeq, r.tMs, r.flow, r.gs, r.dtg, r.alt, r.wpt);
				}
			},
			// Per chunk of input, good rows or not, so a file full of problems shows progress too.
			onProgress: (p) => {
				rows = p.rows;
				const now = performance.now();
				if (now - lastProgress > 100) {
					lastProgress = now;
					req.onProgress?.({ phase: 'reading', bytes: body.bytes, rows });
				}
			}
		});
	} catch (error) {
		if (error instanceof UploadTooLargeError) return { status: 'tooLarge', limitBytes: MAX_UPLOAD_BYTES, message: error.message };
		throw error;
	}
	const rest = encoder.take();
	if (rest) await copySpool.append(rest);
	req.onProgress?.({ phase: 'reading', bytes: body.bytes, rows });
	if (!summary.ok) {
		return {
			status: 'rejected',
			problems: summary.problems,
			problemCount: summary.problemCount,
			message: `The file was not stored: ${summary.problemCount} ${summary.problemCount === 1 ? 'problem' : 'problems'} found.`
		};
	}
	return { flightId, summary, columns, sha256: body.sha256(), bytes: body.bytes, rows, lastSeq, parseMs: performance.now() - startedAt };
}

// ---- phase 2: one transaction on one of the connections uploads may use --------------------------
async function store(
	req: IngestRequest,
	p: Received,
	on: { client: pg.PoolClient; db: UploadDb; bodySpool: Spool; copySpool: Spool },
	startedAt: number
): Promise<IngestResult> {
	const { client, db } = on;
	const { flightId, summary, rows } = p;
	const progress = (step: 'checks' | 'summary' | 'original' | 'flight' | 'commit') => req.onProgress?.({ phase: 'storing', step, rows });

	// The samples need their flight row first; its real figures are set once the checks pass.
	await db.insert(flights).values({ id: flightId, orgId: req.orgId, aircraftId: req.aircraft.id, source: 'upload', status: 'closed', startedAt: new Date(), declaration: { kind: 'full' } });
	await copySamplesIn(client, on.copySpool);

	progress('checks');
	await lockAircraftUploads(db, req.aircraft.id);
	const first = new Date(summary.firstTMs!);
	const last = new Date(summary.lastTMs!);
	const place = await placeUpload(db, req.aircraft, { flightId, sha256: p.sha256, first, last });
	if (place.kind === 'duplicate')
		return { status: 'duplicate', flightId: place.flightId, uploadId: place.uploadId, message: 'This file was uploaded for this aircraft before; here is that flight.' };
	if (place.kind === 'overlap')
		return {
			status: 'invalid',
			field: 'file',
			message: `This recording overlaps another flight of ${req.aircraft.registration} (started ${utcDateTime(place.startedAt)} UTC); an aircraft flies one flight at a time.`
		};
	const { aircraft: ac, previousOnBoardL } = place;
	const problem = declarationProblem(req.declaration, ac, previousOnBoardL);
	if (problem) return { status: 'invalid', field: 'declaration', message: problem };
	const declaration = toDeclaration(req.declaration, ac);

	progress('summary');
	// Earlier flights only, committed before this upload: read outside this transaction.
	const recent = await recentCruiseFlowLph(ac.id, { id: flightId, startedAt: first });
	// The engine input as loadFlight builds it from the stored rows, so a later recompute agrees.
	// With the meter factor and K-factor in force at this flight's engine start (dated calibration).
	const acAtStart = await aircraftAt(ac, first);
	const input: FlightInput = { columns: p.columns.columns(), ...engineInputsOf(fuelSetupOf(acAtStart, recent), { declaration, previousOnBoardL }, []) };
	const computed = computeInput(input);

	progress('original');
	const uploadId = randomUUID();
	const report = reportOf(req, p, computed, first, last);
	await db.insert(uploads).values({ id: uploadId, orgId: req.orgId, aircraftId: ac.id, uploadedBy: req.userId, fileName: req.fileName.slice(0, 255), sizeBytes: p.bytes, sha256: p.sha256, report });
	await copyOriginalIn(client, uploadId, on.bodySpool);

	progress('flight');
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
			lastSeq: p.lastSeq,
			lastSampleAt: last,
			updatedAt: new Date()
		})
		.where(eq(flights.id, flightId));
	// A plan made before this flight for this aircraft and about this time becomes its plan.
	await attachWaitingPlan(db, { id: flightId, aircraftId: ac.id, startedAt: first });
	await storeDerived({ id: flightId, aircraftId: ac.id }, input, computed, db);

	report.storeMs = Math.round(performance.now() - startedAt - report.parseMs);
	await db.update(uploads).set({ report }).where(eq(uploads.id, uploadId));
	progress('commit');
	return { status: 'stored', flightId, uploadId, report, summary: computed.summary };
}

function reportOf(req: IngestRequest, p: Received, computed: Computed, first: Date, last: Date): UploadReport {
	const s = p.summary;
	const { computation, summary } = computed;
	return {
		fileName: req.fileName,
		sizeBytes: p.bytes,
		sha256: p.sha256,
		origin: s.origin!,
		mapping: s.mapping!,
		headerLine: s.header!.line,
		columns: s.header!.names,
		ignoredColumns: s.ignoredColumns,
		rows: s.rowCount,
		lines: s.lineCount,
		blankLines: s.blankLines,
		blankCells: s.blankCells,
		firstSampleAt: first.toISOString(),
		lastSampleAt: last.toISOString(),
		gapCount: summary.gapCount,
		gapTimeS: summary.gapTimeS,
		warnings: [...computation.warnings.map((w) => w.message), ...computation.problems.slice(0, 10).map((x) => x.message)],
		parseMs: Math.round(p.parseMs),
		storeMs: 0
	};
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
