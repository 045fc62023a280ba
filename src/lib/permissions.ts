// What each organisation role may do. Shared by the server (enforcement) and the UI (what to show);
// the UI hiding a button is a courtesy, the server check in lib/server/access.ts is the rule.
export const ROLES = ['admin', 'instructor', 'pilot', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

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
	| 'viewFuelRecords';

const GRANTS: Record<Role, readonly Permission[]> = {
	admin: ['viewFleet', 'viewAllFlights', 'upload', 'editAnyFlight', 'annotate', 'manageMembers', 'manageAircraft', 'manageRecorders', 'calibrate', 'viewFuelRecords'],
	instructor: ['viewFleet', 'viewAllFlights', 'upload', 'editAnyFlight', 'annotate', 'viewFuelRecords'],
	pilot: ['viewFleet', 'upload'],
	viewer: ['viewFleet', 'viewAllFlights', 'viewFuelRecords']
};

export function can(role: Role, permission: Permission): boolean {
	return GRANTS[role].includes(permission);
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
