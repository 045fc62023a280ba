// POST /api/v1/flights: upload a recorder file for an aircraft (multipart/form-data, or text/csv
// with the fields in the query string). Same checks and answer as the upload page; see
// src/lib/server/ingest/respond.ts for the answer's shape and /work/notes/csv-format.md.
import { handleUpload } from '$lib/server/ingest/respond';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = (event) => handleUpload(event);
