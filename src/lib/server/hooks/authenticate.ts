// Who is calling: a personal API token (Authorization: Bearer bdk_…, on /api/ paths only: the
// pages and their form actions take the session cookie) or the session cookie. An expired token
// authenticates nobody, and the 401 says it expired.
import type { Handle } from '@sveltejs/kit';
import { and, eq, isNull } from 'drizzle-orm';
import { readSession } from '../auth';
import { db } from '../db';
import { apiTokens, users } from '../db/schema';
import { hashToken } from '../tokens';

export const API_TOKEN_PREFIX = 'bdk_';

export const authenticate: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	event.locals.authVia = null;
	event.locals.apiToken = null;
	event.locals.authProblem = null;

	const authorization = event.request.headers.get('authorization') ?? '';
	const bearer = authorization.startsWith('Bearer ') ? authorization.slice(7).trim() : '';
	if (bearer.startsWith(API_TOKEN_PREFIX) && event.url.pathname.startsWith('/api/')) {
		const [row] = await db
			.select({ user: users, tokenId: apiTokens.id, scope: apiTokens.scope, expiresAt: apiTokens.expiresAt })
			.from(apiTokens)
			.innerJoin(users, eq(users.id, apiTokens.userId))
			.where(and(eq(apiTokens.tokenHash, hashToken(bearer)), isNull(apiTokens.revokedAt)))
			.limit(1);
		if (row?.expiresAt && row.expiresAt.getTime() <= Date.now()) {
			event.locals.authProblem = `This API token expired at ${row.expiresAt.toISOString()}; create a new one on the account page.`;
		} else if (row) {
			const { id, email, name, prefFuelUnit, timeZone } = row.user;
			event.locals.user = { id, email, name, prefFuelUnit, timeZone };
			event.locals.authVia = 'token';
			event.locals.apiToken = { id: row.tokenId, scope: row.scope };
			await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
		}
	} else if (!event.url.pathname.startsWith('/api/v1/live/')) {
		const { user, session } = await readSession(event.cookies);
		event.locals.user = user;
		event.locals.session = session;
		event.locals.authVia = user ? 'session' : null;
	}
	return resolve(event);
};
