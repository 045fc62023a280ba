// Progress of a long recompute of an aircraft's flights, for the page that asked for it: a row
// written on its own pool connection (committed at once, so another request can read it) while the
// change's transaction recomputes one flight at a time. The row says 'done' only after that
// transaction committed, and 'failed' when it rolled back — the stored figures change all at once
// at the commit, never flight by flight, so the page never shows half a recompute as stored.
import { and, desc, eq } from 'drizzle-orm';
import type { RecomputeProgress, RecomputeReason } from '$lib/wire/recompute';
import { db } from '../db';
import { recomputeJobs, type RecomputeJob } from '../db/schema';

/** What a recompute loop reports: the number of flights first, then each flight done. */
export interface Progress {
	begin(total: number): Promise<void>;
	step(done: number): Promise<void>;
}

/** Progress rows are written at most this often (and always for the last flight). */
export const PROGRESS_EVERY_MS = 250;

/**
 * Runs `work` with a progress that records a job of `aircraftId`, then marks it done when `work`
 * resolved (its transaction committed) or failed when it threw. No row when `work` never began.
 */
export async function withRecomputeJob<T>(aircraftId: string, reason: RecomputeReason, userId: string | null, work: (p: Progress) => Promise<T>, opts: { everyMs?: number; onBegin?: (id: string) => void } = {}): Promise<T> {
	const every = opts.everyMs ?? PROGRESS_EVERY_MS;
	let id: string | null = null;
	let total = 0;
	let lastWrite = 0;
	const progress: Progress = {
		async begin(n) {
			total = n;
			const [row] = await db.insert(recomputeJobs).values({ aircraftId, reason, total: n, startedBy: userId }).returning({ id: recomputeJobs.id });
			id = row.id;
			lastWrite = Date.now();
			opts.onBegin?.(id);
		},
		async step(done) {
			if (!id) return;
			const now = Date.now();
			if (done < total && now - lastWrite < every) return;
			lastWrite = now;
			await db.update(recomputeJobs).set({ done, updatedAt: new Date(now) }).where(eq(recomputeJobs.id, id));
		}
	};
	const end = async (state: 'done' | 'failed') => {
		if (!id) return;
		const now = new Date();
		await db
			.update(recomputeJobs)
			.set({ state, updatedAt: now, finishedAt: now, ...(state === 'done' ? { done: total } : {}) })
			.where(eq(recomputeJobs.id, id));
	};
	try {
		const out = await work(progress);
		await end('done');
		return out;
	} catch (e) {
		await end('failed').catch(() => {});
		throw e;
	}
}

export const progressView = (j: RecomputeJob): RecomputeProgress => ({
	id: j.id,
	reason: j.reason,
	state: j.state,
	done: j.done,
	total: j.total,
	startedAt: j.startedAt.toISOString(),
	updatedAt: j.updatedAt.toISOString(),
	finishedAt: j.finishedAt?.toISOString() ?? null
});

/** The aircraft's newest recompute (running or ended); null when there never was one. */
export async function latestRecompute(aircraftId: string, jobId?: string): Promise<RecomputeProgress | null> {
	const [row] = await db
		.select()
		.from(recomputeJobs)
		.where(jobId ? and(eq(recomputeJobs.aircraftId, aircraftId), eq(recomputeJobs.id, jobId)) : eq(recomputeJobs.aircraftId, aircraftId))
		.orderBy(desc(recomputeJobs.startedAt), desc(recomputeJobs.id))
		.limit(1);
	return row ? progressView(row) : null;
}
