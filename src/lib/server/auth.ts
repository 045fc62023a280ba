// Sessions and passwords: the only module that knows about lucia and argon2.
// Timeouts: a session slides to SESSION_IDLE past its last use and never outlives SESSION_ABSOLUTE.
import { hash, verify } from '@node-rs/argon2';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia, TimeSpan } from 'lucia';
import type { Cookies } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db, type Tx } from './db';
import { sessions, users } from './db/schema';

/** Idle timeout: lucia extends a session when less than half of this is left. */
export const SESSION_IDLE = new TimeSpan(24, 'h');
/** Absolute timeout from sign-in, whatever the activity. */
export const SESSION_ABSOLUTE_MS = 14 * 24 * 3600 * 1000;

/** OWASP Password Storage Cheat Sheet minimum for argon2id: m=19456 KiB, t=2, p=1. */
export const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

const secureCookies = (process.env.ORIGIN ?? '').startsWith('https://');

export const lucia = new Lucia(new DrizzlePostgreSQLAdapter(db, sessions, users), {
	sessionExpiresIn: SESSION_IDLE,
	sessionCookie: {
		name: 'burndown_session',
		attributes: { secure: secureCookies, sameSite: 'lax' }
	},
	getSessionAttributes: (attributes) => ({ createdAt: attributes.createdAt }),
	getUserAttributes: (attributes) => ({
		email: attributes.email,
		name: attributes.name,
		prefFuelUnit: attributes.prefFuelUnit
	})
});

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseSessionAttributes: { createdAt: Date };
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

/** Starts a fresh session (never reuses one) and sets its cookie. */
export async function startSession(userId: string, cookies: Cookies): Promise<void> {
	const session = await lucia.createSession(userId, { createdAt: new Date() });
	const cookie = lucia.createSessionCookie(session.id);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
}

export async function endSession(sessionId: string, cookies: Cookies): Promise<void> {
	await lucia.invalidateSession(sessionId);
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/** Validates the cookie's session, enforcing the absolute timeout and refreshing the cookie. */
export async function readSession(
	cookies: Cookies
): Promise<{ user: AuthUser | null; session: AuthSession | null }> {
	const sessionId = cookies.get(lucia.sessionCookieName);
	if (!sessionId) return { user: null, session: null };
	const { session, user } = await lucia.validateSession(sessionId);
	if (session && Date.now() - session.createdAt.getTime() > SESSION_ABSOLUTE_MS) {
		await endSession(session.id, cookies);
		return { user: null, session: null };
	}
	if (session?.fresh) {
		const cookie = lucia.createSessionCookie(session.id);
		cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	}
	if (!session) {
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
	}
	return { user, session };
}

/** Stores a new password hash and ends every session of the account, inside the caller's transaction. */
export async function replacePassword(tx: Tx, userId: string, passwordHash: string): Promise<void> {
	await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
	await tx.delete(sessions).where(eq(sessions.userId, userId));
}
