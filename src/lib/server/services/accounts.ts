// Signing in and signing up: the throttles, the password check and the e-mails around them, kept
// out of the routes so the rules can be tested without a browser.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { users } from '../db/schema';
import { dummyPasswordHash, verifyPassword } from '../auth';
import { beginSignInAttempt, settleSignInAttempt } from '../throttle';

export type SignInResult =
	| { ok: true; userId: string }
	| { ok: false; reason: 'throttled'; scope: 'account' | 'address'; retryAfterMin: number }
	| { ok: false; reason: 'mismatch' };

/** Checks a password against the account, within the sign-in throttle. */
export async function signInWithPassword(email: string, password: string, address: string): Promise<SignInResult> {
	// Counted (as a failure until it proves otherwise) before the password is verified.
	const attempt = await beginSignInAttempt(email, address);
	if (!attempt.allowed) return { ok: false, reason: 'throttled', scope: attempt.scope, retryAfterMin: attempt.retryAfterMin };
	const user = await db.query.users.findFirst({ where: eq(users.email, email) });
	const ok = await verifyPassword(user?.passwordHash ?? (await dummyPasswordHash()), password);
	await settleSignInAttempt(attempt.attemptId, ok && !!user);
	if (!user || !ok) return { ok: false, reason: 'mismatch' };
	return { ok: true, userId: user.id };
}
