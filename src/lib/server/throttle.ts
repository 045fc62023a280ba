// Sign-in throttling per account and per client address, counted from sign_in_attempts.
// OWASP ASVS 2.2.1 asks for no more than 100 failed attempts per hour on one account; we allow
// 10 per 15 minutes (at most 40 an hour) per account and 50 per 15 minutes per address.
import { and, count, eq, gt, lt } from 'drizzle-orm';
import { db } from './db';
import { signInAttempts } from './db/schema';

export const THROTTLE = {
	windowMs: 15 * 60 * 1000,
	perAccount: 10,
	perAddress: 50
} as const;

export type ThrottleVerdict = { allowed: true } | { allowed: false; retryAfterMin: number; scope: 'account' | 'address' };

export async function checkSignInThrottle(email: string, address: string, now = new Date()): Promise<ThrottleVerdict> {
	const since = new Date(now.getTime() - THROTTLE.windowMs);
	const failed = (column: typeof signInAttempts.email | typeof signInAttempts.address, value: string) =>
		db
			.select({ n: count() })
			.from(signInAttempts)
			.where(and(eq(column, value), eq(signInAttempts.success, false), gt(signInAttempts.at, since)))
			.then((r) => r[0]?.n ?? 0);
	const [byAccount, byAddress] = await Promise.all([failed(signInAttempts.email, email), failed(signInAttempts.address, address)]);
	const retryAfterMin = Math.ceil(THROTTLE.windowMs / 60000);
	if (byAccount >= THROTTLE.perAccount) return { allowed: false, retryAfterMin, scope: 'account' };
	if (byAddress >= THROTTLE.perAddress) return { allowed: false, retryAfterMin, scope: 'address' };
	return { allowed: true };
}

export async function recordSignInAttempt(email: string, address: string, success: boolean): Promise<void> {
	await db.insert(signInAttempts).values({ email, address, success });
	// Keep the table small: rows older than a day say nothing to the throttle.
	if (Math.random() < 0.01) {
		await db.delete(signInAttempts).where(lt(signInAttempts.at, new Date(Date.now() - 24 * 3600 * 1000)));
	}
}
