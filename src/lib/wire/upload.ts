// What POST /api/v1/flights answers, shared by the server, the upload page and scripts' authors:
// a JSON body whose `status` names the case, or NDJSON lines (progress, then that body).
// 'timeout' (408): the body stalled or trickled; 'busy' (429): too many uploads in progress.
import type { RowProblem } from '$lib/csv/row';

/** Server-side progress: reading (bytes of the file read, rows accepted) and the storing steps. */
export type UploadProgress =
	| { phase: 'reading'; bytes: number; rows: number }
	| { phase: 'storing'; step: 'checks' | 'summary' | 'original' | 'flight' | 'commit'; rows: number };

export type UploadAnswer =
	| { status: 'stored'; flightId: string; uploadId: string; url: string; rows: number; report: unknown; summary: unknown }
	/** inTrash: the earlier flight is in the trash; url then is the trash page. */
	| { status: 'duplicate'; flightId: string; uploadId: string; url: string; inTrash: boolean; error: string }
	/** droppable: every problem is a line of its own and few enough to leave out (send dropBadLines=1). */
	| { status: 'rejected'; error: string; problems: RowProblem[]; problemCount: number; droppable: boolean }
	| { status: 'invalid' | 'tooLarge' | 'timeout' | 'busy' | 'error'; error: string; field: string | null; errors?: Record<string, string>; limitBytes?: number; retryAfterS?: number };

export type UploadLine = ({ type: 'progress' } & UploadProgress) | ({ type: 'result'; httpStatus: number } & UploadAnswer);
