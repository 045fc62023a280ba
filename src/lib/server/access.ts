// Authorization at every server boundary: each load, form action and +server.ts handler calls one
// of these. Not a member (or no such thing) → 404, so nothing outside your organisations is
// revealed; a member without the permission → 403. Each records its decision on event.locals.access,
// which the authorization guard checks on every answer of a non-public route.
import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { and, eq, gt, isNotNull, isNull, or } from 'drizzle-orm';
import { can, mayOnFlight, scopeAllows, type ApiTokenScope, type FlightAction, type Permission, type Role } from '$lib/permissions';
import { SESSION_ABSOLUTE_MS, type AuthUser } from './auth';
import { db } from './db';
import { aircraft, apiTokens, flights, memberships, organisations, recorders, sessions, type Aircraft, type Flight, type Organisation, type Recorder } from './db/schema';
import { hashToken } from './tokens';

type Event = Pick<RequestEvent, 'locals' | 'url' | 'route'> & { request?: Request };

const granted = (event: Event) => {
	event.locals.access = 'granted';
};
/** Records the refusal, then throws it (error() and redirect() never return). */
function refuse(event: Event, raise: () => never): never {
	event.locals.access = 'refused';
	raise();
}

export interface OrgContext {
	user: AuthUser;
	org: Organisation;
	role: Role;
}

// The per-flight rule lives in $lib/permissions (the UI shows what the server allows).
export { mayOnFlight, type FlightAction };

const isApi = (event: Event) => event.route.id?.startsWith('/api/') ?? event.url.pathname.startsWith('/api/');

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * The signed-in user. A personal API token must also have the scope for what the request does:
 * what the endpoint declared through apiHandler, else reading (GET, HEAD) needs 'read' and anything
 * else 'upload' — every helper below passes here, so every endpoint enforces it.
 */
export function requireUser(event: Event): AuthUser {
	const user = event.locals.user;
	if (user) {
		const token = event.locals.authVia === 'token' ? event.locals.apiToken : null;
		const need: ApiTokenScope = event.locals.needScope ?? (SAFE_METHODS.has(event.request?.method ?? 'GET') ? 'read' : 'upload');
		if (token && !scopeAllows(token.scope, need))
			refuse(event, () => error(403, 'This API token may only read (scope "read"). Uploading needs a token with the scope "read and upload"; create one on the account page.'));
		granted(event);
		return user;
	}
	if (isApi(event)) refuse(event, () => error(401, event.locals.authProblem ?? 'Sign in, or send an API token as a bearer credential.'));
	refuse(event, () => redirect(303, `/sign-in?next=${encodeURIComponent(event.url.pathname + event.url.search)}`));
}

/** The signed-in user's membership of the organisation `slug`, optionally with a permission. */
export async function requireMember(event: Event, slug: string, permission?: Permission): Promise<OrgContext> {
	const user = requireUser(event);
	// A NUL byte (from /o/%00) cannot be sent to PostgreSQL as text: no such organisation.
	if (slug.includes('\u0000')) refuse(event, () => error(404, 'Organisation not found.'));
	const [row] = await db
		.select({ org: organisations, role: memberships.role })
		.from(organisations)
		.innerJoin(memberships, and(eq(memberships.orgId, organisations.id), eq(memberships.userId, user.id)))
		.where(eq(organisations.slug, slug))
		.limit(1);
	if (!row) refuse(event, () => error(404, 'Organisation not found.'));
	if (permission && !can(row.role, permission)) refuse(event, () => error(403, 'Your role in this organisation does not allow that.'));
	granted(event);
	return { user, org: row.org, role: row.role };
}

/** An aircraft of the organisation, with a permission checked for the member. */
export async function requireAircraft(
	event: Event,
	slug: string,
	aircraftId: string,
	permission: Permission = 'viewFleet'
): Promise<OrgContext & { aircraft: Aircraft }> {
	const ctx = await requireMember(event, slug);
	const found = isUuid(aircraftId)
		? await db.query.aircraft.findFirst({ where: and(eq(aircraft.id, aircraftId), eq(aircraft.orgId, ctx.org.id)) })
		: undefined;
	if (!found) refuse(event, () => error(404, 'Aircraft not found.'));
	if (!can(ctx.role, permission)) refuse(event, () => error(403, 'Your role in this organisation does not allow that.'));
	granted(event);
	return { ...ctx, aircraft: found };
}

/** A flight of the organisation that the member may view / edit / annotate. */
export async function requireFlight(
	event: Event,
	slug: string,
	flightId: string,
	action: FlightAction = 'view',
	/** 'trashed' for restoring a flight from the trash; every other use sees only kept flights. */
	state: 'kept' | 'trashed' = 'kept'
): Promise<OrgContext & { flight: Flight }> {
	const ctx = await requireMember(event, slug);
	const flight = isUuid(flightId)
		? await db.query.flights.findFirst({ where: and(eq(flights.id, flightId), eq(flights.orgId, ctx.org.id), state === 'kept' ? isNull(flights.deletedAt) : isNotNull(flights.deletedAt)) })
		: undefined;
	if (!flight) refuse(event, () => error(404, 'Flight not found.'));
	if (!mayOnFlight(ctx, flight, 'view')) refuse(event, () => error(403, 'This flight belongs to another pilot.'));
	if (!mayOnFlight(ctx, flight, action)) refuse(event, () => error(403, 'Your role does not allow changing this flight.'));
	granted(event);
	return { ...ctx, flight };
}

/**
 * A flight by id alone, for the versioned API: the organisation is found from the flight, then
 * the same membership rules apply. Unknown flight and foreign organisation both answer 404.
 */
export async function requireFlightById(event: Event, flightId: string, action: FlightAction = 'view') {
	requireUser(event);
	const row = isUuid(flightId)
		? await db
				.select({ slug: organisations.slug })
				.from(flights)
				.innerJoin(organisations, eq(organisations.id, flights.orgId))
				.where(and(eq(flights.id, flightId), isNull(flights.deletedAt)))
				.limit(1)
		: [];
	if (!row[0]) refuse(event, () => error(404, 'Flight not found.'));
	return requireFlight(event, row[0].slug, flightId, action);
}

export const RECORDER_TOKEN_PREFIX = 'bdr_';

/** The recorder a request's bearer token belongs to, if the token is current. */
export async function recorderOf(request: Request): Promise<Recorder | null> {
	const header = request.headers.get('authorization') ?? '';
	const token = header.startsWith('Bearer ') ? header.slice(7).trim() : '';
	if (!token.startsWith(RECORDER_TOKEN_PREFIX) || token.length > 200) return null;
	const [r] = await db
		.select()
		.from(recorders)
		.where(and(eq(recorders.tokenHash, hashToken(token)), isNull(recorders.revokedAt)))
		.limit(1);
	return r ?? null;
}

/**
 * A recorder's bearer token (bdr_…) on /api/v1/live/*: the recorder, or null, and then the caller
 * answers 401 in the recorder API's own words (lib/server/live/api.ts).
 */
export async function requireRecorder(event: Event & { request: Request }): Promise<Recorder | null> {
	const recorder = await recorderOf(event.request);
	event.locals.access = recorder ? 'granted' : 'refused';
	return recorder;
}

/**
 * What a long-lived answer (a live stream) was authorized with, so it can be asked again later:
 * the user, the credential (session id, or the hash of the API token) and the flight.
 */
export interface FlightGrant {
	userId: string;
	flightId: string;
	credential: { kind: 'session'; sessionId: string } | { kind: 'token'; tokenHash: string } | null;
}

export function flightGrant(event: Event, flightId: string): FlightGrant {
	const user = requireUser(event);
	let credential: FlightGrant['credential'] = null;
	if (event.locals.authVia === 'session' && event.locals.session) credential = { kind: 'session', sessionId: event.locals.session.id };
	else if (event.locals.authVia === 'token') {
		const header = event.request?.headers.get('authorization') ?? '';
		const bearer = header.startsWith('Bearer ') ? header.slice(7).trim() : '';
		if (bearer) credential = { kind: 'token', tokenHash: hashToken(bearer) };
	}
	return { userId: user.id, flightId, credential };
}

/**
 * Whether a grant still holds: the session is not signed out or expired (idle or absolute), the
 * API token is not revoked nor expired, and the user may still view the flight (member of its organisation
 * with the role, or their own flight). Any doubt, such as an unknown credential, answers false.
 */
export async function grantHolds(grant: FlightGrant): Promise<boolean> {
	const c = grant.credential;
	if (!c) return false;
	if (c.kind === 'session') {
		const [s] = await db
			.select({ createdAt: sessions.createdAt })
			.from(sessions)
			.where(and(eq(sessions.id, c.sessionId), eq(sessions.userId, grant.userId), gt(sessions.expiresAt, new Date())))
			.limit(1);
		if (!s || Date.now() - s.createdAt.getTime() > SESSION_ABSOLUTE_MS) return false;
	} else {
		const [t] = await db
			.select({ id: apiTokens.id })
			.from(apiTokens)
			.where(
				and(eq(apiTokens.tokenHash, c.tokenHash), eq(apiTokens.userId, grant.userId), isNull(apiTokens.revokedAt), or(isNull(apiTokens.expiresAt), gt(apiTokens.expiresAt, new Date())))
			)
			.limit(1);
		if (!t) return false;
	}
	const [row] = await db
		.select({ flight: flights, role: memberships.role })
		.from(flights)
		.innerJoin(memberships, and(eq(memberships.orgId, flights.orgId), eq(memberships.userId, grant.userId)))
		.where(and(eq(flights.id, grant.flightId), isNull(flights.deletedAt)))
		.limit(1);
	if (!row) return false;
	return mayOnFlight({ user: { id: grant.userId }, role: row.role }, row.flight, 'view');
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (s: string) => UUID.test(s);
