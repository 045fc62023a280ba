// Throttling: sign-in failures per account and per client address, counted from sign_in_attempts,
// and simple rate limits (reset requests, sign-ups) counted from rate_limit_events.
// Each check takes a transaction-scoped advisory lock on its keys, counts, and records the attempt
// before any password is verified, so parallel requests cannot all pass one stale count.
// OWASP ASVS 2.2.1 (4.0) asks for no more than 100 failed attempts per hour on one account; we allow
// 10 per 15 minutes (at most 40 an hour) per account and 50 per 15 minutes per address.
import { and, count, eq, gt, lt, sql } from 'drizzle-orm';
import { db, type Tx } from './db';
import { rateLimitEvents, signInAttempts } from './db/schema';

export const THROTTLE = {
	windowMs: 15 * 60 * 1000,
	perAccount: 10,
	perAddress: 50
} as const;

/** Other rate limits: at most `max` requests per `windowMs` for one key. */
export const RATE_LIMITS = {
	/** Reset e-mails to one account: enough for a lost message or two, not a mail bomb. */
	'reset:account': { max: 3, windowMs: 60 * 60 * 1000 },
	'reset:address': { max: 20, windowMs: 60 * 60 * 1000 },
	/** Sign-ups from one client address (a club's shared connection may bring a few). */
	'sign-up:address': { max: 20, windowMs: 60 * 60 * 1000 }
} as const;
export type RateBucket = keyof typeof RATE_LIMITS;

export type ThrottleVerdict = { allowed: true } | { allowed: false; retryAfterMin: number; scope: 'account' | 'address' };

/** Waits for the transaction-scoped lock on one throttle key (released at commit or rollback). */
async function lockKey(tx: Tx, key: string): Promise<void> {
	await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`);
}

async function failures(tx: Tx, column: typeof signInAttempts.email | typeof signInAttempts.address, value: string, since: Date): Promise<number> {
	const [row] = await tx
		.select({ n: count() })
		.from(signInAttempts)
		.where(and(eq(column, value), eq(signInAttempts.success, false), gt(signInAttempts.at, since)));
	return row?.n ?? 0;
}

/**
 * Counts the failures in the window and, when under both limits, records this attempt as a
 * failure before the caller verifies anything; `settleSignInAttempt` turns it into a success.
 */
export async function beginSignInAttempt(
	email: string,
	address: string,
	now = new Date()
): Promise<({ allowed: true; attemptId: number }) | Extract<ThrottleVerdict, { allowed: false }>> {
	const since = new Date(now.getTime() - THROTTLE.windowMs);
	const retryAfterMin = Math.ceil(THROTTLE.windowMs / 60000);
	return db.transaction(async (tx) => {
		// Always the account first, then the address: every waiter holds at most the account lock,
		// so two attempts never wait on each other crosswise.
		await lockKey(tx, `sign-in:account:${email}`);
		await lockKey(tx, `sign-in:address:${address}`);
		if ((await failures(tx, signInAttempts.email, email, since)) >= THROTTLE.perAccount) return { allowed: false, retryAfterMin, scope: 'account' as const };
		if ((await failures(tx, signInAttempts.address, address, since)) >= THROTTLE.perAddress) return { allowed: false, retryAfterMin, scope: 'address' as const };
		const [row] = await tx.insert(signInAttempts).values({ email, address, success: false, at: now }).returning({ id: signInAttempts.id });
		return { allowed: true as const, attemptId: row.id };
	});
}

/** Records how a begun attempt ended; a success no longer counts against either limit. */
export async function settleSignInAttempt(attemptId: number, success: boolean): Promise<void> {
	if (success) await db.update(signInAttempts).set({ success: true }).where(eq(signInAttempts.id, attemptId));
	// Keep the table small: rows older than a day say nothing to the throttle.
	if (Math.random() < 0.01) {
		await db.delete(signInAttempts).where(lt(signInAttempts.at, new Date(Date.now() - 24 * 3600 * 1000)));
	}
}

/** The real owner, proven by a reset link, is not kept out by someone else's guesses. */
export async function clearSignInFailures(email: string): Promise<void> {
	await db.delete(signInAttempts).where(and(eq(signInAttempts.email, email), eq(signInAttempts.success, false)));
}

/**
 * Counts one request against each bucket's limit, atomically; refused requests are not counted.
 * Returns the first bucket that is full, or null when the request may go on.
 */
export async function takeRateLimit(keys: { bucket: RateBucket; key: string }[], now = new Date()): Promise<RateBucket | null> {
	return db.transaction(async (tx) => {
		const ordered = [...keys].sort((a, b) => `${a.bucket}:${a.key}`.localeCompare(`${b.bucket}:${b.key}`));
		for (const k of ordered) await lockKey(tx, `rate:${k.bucket}:${k.key}`);
		for (const k of ordered) {
			const since = new Date(now.getTime() - RATE_LIMITS[k.bucket].windowMs);
			const [row] = await tx
				.select({ n: count() })
				.from(rateLimitEvents)
				.where(and(eq(rateLimitEvents.bucket, k.bucket), eq(rateLimitEvents.key, k.key), gt(rateLimitEvents.at, since)));
			if ((row?.n ?? 0) >= RATE_LIMITS[k.bucket].max) return k.bucket;
		}
		await tx.insert(rateLimitEvents).values(ordered.map((k) => ({ bucket: k.bucket, key: k.key, at: now })));
		if (Math.random() < 0.01) await tx.delete(rateLimitEvents).where(lt(rateLimitEvents.at, new Date(now.getTime() - 24 * 3600 * 1000)));
		return null;
	});
}
