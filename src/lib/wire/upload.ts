// What POST /api/v1/flights answers, shared by the server, the upload page and scripts' authors.
// Every answer names its case in `outcome`: 'stored' (201) and 'duplicate' (200) are plain JSON;
// every refusal is an RFC 9457 problem ($lib/wire/problem) whose `status` is the HTTP status, with
// `outcome` and the case's own members as extensions: 'rejected' (400, `problems` by line),
// 'invalid' (400/404/409, `field` and `errors`), 'tooLarge' (413, `limitBytes`), 'timeout' (408:
// the body stalled or trickled), 'busy' (429, `retryAfterS`: too many uploads in progress),
// 'error' (anything else). With Accept: application/x-ndjson the answer is NDJSON lines:
// progress, then one result line holding the HTTP status and that answer.
import type { RowProblem } from '$lib/csv/row';
import type { Problem } from './problem';

/** Server-side progress: reading (bytes of the file read, rows accepted) and the storing steps. */
export type UploadProgress =
	| { phase: 'reading'; bytes: number; rows: number }
	| { phase: 'storing'; step: 'checks' | 'summary' | 'original' | 'flight' | 'commit'; rows: number };

export type UploadStored = { outcome: 'stored'; flightId: string; uploadId: string; url: string; rows: number; report: unknown; summary: unknown };
export type UploadDuplicate = { outcome: 'duplicate'; flightId: string; uploadId: string; url: string; message: string };
export type UploadRefusal = Problem &
	(
		| { outcome: 'rejected'; problems: RowProblem[]; problemCount: number }
		| { outcome: 'invalid' | 'tooLarge' | 'timeout' | 'busy' | 'error'; field: string | null; limitBytes?: number; retryAfterS?: number }
	);

export type UploadAnswer = UploadStored | UploadDuplicate | UploadRefusal;

export type UploadLine = { kind: 'progress'; progress: UploadProgress } | { kind: 'result'; httpStatus: number; answer: UploadAnswer };

