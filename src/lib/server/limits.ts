// How much of the server uploads and heavy exports may take at once, so that a few slow or large
// requests can never hold every database connection or all the memory: concurrent uploads per
// account, per organisation and in all; database connections for storing uploads; the pace a
// request body must keep; concurrent heavy exports. Read from the environment at each use
// (defaults below, documented in DEVELOPERS.md), so a test or an operator can change them.

function envNumber(name: string, fallback: number, min: number): number {
	const raw = process.env[name];
	if (raw === undefined || raw.trim() === '') return fallback;
	const n = Number(raw);
	return Number.isFinite(n) && n >= min ? n : fallback;
}

export interface UploadLimits {
	/** Uploads one account may have in progress at once. */
	perAccount: number;
	/** Uploads one organisation may have in progress at once. */
	perOrg: number;
	/** Uploads in progress on this server at once (each holds a spool file and its columns). */
	total: number;
	/** Uploads storing into the database at once: at most this many pooled connections go to uploads. */
	dbConnections: number;
	/** A body that sends nothing for this long is stopped (408). */
	idleMs: number;
	/** After graceMs, a body must have averaged at least this many bytes per second (else 408). */
	minBytesPerS: number;
	graceMs: number;
}

export function uploadLimits(): UploadLimits {
	return {
		perAccount: envNumber('UPLOAD_MAX_PER_ACCOUNT', 2, 1),
		perOrg: envNumber('UPLOAD_MAX_PER_ORG', 4, 1),
		total: envNumber('UPLOAD_MAX_TOTAL', 8, 1),
		dbConnections: envNumber('UPLOAD_DB_CONNECTIONS', 2, 1),
		idleMs: envNumber('UPLOAD_IDLE_TIMEOUT_S', 30, 0.01) * 1000,
		minBytesPerS: envNumber('UPLOAD_MIN_BYTES_PER_S', 4096, 0),
		graceMs: envNumber('UPLOAD_MIN_RATE_AFTER_S', 30, 0) * 1000
	};
}

export interface ExportLimits {
	/** Fuel-log exports of heavy flights that may run at once; more answer 429. */
	heavyConcurrent: number;
	/** A flight with at least this many samples counts as heavy. */
	heavySamples: number;
}

export function exportLimits(): ExportLimits {
	return {
		heavyConcurrent: envNumber('EXPORT_MAX_HEAVY', 2, 1),
		heavySamples: envNumber('EXPORT_HEAVY_SAMPLES', 100_000, 0)
	};
}

/** A refusal because too much is already in progress: answered 429 with a wait. */
export class BusyError extends Error {
	constructor(
		message: string,
		readonly retryAfterS: number
	) {
		super(message);
	}
}

/** Counts of requests in progress by key, in this process. */
export class Counter {
	private counts = new Map<string, number>();
	get(key: string): number {
		return this.counts.get(key) ?? 0;
	}
	add(key: string, d: 1 | -1): void {
		const n = this.get(key) + d;
		if (n <= 0) this.counts.delete(key);
		else this.counts.set(key, n);
	}
}

const uploadsInProgress = new Counter();

/**
 * Takes a place for an upload of `userId` to organisation `orgId`, or throws BusyError saying which
 * limit is reached. The returned function gives the place back (calling it twice is harmless).
 */
export function takeUploadSlot(userId: string, orgId: string, limits = uploadLimits()): () => void {
	const user = `user:${userId}`;
	const org = `org:${orgId}`;
	if (uploadsInProgress.get(user) >= limits.perAccount)
		throw new BusyError(`You already have ${limits.perAccount} uploads in progress; wait for one to finish, then send this file again. Nothing was stored.`, 10);
	if (uploadsInProgress.get(org) >= limits.perOrg)
		throw new BusyError(`Your organisation already has ${limits.perOrg} uploads in progress; wait for one to finish, then send this file again. Nothing was stored.`, 10);
	if (uploadsInProgress.get('all') >= limits.total) throw new BusyError('The server is busy with other uploads; send this file again in a minute. Nothing was stored.', 30);
	for (const k of [user, org, 'all']) uploadsInProgress.add(k, 1);
	let given = false;
	return () => {
		if (given) return;
		given = true;
		for (const k of [user, org, 'all']) uploadsInProgress.add(k, -1);
	};
}

/** A counting semaphore: at most `limit()` holders; the others wait in order. */
export class Semaphore {
	private held = 0;
	private waiting: (() => void)[] = [];
	constructor(private limit: () => number) {}

	async acquire(): Promise<() => void> {
		if (this.held >= this.limit()) await new Promise<void>((resolve) => this.waiting.push(resolve));
		else this.held++;
		return this.releaser();
	}

	/** A place now, or null when all are taken (for answering 429 instead of waiting). */
	tryAcquire(): (() => void) | null {
		if (this.held >= this.limit()) return null;
		this.held++;
		return this.releaser();
	}

	/** Gives the place back once, however often it is called. */
	private releaser(): () => void {
		let released = false;
		return () => {
			if (released) return;
			released = true;
			const next = this.waiting.shift();
			// The place passes straight to the next waiter.
			if (next) next();
			else this.held--;
		};
	}
}

/** Uploads writing into the database; the rest of the pool stays for ordinary requests. */
export const uploadConnections = new Semaphore(() => uploadLimits().dbConnections);

/** Heavy fuel-log exports in progress. */
export const heavyExports = new Semaphore(() => exportLimits().heavyConcurrent);
