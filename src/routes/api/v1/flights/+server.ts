// POST /api/v1/flights: upload a recorder file for an aircraft given by id (multipart/form-data
// with the fields before the file, or text/csv with the fields in the query string). The same
// checks and answers as the upload page: handleUpload reads the fields, then checks membership
// and the upload permission with requireAircraft before reading the file. Answer shapes are in
// $lib/wire/upload.ts; the README section "Uploading from scripts" shows curl examples.
import { handleUpload } from '$lib/server/ingest/respond';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = (event) => handleUpload(event);
