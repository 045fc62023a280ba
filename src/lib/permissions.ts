// What each organisation role may do. Shared by the server (enforcement) and the UI (what to show);
// the UI hiding a button is a courtesy, the server check in lib/server/access.ts is the rule.
export const ROLES = ['admin', 'instructor', 'pilot', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

/**
 * What a personal API token may do: 'read' only reads (GET); 'upload' reads and uploads recorder
 * files (POST /api/v1/flights). Either only within what its owner's roles allow.
 */
export const API_TOKEN_SCOPES = ['read', 'upload'] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];
/** Whether a token of `scope` may do what needs `need`. */
export const scopeAllows = (scope: ApiTokenScope, need: ApiTokenScope) => scope === 'upload' || need === 'read';

export type Permission =
	| 'viewFleet'
	| 'viewAllFlights'
	| 'upload'
	| 'editAnyFlight'
	| 'annotate'
	| 'manageMembers'
	| 'manageAircraft'
	| 'manageRecorders'
	| 'calibrate'
	/** Read the aircraft's pump receipts, reconciliations and calibration history. */
	| 'viewFuelRecords'
	| 'emptyTrash';

const GRANTS: Record<Role, readonly Permission[]> = {
	admin: ['viewFleet', 'viewAllFlights', 'upload', 'editAnyFlight', 'annotate', 'manageMembers', 'manageAircraft', 'manageRecorders', 'calibrate', 'viewFuelRecords', 'emptyTrash'],
	instructor: ['viewFleet', 'viewAllFlights', 'upload', 'editAnyFlight', 'annotate', 'viewFuelRecords'],
	pilot: ['viewFleet', 'upload'],
	viewer: ['viewFleet', 'viewAllFlights', 'viewFuelRecords']
};

export function can(role: Role, permission: Permission): boolean {
	return GRANTS[role].includes(permission);
}

/**
 * What a member may do with one flight:
 * - view: their own (as pilot or instructor), every flight with viewAllFlights, and, for members
 *   who fly (upload), a recorder-opened flight nobody has claimed yet, so its pilot can claim it;
 * - edit: fuel inputs and the flight's details (title, instructor, route): their own if they fly,
 *   or any with editAnyFlight (instructors, admins); the same people move it to the trash and back;
 * - annotate: notes and plans;
 * - claim: a member who flies takes an unclaimed live flight as its pilot;
 * - setPilot: choose any member as the pilot (instructors and admins);
 * - acknowledge: an alarm, for everyone watching; read-only viewers see alarms but do not answer them.
 */
export type FlightAction = 'view' | 'edit' | 'annotate' | 'claim' | 'setPilot' | 'acknowledge';

export interface FlightFacts {
	pilotId: string | null;
	instructorId: string | null;
	source: 'upload' | 'live';
}

/** An unclaimed flight: opened by a recorder with no pilot assigned, nobody has taken it yet. */
export const isUnclaimed = (flight: FlightFacts) => flight.pilotId === null && flight.source === 'live';

export function mayOnFlight(ctx: { user: { id: string }; role: Role }, flight: FlightFacts, action: FlightAction): boolean {
	const own = flight.pilotId === ctx.user.id || flight.instructorId === ctx.user.id;
	const flies = can(ctx.role, 'upload');
	switch (action) {
		case 'view':
			return own || can(ctx.role, 'viewAllFlights') || (flies && isUnclaimed(flight));
		case 'edit':
		case 'acknowledge':
			return (own && flies) || can(ctx.role, 'editAnyFlight');
		case 'annotate':
			return (own && flies) || can(ctx.role, 'annotate');
		case 'claim':
			return flies && isUnclaimed(flight);
		case 'setPilot':
			return can(ctx.role, 'editAnyFlight');
	}
}

export const ROLE_LABELS: Record<Role, string> = {
	admin: 'Admin',
	instructor: 'Instructor',
	pilot: 'Pilot',
	viewer: 'Viewer'
};

export const ROLE_HINTS: Record<Role, string> = {
	admin: 'Manages members, aircraft, recorders and calibration; sees every flight.',
	instructor: 'Sees, corrects and annotates every flight in the organisation.',
	pilot: 'Uploads and flies; sees own flights and the fleet.',
	viewer: 'Read-only: every flight, the fleet, pump receipts and calibration history (e.g. a maintenance shop).'
};
