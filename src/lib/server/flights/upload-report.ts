// What a flight keeps from the upload it was made from, for its page: the lines of the recorder
// file that were left out at the uploader's choice (uploads.report, written by ingest).
import { eq } from 'drizzle-orm';
import type { RowProblem } from '$lib/csv';
import { db } from '../db';
import { uploads, type Flight } from '../db/schema';

/** The lines left out of the flight's upload, in file order; empty for a live flight or none left out. */
export async function droppedLinesOf(flight: Pick<Flight, 'uploadId'>): Promise<RowProblem[]> {
	if (!flight.uploadId) return [];
	const [u] = await db.select({ report: uploads.report }).from(uploads).where(eq(uploads.id, flight.uploadId));
	const lines = (u?.report as { droppedLines?: RowProblem[] } | undefined)?.droppedLines;
	return Array.isArray(lines) ? lines : [];
}
