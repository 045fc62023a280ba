// Password reset by e-mailed link: one-time token, valid for an hour, stored as a hash.
import { and, eq, gt, isNull } from 'drizzle-orm';
import { db } from '../db';
import { passwordResets, users } from '../db/schema';
import { link, sendMail } from '../mail';
import { hashToken, newToken } from '../tokens';
import { setPassword } from '../auth';

export const RESET_VALID_MIN = 60;

export async function requestPasswordReset(email: string, origin: string): Promise<void> {
	const user = await db.query.users.findFirst({ where: eq(users.email, email) });
	if (!user) return; // Same answer either way: the page never tells whether an account exists.
	const token = newToken('rst_');
	await db.insert(passwordResets).values({ tokenHash: hashToken(token), userId: user.id, expiresAt: new Date(Date.now() + RESET_VALID_MIN * 60_000) });
	const url = link(`/reset-password/${token}`, origin);
	await sendMail({
		to: user.email,
		subject: 'Reset your Burndown password',
		text: `Someone asked to reset the password of your Burndown account.\n\nChoose a new password here (valid ${RESET_VALID_MIN} minutes, once):\n${url}\n\nIf it was not you, ignore this message; your password stays as it is.`,
		html: `<p>Someone asked to reset the password of your Burndown account.</p><p><a href="${url}">Choose a new password</a> (valid ${RESET_VALID_MIN} minutes, once).</p><p>If it was not you, ignore this message; your password stays as it is.</p>`
	});
}

export async function findResetUser(token: string): Promise<string | null> {
	const row = await db.query.passwordResets.findFirst({
		where: and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date()))
	});
	return row?.userId ?? null;
}

/** Uses the token once: sets the password and ends every session of the account. */
export async function completePasswordReset(token: string, password: string): Promise<string | null> {
	const [row] = await db
		.update(passwordResets)
		.set({ usedAt: new Date() })
		.where(and(eq(passwordResets.tokenHash, hashToken(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, new Date())))
		.returning();
	if (!row) return null;
	await setPassword(row.userId, password);
	return row.userId;
}
