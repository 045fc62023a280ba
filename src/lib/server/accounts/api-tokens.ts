// Personal API tokens (bdk_…) on the account page: listed, created with a scope and an optional
// expiry (shown once, only the hash is stored) and revoked by their owner.
import { and, desc, eq, isNull } from 'drizzle-orm';
import { db } from '../db';
import { apiTokens } from '../db/schema';
import type { ApiTokenScope } from '$lib/permissions';
import { API_TOKEN_PREFIX } from '../hooks/authenticate';
import { hashToken, newToken } from '../tokens';

/** The user's current tokens, newest first; never the token itself. */
export async function listApiTokens(userId: string) {
	return db
		.select({ id: apiTokens.id, name: apiTokens.name, scope: apiTokens.scope, expiresAt: apiTokens.expiresAt, createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt })
		.from(apiTokens)
		.where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
		.orderBy(desc(apiTokens.createdAt));
}

const DAY_MS = 86_400_000;

/** A new token for the user; the answer is the only time it is seen. */
export async function createApiToken(userId: string, o: { name: string; scope: ApiTokenScope; expiresInDays: number | null }): Promise<string> {
	const token = newToken(API_TOKEN_PREFIX);
	const expiresAt = o.expiresInDays === null ? null : new Date(Date.now() + o.expiresInDays * DAY_MS);
	await db.insert(apiTokens).values({ userId, name: o.name, scope: o.scope, expiresAt, tokenHash: hashToken(token) });
	return token;
}

/** Revokes one of the user's own tokens (another user's id changes nothing). */
export async function revokeApiToken(userId: string, tokenId: string): Promise<void> {
	await db.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId)));
}
