// Personal API tokens (bdk_…) on the account page: listed, created (shown once, only the hash is
// stored) and revoked by their owner.
import { and, desc, eq, isNull } from 'drizzle-orm';
import { db } from '../db';
import { apiTokens } from '../db/schema';
import { API_TOKEN_PREFIX } from '../hooks/authenticate';
import { hashToken, newToken } from '../tokens';

/** The user's current tokens, newest first; never the token itself. */
export async function listApiTokens(userId: string) {
	return db
		.select({ id: apiTokens.id, name: apiTokens.name, createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt })
		.from(apiTokens)
		.where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
		.orderBy(desc(apiTokens.createdAt));
}

/** A new token for the user; the answer is the only time it is seen. */
export async function createApiToken(userId: string, name: string): Promise<string> {
	const token = newToken(API_TOKEN_PREFIX);
	await db.insert(apiTokens).values({ userId, name, tokenHash: hashToken(token) });
	return token;
}

/** Revokes one of the user's own tokens (another user's id changes nothing). */
export async function revokeApiToken(userId: string, tokenId: string): Promise<void> {
	await db.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId)));
}
