// Recorders of an organisation for the admin page: registering one for an aircraft (its token
// shown once, stored as a SHA-256 hash), revoking, rotating (a new token, the old one refused
// from then on), the pilot flying today, and the list with each recorder's last contact.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { can } from '$lib/permissions';
import { db } from '../db';
import { aircraft, memberships, recorders } from '../db/schema';
import { hashToken, newToken } from '../tokens';
import { RECORDER_TOKEN_PREFIX } from './api';
import { utcDay } from './flights';

/** Enough of the token to tell two apart on screen, far too little to use. */
const hintOf = (token: string) => token.slice(0, RECORDER_TOKEN_PREFIX.length + 6);

export async function listRecorders(orgId: string) {
	return db
		.select({
			id: recorders.id,
			name: recorders.name,
			tokenHint: recorders.tokenHint,
			createdAt: recorders.createdAt,
			lastContactAt: recorders.lastContactAt,
			revokedAt: recorders.revokedAt,
			flyingPilotId: recorders.flyingPilotId,
			flyingOn: recorders.flyingOn,
			aircraftId: aircraft.id,
			registration: aircraft.registration
		})
		.from(recorders)
		.innerJoin(aircraft, eq(aircraft.id, recorders.aircraftId))
		.where(eq(recorders.orgId, orgId))
		.orderBy(asc(aircraft.registration), asc(recorders.createdAt));
}

/** Registers a recorder; the token comes back once and is never readable again. */
export async function registerRecorder(orgId: string, aircraftId: string, name: string): Promise<{ id: string; token: string } | { error: string; field: string }> {
	const [a] = await db.select({ id: aircraft.id }).from(aircraft).where(and(eq(aircraft.id, aircraftId), eq(aircraft.orgId, orgId), isNull(aircraft.archivedAt)));
	if (!a) return { error: 'Choose an aircraft of this organisation.', field: 'aircraftId' };
	const token = newToken(RECORDER_TOKEN_PREFIX);
	const [r] = await db.insert(recorders).values({ orgId, aircraftId, name, tokenHash: hashToken(token), tokenHint: hintOf(token) }).returning({ id: recorders.id });
	return { id: r.id, token };
}

export async function revokeRecorder(orgId: string, recorderId: string): Promise<boolean> {
	const done = await db
		.update(recorders)
		.set({ revokedAt: new Date() })
		.where(and(eq(recorders.id, recorderId), eq(recorders.orgId, orgId), isNull(recorders.revokedAt)))
		.returning({ id: recorders.id });
	return done.length > 0;
}

/**
 * A new token for the same recorder (its flights stay its own); the old token stops working now.
 * A revoked recorder stays revoked: register a new one instead.
 */
export async function rotateRecorder(orgId: string, recorderId: string): Promise<string | null> {
	const token = newToken(RECORDER_TOKEN_PREFIX);
	const done = await db
		.update(recorders)
		.set({ tokenHash: hashToken(token), tokenHint: hintOf(token) })
		.where(and(eq(recorders.id, recorderId), eq(recorders.orgId, orgId), isNull(recorders.revokedAt)))
		.returning({ id: recorders.id });
	return done.length > 0 ? token : null;
}

/**
 * Assigns the pilot flying today (UTC) to a recorder, or clears it (null): the flights it opens
 * today are theirs from the start. The pilot must be a member who flies.
 */
export async function setFlyingToday(orgId: string, recorderId: string, pilotId: string | null): Promise<{ ok: true } | { ok: false; field: string; error: string }> {
	if (pilotId !== null) {
		const [m] = await db.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.orgId, orgId), eq(memberships.userId, pilotId)));
		if (!m || !can(m.role, 'upload')) return { ok: false, field: 'pilotId', error: 'Choose a member of this organisation who flies (a pilot, instructor or admin).' };
	}
	const [r] = await db
		.update(recorders)
		.set({ flyingPilotId: pilotId, flyingOn: pilotId === null ? null : utcDay(new Date()) })
		.where(and(eq(recorders.id, recorderId), eq(recorders.orgId, orgId), isNull(recorders.revokedAt)))
		.returning({ id: recorders.id });
	if (!r) return { ok: false, field: 'id', error: 'That recorder is revoked or not in this organisation.' };
	return { ok: true };
}
