// Password reset by e-mailed link: one-time token, valid for an hour, stored as a hash.
// A request answers at once and the same way whatever happens next: the look-up, the token and
// the e-mail run in the background, after the rate limit (OWASP Forgot Password Cheat Sheet).
import { and, eq, gt, isNull } from 'drizzle-orm';
import { db } from '../db';
import { apiTokens, passwordResets, users } from '../db/schema';
import { inBackground, link, sendMail } from '../mail';
import { hashToken, newToken } from '../tokens';
import { hashPassword, replacePassword } from '../auth';
import { clearSignInFailures, takeRateLimit } from '../throttle';

export const RESET_VALID_MIN = 60;

/** Never tells whether the account exists, nor whether the request was over the limit. */
export async function requestPasswordReset(email: string, address: string, origin: string): Promise<void> {
	const refused = await takeRateLimit([
		{ bucket: 'reset:account', key: email },
		{ bucket: 'reset:address', key: address }
	]);
	if (refused) return;
	inBackground('password reset e-mail', async () => {
		const user = await db.query.users.findFirst({ where: eq(users.email, email) });
		if (!user) return;
		const token = newToken('rst_');
		await db.insert(passwordResets).values({ tokenHash: hashToken(token), userId: user.id, expiresAt: new Date(Date.now() + RESET_VALID_MIN * 60_000) });
		const url = link(`/reset-password/${token}`, origin);
		await sendMail({
			to: user.email,
			subject: 'Reset your Burndown password',
			text:
				`Someone asked to reset the password of your Burndown account.\n\n` +
				`Choose a new password here (valid ${RESET_VALID_MIN} minutes, once):\n${url}\n\n` +
				`Saving a new password signs you out everywhere else, revokes your personal API tokens ` +
				`(scripts will need a new one) and voids any other reset link.\n\n` +
				`If it was not you, ignore this message; your password stays as it is.`
		});
	});
}

export async function findResetUser(token: string): Promise<string | null> {
	const row = await db.query.passwordResets.findFirst({
		where: and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date()))
	});
	return row?.userId ?? null;
}

/**
 * Uses the token once, in one transaction: voids every other reset link of the account, sets the
 * password, ends every session and revokes the personal API tokens. The caller starts a fresh
 * session for this device.
 */
export async function completePasswordReset(token: string, password: string): Promise<string | null> {
	const passwordHash = await hashPassword(password); // outside the transaction: argon2 is slow
	const userId = await db.transaction(async (tx) => {
		const [row] = await tx
			.update(passwordResets)
			.set({ usedAt: new Date() })
			.where(and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date())))
			.returning();
		if (!row) return null;
		await tx.update(passwordResets).set({ usedAt: new Date() }).where(and(eq(passwordResets.userId, row.userId), isNull(passwordResets.usedAt)));
		await replacePassword(tx, row.userId, passwordHash);
		await tx.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.userId, row.userId), isNull(apiTokens.revokedAt)));
		return row.userId;
	});
	if (userId) {
		const user = await db.query.users.findFirst({ where: eq(users.id, userId), columns: { email: true } });
		if (user) await clearSignInFailures(user.email);
	}
	return userId;
}
