// The progress of a long recompute of an aircraft's flights, as the page polls it
// (/o/[org]/aircraft/[id]/recompute): how many of how many flights, and whether it ended.
export const RECOMPUTE_JOB_STATES = ['running', 'done', 'failed'] as const;
export type RecomputeJobState = (typeof RECOMPUTE_JOB_STATES)[number];

/** What asked for the recompute; words in $lib/labels. */
export const RECOMPUTE_REASONS = ['calibration', 'aircraft'] as const;
export type RecomputeReason = (typeof RECOMPUTE_REASONS)[number];

export interface RecomputeProgress {
	id: string;
	reason: RecomputeReason;
	state: RecomputeJobState;
	done: number;
	total: number;
	/** ISO times. */
	startedAt: string;
	updatedAt: string;
	finishedAt: string | null;
}
