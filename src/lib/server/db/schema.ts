// Every table of Burndown, each with its row types beside it. Fuel quantities are stored in
// canonical units (litres, litres per hour, knots, NM, feet); display units are applied at the edge.
// Column names become snake_case through Drizzle's casing option (see db/index.ts, drizzle.config.ts).
import { sql } from 'drizzle-orm';
import type { PlanLeg } from '../../fuel/plan';
import type { FlightSummary } from '../../fuel/summary';
import type { Declaration } from '../../fuel/types';
import { DEBRIEF_STATUSES } from '../../wire/plan';
import { CORRECTION_KINDS, type CorrectionSnapshot } from '../../wire/corrections';
import type { ReserveRuleId } from '../../fuel/reserve';
import { reserveRuleIdSchema, storedReserveRule } from '../../schemas/reserve';
import {
	bigint,
	boolean,
	check,
	customType,
	date,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { PHASE_NAMES } from '../../fuel/phases';
import { alarmKinds, FUEL_EVENT_KINDS } from '../../fuel/types';
import { API_TOKEN_SCOPES, ROLES } from '../../permissions';
import { fuelTypes, fuelUnits } from '../../units';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });
/**
 * A reserve rule id (text). A write of an id that is not one of ours is refused (zod throws before
 * the query is sent); a stored one that is not ours anyway (older rows, edited by hand) reads as
 * null, "unknown rule", which the pages show and compute without a reserve — never a crash.
 */
const reserveRuleText = customType<{ data: ReserveRuleId | null; driverData: string }>({
	dataType: () => 'text',
	toDriver: (value) => reserveRuleIdSchema.parse(value),
	fromDriver: (value) => {
		const id = storedReserveRule(value);
		if (id === null) console.warn(`[db] a stored reserve rule "${String(value)}" is not one Burndown knows; read as unknown`);
		return id;
	}
});
const tstz = (name?: string) =>
	name ? timestamp(name, { withTimezone: true, precision: 3 }) : timestamp({ withTimezone: true, precision: 3 });

export const roleEnum = pgEnum('member_role', ROLES);
export const apiTokenScopeEnum = pgEnum('api_token_scope', API_TOKEN_SCOPES);
export const fuelTypeEnum = pgEnum('fuel_type', fuelTypes);
export const fuelUnitEnum = pgEnum('fuel_unit', fuelUnits);
export const flightSourceEnum = pgEnum('flight_source', ['upload', 'live']);
export const flightStatusEnum = pgEnum('flight_status', ['open', 'closed']);
export const fuelEventKindEnum = pgEnum('fuel_event_kind', FUEL_EVENT_KINDS);
export const fuelCorrectionKindEnum = pgEnum('fuel_correction_kind', CORRECTION_KINDS);
export const alarmKindEnum = pgEnum('alarm_kind', alarmKinds);
export const debriefStatusEnum = pgEnum('debrief_status', DEBRIEF_STATUSES);
export const flightPhaseEnum = pgEnum('flight_phase', PHASE_NAMES);
/** Where a calibration entry's factors came from: a reconciliation of pump receipts, or typed by hand. */
export const calibrationSourceEnum = pgEnum('calibration_source', ['reconciliation', 'hand', 'initial']);

// ---- accounts -------------------------------------------------------------------------------

export const users = pgTable('users', {
	id: text().primaryKey(),
	email: text().notNull().unique(),
	name: text().notNull(),
	passwordHash: text().notNull(),
	/** Preferred display unit for fuel; null = each aircraft's own unit. */
	prefFuelUnit: fuelUnitEnum(),
	/** IANA time zone the user reads local times in beside UTC; null = the browser's own zone. */
	timeZone: text(),
	createdAt: tstz().notNull().defaultNow()
});
export type User = typeof users.$inferSelect;

export const sessions = pgTable(
	'sessions',
	{
		/** SHA-256 (hex) of the random token in the cookie; never the token itself. */
		id: text().primaryKey(),
		userId: text()
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		expiresAt: tstz().notNull(),
		/** Start of the session, for the absolute timeout (lucia only slides expiresAt). */
		createdAt: tstz().notNull().defaultNow(),
		/** Last request seen, written at most every few minutes (the account page's list). */
		lastSeenAt: tstz().notNull().defaultNow(),
		/** The browser's User-Agent at sign-in, cut to 200 characters, to tell devices apart. */
		userAgent: text()
	},
	(t) => [index().on(t.userId)]
);
export type Session = typeof sessions.$inferSelect;

/** One row per sign-in attempt, for throttling per account and per address. */
export const signInAttempts = pgTable(
	'sign_in_attempts',
	{
		id: bigint({ mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
		email: text().notNull(),
		address: text().notNull(),
		success: boolean().notNull(),
		at: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.email, t.at), index().on(t.address, t.at)]
);

/**
 * One row per counted request for the other rate limits (password-reset requests, sign-ups),
 * by bucket ('reset:account', 'sign-up:address', …) and key (an address or an e-mail).
 */
export const rateLimitEvents = pgTable(
	'rate_limit_events',
	{
		id: bigint({ mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
		bucket: text().notNull(),
		key: text().notNull(),
		at: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.bucket, t.key, t.at)]
);

export const passwordResets = pgTable('password_resets', {
	tokenHash: text().primaryKey(),
	userId: text()
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	expiresAt: tstz().notNull(),
	usedAt: tstz()
});

/**
 * Sign-ups waiting for their e-mailed link: the account is created only when the link is used,
 * so the sign-up page answers the same whether or not the address already has an account.
 */
export const pendingSignUps = pgTable(
	'pending_sign_ups',
	{
		tokenHash: text().primaryKey(),
		email: text().notNull(),
		name: text().notNull(),
		passwordHash: text().notNull(),
		/** Where to go once the account exists (already checked by safeNext). */
		next: text().notNull(),
		createdAt: tstz().notNull().defaultNow(),
		expiresAt: tstz().notNull()
	},
	(t) => [index().on(t.email)]
);

/** Personal tokens for scripts calling the JSON API (shown once, stored as a hash). */
export const apiTokens = pgTable('api_tokens', {
	id: uuid().primaryKey().defaultRandom(),
	userId: text()
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	name: text().notNull(),
	tokenHash: text().notNull().unique(),
	/** Tokens made before scopes existed could upload; they keep that. */
	scope: apiTokenScopeEnum().notNull().default('upload'),
	/** Null: until revoked. */
	expiresAt: tstz(),
	createdAt: tstz().notNull().defaultNow(),
	lastUsedAt: tstz(),
	revokedAt: tstz()
});
export type ApiToken = typeof apiTokens.$inferSelect;

// ---- organisations ---------------------------------------------------------------------------

export const organisations = pgTable('organisations', {
	id: uuid().primaryKey().defaultRandom(),
	name: text().notNull(),
	slug: text().notNull().unique(),
	createdAt: tstz().notNull().defaultNow()
});
export type Organisation = typeof organisations.$inferSelect;

export const memberships = pgTable(
	'memberships',
	{
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		userId: text()
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: roleEnum().notNull(),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.orgId, t.userId] }), index().on(t.userId)]
);
export type Membership = typeof memberships.$inferSelect;
export type Role = (typeof roleEnum.enumValues)[number];

export const invitations = pgTable(
	'invitations',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		email: text().notNull(),
		role: roleEnum().notNull(),
		tokenHash: text().notNull().unique(),
		invitedBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow(),
		expiresAt: tstz().notNull(),
		acceptedAt: tstz(),
		acceptedBy: text().references(() => users.id, { onDelete: 'set null' }),
		revokedAt: tstz()
	},
	(t) => [index().on(t.orgId)]
);
export type Invitation = typeof invitations.$inferSelect;

// ---- aircraft --------------------------------------------------------------------------------

export const aircraft = pgTable(
	'aircraft',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		registration: text().notNull(),
		type: text().notNull(),
		engine: text().notNull().default(''),
		fuelType: fuelTypeEnum().notNull(),
		densityKgPerL: doublePrecision().notNull(),
		capacityL: doublePrecision().notNull(),
		lowerLevelL: doublePrecision(),
		unusableL: doublePrecision().notNull().default(0),
		displayUnit: fuelUnitEnum().notNull(),
		meterFactor: doublePrecision().notNull().default(1),
		kFactor: doublePrecision(),
		lowFuelL: doublePrecision(),
		lowEnduranceMin: doublePrecision(),
		reserveRule: reserveRuleText().notNull(),
		reserveCustomMin: doublePrecision(),
		baselineCruiseLph: doublePrecision(),
		/** Fuel on board after the last flight closed, for "unchanged since last flight". */
		lastOnBoardL: doublePrecision(),
		archivedAt: tstz(),
		createdAt: tstz().notNull().defaultNow(),
		updatedAt: tstz().notNull().defaultNow()
	},
	(t) => [uniqueIndex().on(t.orgId, t.registration)]
);
export type Aircraft = typeof aircraft.$inferSelect;

/**
 * The aircraft's dated calibration history: every change of meter factor and K-factor, with its
 * author and old → new for both. An entry with `inForceFrom` applies to every flight whose engine
 * start is at or after it, until the next entry's; the factor a flight is computed with is the
 * newest entry in force at its engine start (server/calibration/factors.ts). An entry without
 * `inForceFrom` was recorded only (a reconciliation looked at, nothing applied). An 'initial'
 * entry keeps the factors every flight had before the first dated change.
 */
export const calibrations = pgTable(
	'calibrations',
	{
		id: uuid().primaryKey().defaultRandom(),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'cascade' }),
		source: calibrationSourceEnum().notNull().default('hand'),
		/** Fuel used without any meter factor, and fuel pumped, litres; null for a hand edit. */
		indicatedL: doublePrecision(),
		pumpedL: doublePrecision(),
		meterFactorOld: doublePrecision().notNull(),
		meterFactorNew: doublePrecision().notNull(),
		kFactorOld: doublePrecision(),
		kFactorNew: doublePrecision(),
		inForceFrom: tstz(),
		/** The two fill-to-full receipts of the reconciliation the factors came from. */
		receiptFromId: uuid().references(() => pumpReceipts.id, { onDelete: 'set null' }),
		receiptToId: uuid().references(() => pumpReceipts.id, { onDelete: 'set null' }),
		/** Flights whose stored figures were recomputed when the entry was written. */
		flightsRecomputed: integer().notNull().default(0),
		note: text().notNull().default(''),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.aircraftId, t.createdAt), index().on(t.aircraftId, t.inForceFrom)]
);
export type Calibration = typeof calibrations.$inferSelect;

/**
 * Fuel actually pumped into an aircraft, as the receipt says: the amount as entered (any unit)
 * and in litres, whether the tanks were filled to full. Two fill-to-full receipts bound a
 * reconciliation window (fuel/reconcile.ts).
 */
export const pumpReceipts = pgTable(
	'pump_receipts',
	{
		id: uuid().primaryKey().defaultRandom(),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'cascade' }),
		at: tstz().notNull(),
		airfield: text().notNull().default(''),
		amount: doublePrecision().notNull(),
		unit: fuelUnitEnum().notNull(),
		amountL: doublePrecision().notNull(),
		filledToFull: boolean().notNull(),
		note: text().notNull().default(''),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.aircraftId, t.at)]
);
export type PumpReceipt = typeof pumpReceipts.$inferSelect;

// ---- flights and samples ---------------------------------------------------------------------

export const uploads = pgTable(
	'uploads',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'cascade' }),
		uploadedBy: text().references(() => users.id, { onDelete: 'set null' }),
		fileName: text().notNull(),
		sizeBytes: integer().notNull(),
		sha256: text().notNull(),
		/** The parse report: rows read, gaps, the mapping used, warnings. */
		report: jsonb().notNull(),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [uniqueIndex().on(t.aircraftId, t.sha256)]
);
export type Upload = typeof uploads.$inferSelect;

/**
 * The original bytes of an upload, kept for re-parsing and download, in pieces of up to 1 MiB:
 * a 100 MB file in one bytea value would have to sit in memory several times over on its way in.
 */
export const uploadChunks = pgTable(
	'upload_chunks',
	{
		uploadId: uuid()
			.notNull()
			.references(() => uploads.id, { onDelete: 'cascade' }),
		/** 0, 1, 2, … in file order. */
		n: integer().notNull(),
		bytes: bytea().notNull()
	},
	(t) => [primaryKey({ columns: [t.uploadId, t.n] })]
);

export const importProfiles = pgTable(
	'import_profiles',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		/** Normalised header line the profile applies to automatically. */
		headerSignature: text().notNull(),
		mapping: jsonb().notNull(),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [uniqueIndex().on(t.orgId, t.name), index().on(t.orgId, t.headerSignature)]
);
export type ImportProfile = typeof importProfiles.$inferSelect;

export const recorders = pgTable(
	'recorders',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		tokenHash: text().notNull().unique(),
		/** First characters of the token, to tell tokens apart on screen. */
		tokenHint: text().notNull(),
		createdAt: tstz().notNull().defaultNow(),
		lastContactAt: tstz(),
		revokedAt: tstz(),
		/** The pilot flying today: flights this recorder opens on flyingOn (a UTC day) are theirs. */
		flyingPilotId: text().references(() => users.id, { onDelete: 'set null' }),
		flyingOn: date({ mode: 'string' })
	},
	(t) => [index().on(t.aircraftId)]
);
export type Recorder = typeof recorders.$inferSelect;

export const flights = pgTable(
	'flights',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'restrict' }),
		pilotId: text().references(() => users.id, { onDelete: 'set null' }),
		instructorId: text().references(() => users.id, { onDelete: 'set null' }),
		title: text().notNull().default(''),
		/** The route as the pilot writes it (e.g. "KSTR – FENNY – KSTR"); free text, not the plan. */
		route: text().notNull().default(''),
		source: flightSourceEnum().notNull(),
		status: flightStatusEnum().notNull(),
		uploadId: uuid().references(() => uploads.id, { onDelete: 'set null' }),
		recorderId: uuid().references(() => recorders.id, { onDelete: 'set null' }),
		startedAt: tstz().notNull(),
		endedAt: tstz(),
		/** The start-of-flight declaration (engine Declaration, canonical litres). */
		declaration: jsonb().$type<Declaration>().notNull(),
		/** Fuel on board before the declaration applies (for "added"/"removed"). */
		previousOnBoardL: doublePrecision(),
		/** False when a live flight assumed the last known fuel: the pilot should confirm. */
		declarationConfirmed: boolean().notNull().default(true),
		notes: text().notNull().default(''),
		sampleCount: integer().notNull().default(0),
		/** The recorder sequence a live flight starts at (recorders need not count from 0). */
		firstSeq: integer().notNull().default(0),
		/** Highest recorder sequence stored (live) or the last row number (upload). */
		lastSeq: integer().notNull().default(-1),
		lastSampleAt: tstz(),
		/** Cached flight summary for lists; recomputed whenever samples or fuel inputs change. */
		summary: jsonb().$type<FlightSummary>(),
		/**
		 * The version of the derivation (DERIVED_VERSION in server/flights/summary.ts) that wrote
		 * summary and the history figures; older rows are recomputed at start (flights/refresh.ts).
		 */
		derivedVersion: integer().notNull().default(0),
		createdAt: tstz().notNull().defaultNow(),
		updatedAt: tstz().notNull().defaultNow(),
		/** In the trash since then: hidden everywhere, restorable, really deleted when the trash is emptied. */
		deletedAt: tstz(),
		deletedBy: text().references(() => users.id, { onDelete: 'set null' })
	},
	(t) => [
		index().on(t.orgId, t.startedAt),
		index().on(t.aircraftId, t.startedAt),
		index().on(t.pilotId, t.startedAt),
		index('flights_open_idx').on(t.status).where(sql`${t.status} = 'open'`)
	]
);
export type Flight = typeof flights.$inferSelect;

/**
 * One row per recorder sample, keyed (flight, seq) so a sample is never stored twice.
 * flow is L/h, gs kt, dtg NM, alt ft; a null is "not recorded in this sample".
 *
 * flight_id refers to flights.id, but not through a FOREIGN KEY: a foreign key checks every row
 * on its own, which doubled the time of a million-row upload. Statement-level triggers with
 * transition tables (migration 0002) check each insert as one set and delete a flight's samples
 * with the flight.
 */
export const samples = pgTable(
	'samples',
	{
		flightId: uuid().notNull(),
		seq: integer().notNull(),
		t: tstz().notNull(),
		flow: doublePrecision(),
		gs: doublePrecision(),
		dtg: doublePrecision(),
		wpt: text(),
		lat: doublePrecision(),
		lon: doublePrecision(),
		alt: doublePrecision()
	},
	(t) => [primaryKey({ columns: [t.flightId, t.seq] })]
);
export type SampleRow = typeof samples.$inferSelect;

export const fuelEvents = pgTable(
	'fuel_events',
	{
		id: uuid().primaryKey().defaultRandom(),
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		t: tstz().notNull(),
		kind: fuelEventKindEnum().notNull(),
		amountL: doublePrecision(),
		note: text().notNull().default(''),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.flightId, t.t)]
);
export type FuelEventRow = typeof fuelEvents.$inferSelect;

/**
 * The audit trail of a flight's fuel inputs: who changed the start-of-flight declaration or added
 * or removed a fuel event, when, from what to what, and why. Written in the transaction of the
 * change; `before`/`after` are snapshots (a CorrectionSnapshot, canonical litres), null for an
 * event that did not exist before or no longer exists after.
 */
export const fuelCorrections = pgTable(
	'fuel_corrections',
	{
		id: uuid().primaryKey().defaultRandom(),
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		userId: text().references(() => users.id, { onDelete: 'set null' }),
		kind: fuelCorrectionKindEnum().notNull(),
		before: jsonb().$type<CorrectionSnapshot>(),
		after: jsonb().$type<CorrectionSnapshot>(),
		reason: text().notNull().default(''),
		at: tstz().notNull().defaultNow()
	},
	(t) => [index().on(t.flightId, t.at)]
);
export type FuelCorrectionRow = typeof fuelCorrections.$inferSelect;

/** Instructor's and pilot's remarks on a flight, optionally pinned to a moment. */
export const flightNotes = pgTable(
	'flight_notes',
	{
		id: uuid().primaryKey().defaultRandom(),
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		authorId: text().references(() => users.id, { onDelete: 'set null' }),
		t: tstz(),
		body: text().notNull(),
		createdAt: tstz().notNull().defaultNow(),
		/** Last edit of the body or the moment; null when never edited. */
		editedAt: tstz()
	},
	(t) => [index().on(t.flightId, t.createdAt)]
);
export type FlightNote = typeof flightNotes.$inferSelect;

/** Alarms raised on live flights: one row per crossing, so e-mail goes out once. */
export const flightAlarms = pgTable(
	'flight_alarms',
	{
		id: uuid().primaryKey().defaultRandom(),
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		kind: alarmKindEnum().notNull(),
		raisedAt: tstz().notNull(),
		clearedAt: tstz(),
		value: doublePrecision(),
		emailedAt: tstz(),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [uniqueIndex().on(t.flightId, t.kind, t.raisedAt)]
);
export type FlightAlarm = typeof flightAlarms.$inferSelect;

export const alarmAcks = pgTable(
	'alarm_acks',
	{
		alarmId: uuid()
			.notNull()
			.references(() => flightAlarms.id, { onDelete: 'cascade' }),
		userId: text()
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		at: tstz().notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.alarmId, t.userId] })]
);

/** A member watching an aircraft (owner) or one flight (instructor) for alarm e-mails. */
export const watches = pgTable(
	'watches',
	{
		id: uuid().primaryKey().defaultRandom(),
		userId: text()
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		aircraftId: uuid().references(() => aircraft.id, { onDelete: 'cascade' }),
		flightId: uuid().references(() => flights.id, { onDelete: 'cascade' }),
		createdAt: tstz().notNull().defaultNow()
	},
	(t) => [
		uniqueIndex().on(t.userId, t.aircraftId).where(sql`${t.aircraftId} is not null`),
		uniqueIndex().on(t.userId, t.flightId).where(sql`${t.flightId} is not null`),
		index().on(t.aircraftId),
		index().on(t.flightId)
	]
);
export type Watch = typeof watches.$inferSelect;

// ---- fuel plans and debriefs -----------------------------------------------------------------

/**
 * A pre-flight fuel plan (canonical units). Attached to one flight; the worked figures (time and
 * fuel per leg, on board at each waypoint) are computed from it on every read, never stored.
 */
export const fuelPlans = pgTable(
	'fuel_plans',
	{
		id: uuid().primaryKey().defaultRandom(),
		orgId: uuid()
			.notNull()
			.references(() => organisations.id, { onDelete: 'cascade' }),
		aircraftId: uuid()
			.notNull()
			.references(() => aircraft.id, { onDelete: 'cascade' }),
		flightId: uuid().references(() => flights.id, { onDelete: 'cascade' }),
		startOnBoardL: doublePrecision().notNull(),
		taxiL: doublePrecision().notNull().default(0),
		climbL: doublePrecision().notNull().default(0),
		reserveRule: text().notNull(),
		reserveCustomMin: doublePrecision(),
		/** Normal-cruise flow for the reserve, L/h. */
		reserveFlowLph: doublePrecision(),
		tolerancePercent: doublePrecision().notNull(),
		legs: jsonb().$type<PlanLeg[]>().notNull(),
		/**
		 * A plan made before the flight: when the aircraft is expected to start. While flight_id is
		 * null the plan waits; the upload or live flight of its aircraft that starts nearest to
		 * this time, within WAITING_PLAN_WINDOW_MS, takes it (server/plans attachWaitingPlan).
		 */
		expectedDepartureAt: tstz(),
		/** Who is to fly a plan made before the flight (the student); the flight takes it when attached. */
		pilotId: text().references(() => users.id, { onDelete: 'set null' }),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow(),
		updatedAt: tstz().notNull().defaultNow()
	},
	(t) => [
		uniqueIndex().on(t.flightId),
		index().on(t.aircraftId),
		// The waiting plans of an aircraft by time: what an arriving flight looks up.
		index('fuel_plans_waiting_idx').on(t.aircraftId, t.expectedDepartureAt).where(sql`${t.flightId} is null`),
		// A plan belongs to a flight, or waits for one at a stated time; never neither.
		check('fuel_plans_flight_or_departure', sql`${t.flightId} is not null or ${t.expectedDepartureAt} is not null`)
	]
);
export type FuelPlanRow = typeof fuelPlans.$inferSelect;

/** The instructor's debrief of a flight: a summary, the sign-off, and whether the student sees it. */
export const debriefs = pgTable('debriefs', {
	flightId: uuid()
		.primaryKey()
		.references(() => flights.id, { onDelete: 'cascade' }),
	status: debriefStatusEnum().notNull().default('draft'),
	summary: text().notNull().default(''),
	signedOffBy: text().references(() => users.id, { onDelete: 'set null' }),
	signedOffAt: tstz(),
	publishedAt: tstz(),
	updatedAt: tstz().notNull().defaultNow()
});
export type DebriefRow = typeof debriefs.$inferSelect;

/** Read-only links to a debrief for someone without an account (token stored only as a hash). */
export const debriefShares = pgTable(
	'debrief_shares',
	{
		id: uuid().primaryKey().defaultRandom(),
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		tokenHash: text().notNull().unique(),
		createdBy: text().references(() => users.id, { onDelete: 'set null' }),
		createdAt: tstz().notNull().defaultNow(),
		expiresAt: tstz().notNull(),
		revokedAt: tstz()
	},
	(t) => [index().on(t.flightId)]
);
export type DebriefShare = typeof debriefShares.$inferSelect;

// ---- stored per-flight figures (the owner's history) -----------------------------------------

/**
 * A closed flight's headline figures as typed columns, so an aircraft's history (1,000 flights)
 * sorts and pages in SQL without reading samples or jsonb. Derived: written by recomputeSummary
 * in the transaction of every input change, deleted with the flight; no row while a flight is open.
 */
export const flightFigures = pgTable('flight_figures', {
	flightId: uuid()
		.primaryKey()
		.references(() => flights.id, { onDelete: 'cascade' }),
	engineTimeS: doublePrecision().notNull(),
	fuelUsedL: doublePrecision().notNull(),
	/** Fuel used ÷ engine time, L/h; null when the engine never ran. */
	fuelPerEngineHourLph: doublePrecision(),
	/** Cruise distance ÷ cruise fuel, NM per litre; null without cruise fuel. */
	cruiseSpecificRangeNmPerL: doublePrecision(),
	/** The meter factor the figures were computed with. */
	meterFactor: doublePrecision().notNull(),
	gapCount: integer().notNull(),
	gapTimeS: doublePrecision().notNull(),
	/** Leaning moments found in cruise (fuel/leaning.ts), for the high-burn finder's causes. */
	leaningMoments: integer().notNull()
});
export type FlightFiguresRow = typeof flightFigures.$inferSelect;

/** The same flight per phase: time, fuel, distance and average flow (fuel ÷ time). */
export const flightPhaseFigures = pgTable(
	'flight_phase_figures',
	{
		flightId: uuid()
			.notNull()
			.references(() => flights.id, { onDelete: 'cascade' }),
		phase: flightPhaseEnum().notNull(),
		timeS: doublePrecision().notNull(),
		fuelL: doublePrecision().notNull(),
		distanceNm: doublePrecision().notNull(),
		/** L/h; null when the phase took no time. */
		averageFlowLph: doublePrecision()
	},
	(t) => [primaryKey({ columns: [t.flightId, t.phase] })]
);
export type FlightPhaseFiguresRow = typeof flightPhaseFigures.$inferSelect;

/**
 * The owner's settings for the high-burn finder: how far over usual a phase may burn before the
 * flight is marked (null = our default), and per phase a usual flow set by hand (null = learned
 * from the aircraft's own recent flights).
 */
export const aircraftBurnSettings = pgTable('aircraft_burn_settings', {
	aircraftId: uuid()
		.primaryKey()
		.references(() => aircraft.id, { onDelete: 'cascade' }),
	thresholdPercent: doublePrecision(),
	manualTaxiLph: doublePrecision(),
	manualClimbLph: doublePrecision(),
	manualCruiseLph: doublePrecision(),
	manualDescentLph: doublePrecision(),
	updatedBy: text().references(() => users.id, { onDelete: 'set null' }),
	updatedAt: tstz().notNull().defaultNow()
});
export type AircraftBurnSettings = typeof aircraftBurnSettings.$inferSelect;

/** A flight the owner marked as unusual (a ferry, a test flight): left out of the learned baseline. */
export const flightUnusualMarks = pgTable('flight_unusual_marks', {
	flightId: uuid()
		.primaryKey()
		.references(() => flights.id, { onDelete: 'cascade' }),
	reason: text().notNull().default(''),
	markedBy: text().references(() => users.id, { onDelete: 'set null' }),
	markedAt: tstz().notNull().defaultNow()
});
