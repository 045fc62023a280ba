// Signing in and signing up: the throttles, the password check and the e-mails around them, kept
// out of the routes so the rules can be tested without a browser.
import { and, eq, gt, lt } from 'drizzle-orm';
import { generateIdFromEntropySize } from 'lucia';
import { db } from '../db';
import { pendingSignUps, users } from '../db/schema';
import { dummyPasswordHash, hashPassword, replacePassword, verifyPassword } from '../auth';
import { inBackground, link, sendMail } from '../mail';
import { beginSignInAttempt, settleSignInAttempt, takeRateLimit } from '../throttle';
import { hashToken, newToken } from '../tokens';

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

export const SIGN_UP_VALID_HOURS = 24;

export type SignUpResult = { ok: true } | { ok: false; reason: 'throttled' };

/**
 * Starts a sign-up: the same answer, and the same work before it, whether or not the address has
 * an account. A new address gets a link that creates the account; an existing one gets a note to
 * its owner instead (OWASP Authentication Cheat Sheet: account enumeration).
 */
export async function startSignUp(input: { name: string; email: string; password: string; next: string }, address: string, origin: string): Promise<SignUpResult> {
	if (await takeRateLimit([{ bucket: 'sign-up:address', key: address }])) return { ok: false, reason: 'throttled' };
	const passwordHash = await hashPassword(input.password);
	inBackground('sign-up e-mail', async () => {
		const existing = await db.query.users.findFirst({ where: eq(users.email, input.email), columns: { id: true } });
		if (existing) {
			await sendMail({
				to: input.email,
				subject: 'Someone tried to create a Burndown account with your address',
				text:
					`This address already has a Burndown account, so no new account was made.\n\n` +
					`If it was you, sign in here: ${link('/sign-in', origin)}\n` +
					`Forgot the password? Choose a new one here: ${link('/reset-password', origin)}\n\n` +
					`If it was not you, ignore this message; nothing changed.`
			});
			return;
		}
		// Keep the table small: links past their day are of no use.
		if (Math.random() < 0.05) await db.delete(pendingSignUps).where(lt(pendingSignUps.expiresAt, new Date()));
		const token = newToken('sgn_');
		await db.insert(pendingSignUps).values({
			tokenHash: hashToken(token),
			email: input.email,
			name: input.name,
			passwordHash,
			next: input.next,
			expiresAt: new Date(Date.now() + SIGN_UP_VALID_HOURS * 3600_000)
		});
		await sendMail({
			to: input.email,
			subject: 'Finish creating your Burndown account',
			text:
				`Someone (we hope you) asked to create a Burndown account for this address.\n\n` +
				`Open this link to finish (valid ${SIGN_UP_VALID_HOURS} hours, once):\n${link(`/sign-up/${token}`, origin)}\n\n` +
				`If it was not you, ignore this message; no account is made.`
		});
	});
	return { ok: true };
}

/** The pending sign-up behind a link, if it is still open. */
export async function findPendingSignUp(token: string) {
	return (
		(await db.query.pendingSignUps.findFirst({
			where: and(eq(pendingSignUps.tokenHash, hashToken(token)), gt(pendingSignUps.expiresAt, new Date())),
			columns: { email: true, name: true }
		})) ?? null
	);
}

/**
 * Uses a sign-up link once: creates the account, and voids every other pending sign-up of the
 * address. Null when the link is unknown, expired or used, or the address got an account meanwhile.
 */
export async function completeSignUp(token: string): Promise<{ userId: string; next: string } | null> {
	return db.transaction(async (tx) => {
		const [row] = await tx
			.delete(pendingSignUps)
			.where(and(eq(pendingSignUps.tokenHash, hashToken(token)), gt(pendingSignUps.expiresAt, new Date())))
			.returning();
		if (!row) return null;
		await tx.delete(pendingSignUps).where(eq(pendingSignUps.email, row.email));
		const id = generateIdFromEntropySize(10);
		const inserted = await tx
			.insert(users)
			.values({ id, name: row.name, email: row.email, passwordHash: row.passwordHash })
			.onConflictDoNothing()
			.returning({ id: users.id });
		return inserted.length ? { userId: id, next: row.next } : null;
	});
}

export type ChangePasswordResult = 'done' | 'wrong-current' | { throttled: number };

/**
 * Changes a signed-in user's password after checking the current one. The check counts against
 * the sign-in throttle like a sign-in, so this form is no side door for guessing; the change ends
 * every other session of the account and keeps this one.
 */
export async function changePassword(user: { id: string; email: string }, current: string, next: string, sessionId: string | null, address: string): Promise<ChangePasswordResult> {
	const attempt = await beginSignInAttempt(user.email, address);
	if (!attempt.allowed) return { throttled: attempt.retryAfterMin };
	const row = await db.query.users.findFirst({ where: eq(users.id, user.id), columns: { passwordHash: true } });
	const ok = !!row && (await verifyPassword(row.passwordHash, current));
	await settleSignInAttempt(attempt.attemptId, ok);
	if (!ok) return 'wrong-current';
	const passwordHash = await hashPassword(next);
	await db.transaction((tx) => replacePassword(tx, user.id, passwordHash, sessionId ?? undefined));
	return 'done';
}
