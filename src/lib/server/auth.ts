// Sessions and passwords: the only module that knows about lucia and argon2.
// Timeouts: a session slides to SESSION_IDLE past its last use and never outlives SESSION_ABSOLUTE.
// The cookie carries a random token; lucia's session id (the table's key) is its SHA-256, so a
// leaked sessions table holds nothing that signs anyone in.
import { hash, verify } from '@node-rs/argon2';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia, TimeSpan } from 'lucia';
import type { Cookies } from '@sveltejs/kit';
import { and, desc, eq, ne } from 'drizzle-orm';
import { serverConfig } from './config';
import { db, type Tx } from './db';
import { sessions, users } from './db/schema';
import { hashToken, newToken } from './tokens';

/** Idle timeout: lucia extends a session when less than half of this is left. */
export const SESSION_IDLE = new TimeSpan(24, 'h');
/** Absolute timeout from sign-in, whatever the activity. */
export const SESSION_ABSOLUTE_MS = 14 * 24 * 3600 * 1000;

/** OWASP Password Storage Cheat Sheet minimum for argon2id: m=19456 KiB, t=2, p=1. */
export const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

const secureCookies = (serverConfig().ORIGIN ?? '').startsWith('https://');

export const lucia = new Lucia(new DrizzlePostgreSQLAdapter(db, sessions, users), {
	sessionExpiresIn: SESSION_IDLE,
	sessionCookie: {
		name: 'burndown_session',
		attributes: { secure: secureCookies, sameSite: 'lax' }
	},
	getSessionAttributes: (attributes) => ({ createdAt: attributes.createdAt, lastSeenAt: attributes.lastSeenAt }),
	getUserAttributes: (attributes) => ({
		email: attributes.email,
		name: attributes.name,
		prefFuelUnit: attributes.prefFuelUnit,
		timeZone: attributes.timeZone
	})
});

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseSessionAttributes: { createdAt: Date; lastSeenAt?: Date; userAgent?: string | null };
		DatabaseUserAttributes: Omit<typeof users.$inferSelect, 'id'>;
	}
}

export type AuthUser = NonNullable<Awaited<ReturnType<typeof lucia.validateSession>>['user']>;
export type AuthSession = NonNullable<Awaited<ReturnType<typeof lucia.validateSession>>['session']>;

export function hashPassword(password: string): Promise<string> {
	return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}

/** A hash to verify against when the account does not exist, so timing does not tell. */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
	dummyHash ??= hashPassword('not-a-real-password-for-timing');
	return dummyHash;
}

/** How often "last seen" is written: often enough to tell devices apart, not on every request. */
const LAST_SEEN_EVERY_MS = 5 * 60 * 1000;

function setSessionCookie(cookies: Cookies, token: string): void {
	const cookie = lucia.createSessionCookie(token);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
}

function clearSessionCookie(cookies: Cookies): void {
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/** Starts a fresh session (never reuses one) and sets its cookie; only the token's hash is stored. */
export async function startSession(userId: string, cookies: Cookies, userAgent?: string | null): Promise<void> {
	const token = newToken();
	const now = new Date();
	await lucia.createSession(userId, { createdAt: now, lastSeenAt: now, userAgent: userAgent?.slice(0, 200) ?? null }, { sessionId: hashToken(token) });
	setSessionCookie(cookies, token);
}

export async function endSession(sessionId: string, cookies: Cookies): Promise<void> {
	await lucia.invalidateSession(sessionId);
	clearSessionCookie(cookies);
}

/** Validates the cookie's session, enforcing the absolute timeout and refreshing the cookie. */
export async function readSession(
	cookies: Cookies
): Promise<{ user: AuthUser | null; session: AuthSession | null }> {
	const token = cookies.get(lucia.sessionCookieName);
	if (!token) return { user: null, session: null };
	const { session, user } = await lucia.validateSession(hashToken(token));
	if (session && Date.now() - session.createdAt.getTime() > SESSION_ABSOLUTE_MS) {
		await endSession(session.id, cookies);
		return { user: null, session: null };
	}
	if (session?.fresh) setSessionCookie(cookies, token);
	if (!session) clearSessionCookie(cookies);
	if (session && (!session.lastSeenAt || Date.now() - session.lastSeenAt.getTime() > LAST_SEEN_EVERY_MS)) {
		await db.update(sessions).set({ lastSeenAt: new Date() }).where(eq(sessions.id, session.id));
	}
	return { user, session };
}

/** What the account page shows of a session: no id, no token. */
export interface SessionSummary {
	createdAt: Date;
	lastSeenAt: Date;
	expiresAt: Date;
	userAgent: string | null;
	current: boolean;
}

/** The account's live sessions, newest first, with the one of this request marked. */
export async function listSessions(userId: string, currentSessionId: string | null): Promise<SessionSummary[]> {
	const rows = await db.select().from(sessions).where(eq(sessions.userId, userId)).orderBy(desc(sessions.createdAt));
	return rows
		.filter((r) => r.expiresAt.getTime() > Date.now() && Date.now() - r.createdAt.getTime() <= SESSION_ABSOLUTE_MS)
		.map((r) => ({ createdAt: r.createdAt, lastSeenAt: r.lastSeenAt, expiresAt: r.expiresAt, userAgent: r.userAgent, current: r.id === currentSessionId }))
		.sort((a, b) => Number(b.current) - Number(a.current) || b.createdAt.getTime() - a.createdAt.getTime());
}

/** Ends every session of the account except this one. */
export async function endOtherSessions(userId: string, currentSessionId: string): Promise<void> {
	await db.delete(sessions).where(and(eq(sessions.userId, userId), ne(sessions.id, currentSessionId)));
}

/** Ends every session of the account, this one included, and clears this device's cookie. */
export async function endAllSessions(userId: string, cookies: Cookies): Promise<void> {
	await lucia.invalidateUserSessions(userId);
	clearSessionCookie(cookies);
}

/**
 * Stores a new password hash and ends every session of the account (but `keepSessionId`, the
 * device that changed it), inside the caller's transaction.
 */
export async function replacePassword(tx: Tx, userId: string, passwordHash: string, keepSessionId?: string): Promise<void> {
	await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
	await tx.delete(sessions).where(keepSessionId ? and(eq(sessions.userId, userId), ne(sessions.id, keepSessionId)) : eq(sessions.userId, userId));
}
