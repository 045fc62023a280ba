// What POST /api/v1/flights answers, shared by the server, the upload page and scripts' authors.
// Every answer names its case in `outcome`: 'stored' (201) and 'duplicate' (200) are plain JSON;
// every refusal is an RFC 9457 problem ($lib/wire/problem) whose `status` is the HTTP status, with
// `outcome` and the case's own members as extensions: 'rejected' (400, `problems` by line),
// 'invalid' (400/404/409, `field` and `errors`), 'tooLarge' (413, `limitBytes`), 'timeout' (408:
// the body stalled or trickled), 'busy' (429, `retryAfterS`: too many uploads in progress),
// 'error' (anything else). With Accept: application/x-ndjson the answer is NDJSON lines:
// progress, then one result line holding the HTTP status and that answer.
import type { RowProblem } from '$lib/csv/row';
import { z } from 'zod';
import { problemSchema, type Problem } from './problem';

/** Server-side progress: reading (bytes of the file read, rows accepted) and the storing steps. */
export type UploadProgress =
	| { phase: 'reading'; bytes: number; rows: number }
	| { phase: 'storing'; step: 'checks' | 'summary' | 'original' | 'flight' | 'commit'; rows: number };

const answerOfFlight = {
	flightId: z.uuid(),
	uploadId: z.uuid(),
	url: z.string().describe("The flight's page.")
};

export const uploadStoredSchema = z.object({
	outcome: z.literal('stored'),
	...answerOfFlight,
	rows: z.number().int().describe('Samples stored.'),
	report: z.unknown().describe('What the reader found: layout, columns, gaps, times.'),
	summary: z.unknown().describe("The flight's computed figures, canonical units (litres, seconds).")
});
export type UploadStored = z.infer<typeof uploadStoredSchema>;

export const uploadDuplicateSchema = z.object({ outcome: z.literal('duplicate'), ...answerOfFlight, message: z.string() });
export type UploadDuplicate = z.infer<typeof uploadDuplicateSchema>;

const rowProblemSchema = z.object({ line: z.number().int(), column: z.string(), value: z.string(), message: z.string() }) satisfies z.ZodType<RowProblem>;

export const uploadRefusalSchema = problemSchema.extend({
	outcome: z.enum(['rejected', 'invalid', 'tooLarge', 'timeout', 'busy', 'error']),
	field: z.string().nullable().optional().describe('The form field or query parameter at fault.'),
	problems: z.array(rowProblemSchema).optional().describe("rejected: the file's problems by line (the first ones)."),
	problemCount: z.number().int().optional().describe('rejected: how many problems in all.'),
	limitBytes: z.number().int().optional().describe('tooLarge: the size limit.'),
	retryAfterS: z.number().int().optional().describe('busy: seconds to wait (also in Retry-After).')
});
export type UploadRefusal = Problem &
	(
		| { outcome: 'rejected'; problems: RowProblem[]; problemCount: number }
		| { outcome: 'invalid' | 'tooLarge' | 'timeout' | 'busy' | 'error'; field: string | null; limitBytes?: number; retryAfterS?: number }
	);

export type UploadAnswer = UploadStored | UploadDuplicate | UploadRefusal;

export type UploadLine = { kind: 'progress'; progress: UploadProgress } | { kind: 'result'; httpStatus: number; answer: UploadAnswer };

