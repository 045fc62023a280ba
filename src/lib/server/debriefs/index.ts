// Debriefs: the one home of their queries. The report (flight, summary, plan against actual,
// notes, sign-off) is built from the stored inputs with the same engine the replay runs; the
// debrief row holds only what the instructor wrote and decided. Publishing mails the student.
import { dateTimeText } from '$lib/format';
import { and, asc, eq, gt, inArray, isNull } from 'drizzle-orm';
import { findLeaningMoments } from '$lib/fuel';
import { planReport } from '$lib/plan-report';
import type { DebriefNote, DebriefReport, DebriefStatus, DebriefView } from '$lib/wire/plan';

export type { DebriefNote, DebriefReport, DebriefView };
import { db } from '../db';
import { debriefs, debriefShares, flightNotes, flights, organisations, users, type DebriefRow } from '../db/schema';
import { loadFlight } from '../flights/load';
import { computeLoaded } from '../flights/summary';
import { planOfFlight } from '../plans';
import { link, sendMail } from '../mail';
import { hashToken, newToken } from '../tokens';

/** At most this many points on the printed chart: finer than any printed line can show. */
const CHART_POINTS = 600;

const EMPTY: DebriefView = { status: 'draft', summaryText: '', signedOffBy: null, signedOffAt: null, publishedAt: null };

export async function notesOf(flightId: string): Promise<DebriefNote[]> {
	return db
		.select({ id: flightNotes.id, t: flightNotes.t, body: flightNotes.body, createdAt: flightNotes.createdAt, editedAt: flightNotes.editedAt, authorId: flightNotes.authorId, author: users.name })
		.from(flightNotes)
		.leftJoin(users, eq(users.id, flightNotes.authorId))
		.where(eq(flightNotes.flightId, flightId))
		.orderBy(asc(flightNotes.t), asc(flightNotes.createdAt));
}

export async function debriefOf(flightId: string): Promise<DebriefView> {
	const [row] = await db
		.select({ d: debriefs, signer: users.name })
		.from(debriefs)
		.leftJoin(users, eq(users.id, debriefs.signedOffBy))
		.where(eq(debriefs.flightId, flightId));
	return row ? viewOf(row.d, row.signer) : EMPTY;
}

const viewOf = (d: DebriefRow, signer: string | null): DebriefView => ({ status: d.status, summaryText: d.summary, signedOffBy: signer, signedOffAt: d.signedOffAt, publishedAt: d.publishedAt });

/** Everything a debrief shows; null when the flight is gone. */
export async function debriefReport(flightId: string): Promise<DebriefReport | null> {
	const loaded = await loadFlight(flightId);
	if (!loaded) return null;
	const [plan, notes, debrief] = await Promise.all([planOfFlight(flightId), notesOf(flightId), debriefOf(flightId)]);
	const { computation, summary } = computeLoaded(loaded);
	const { flight, aircraft: a } = loaded;
	const people = [flight.pilotId, flight.instructorId].filter((x): x is string => x !== null);
	const names = people.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, people)) : [];
	const nameOf = (id: string | null) => names.find((n) => n.id === id)?.name ?? null;
	return {
		flight: { id: flight.id, title: flight.title, startedAt: flight.startedAt, endedAt: flight.endedAt, pilotId: flight.pilotId, pilot: nameOf(flight.pilotId), instructor: nameOf(flight.instructorId) },
		aircraft: { registration: a.registration, type: a.type, displayUnit: a.displayUnit, densityKgPerL: a.densityKgPerL, reserveRule: a.reserveRule, reserveCustomMin: a.reserveCustomMin },
		summary,
		plan: plan ? planReport(plan, computation, loaded.samples.columns, loaded.samples.waypoints) : null,
		route: plan ? ['Departure', ...plan.legs.map((l) => l.to)].join(' – ') : null,
		notes,
		leaning: findLeaningMoments({ t: loaded.samples.columns.t, flow: computation.flow, gs: loaded.samples.columns.gs, alt: loaded.samples.columns.alt, phase: computation.phase }),
		debrief,
		chart: thin(loaded.samples.columns.t, computation.onBoard)
	};
}

function thin(t: ArrayLike<number>, v: ArrayLike<number>): { t: number[]; onBoardL: number[] } {
	const step = Math.max(1, Math.ceil(t.length / CHART_POINTS));
	const out = { t: [] as number[], onBoardL: [] as number[] };
	for (let i = 0; i < t.length; i += step) {
		if (!Number.isFinite(v[i])) continue;
		out.t.push(t[i]);
		out.onBoardL.push(v[i]);
	}
	const last = t.length - 1;
	if (last >= 0 && Number.isFinite(v[last]) && out.t[out.t.length - 1] !== t[last]) {
		out.t.push(t[last]);
		out.onBoardL.push(v[last]);
	}
	return out;
}

/** Who may see a debrief: its instructors always; the student (and other viewers) once published. */
export function mayReadDebrief(status: DebriefStatus, mayWrite: boolean): boolean {
	return mayWrite || status === 'published';
}

export async function saveDebriefText(flightId: string, summaryText: string): Promise<void> {
	await db
		.insert(debriefs)
		.values({ flightId, summary: summaryText })
		.onConflictDoUpdate({ target: debriefs.flightId, set: { summary: summaryText, updatedAt: new Date() } });
}

export async function signOff(flightId: string, userId: string, at = new Date()): Promise<void> {
	await db
		.insert(debriefs)
		.values({ flightId, signedOffBy: userId, signedOffAt: at })
		.onConflictDoUpdate({ target: debriefs.flightId, set: { signedOffBy: userId, signedOffAt: at, updatedAt: new Date() } });
}

export type PublishResult = { ok: true; mailedTo: string | null } | { ok: false; field: string; message: string };

/**
 * Publishes a signed-off debrief and mails the flight's pilot a link. The row is written first;
 * a mail failure is reported but does not undo the publication (the student sees it on the site).
 */
export async function publishDebrief(flightId: string, origin: string): Promise<PublishResult> {
	const report = await debriefReport(flightId);
	if (!report) return { ok: false, field: 'form', message: 'This flight is gone.' };
	if (!report.debrief.signedOffAt) return { ok: false, field: 'form', message: 'Sign the debrief off before publishing it.' };
	const now = new Date();
	await db.update(debriefs).set({ status: 'published', publishedAt: now, updatedAt: now }).where(eq(debriefs.flightId, flightId));
	const pilot = report.flight.pilotId ? await db.query.users.findFirst({ where: eq(users.id, report.flight.pilotId) }) : undefined;
	if (!pilot) return { ok: true, mailedTo: null };
	const orgSlug = await slugOf(flightId);
	const url = link(`/o/${orgSlug}/flights/${flightId}/debrief`, origin);
	const when = dateTimeText(report.flight.startedAt, pilot.timeZone);
	await sendMail({
		to: pilot.email,
		subject: `Debrief of your flight in ${report.aircraft.registration} on ${when}`,
		text: `Hello ${pilot.name},\n\n${report.flight.instructor ?? 'Your instructor'} has published the debrief of your flight in ${report.aircraft.registration} on ${when}.\n\nRead it here: ${url}\n\nBurndown's figures are advisory: they do not replace a look in the tanks, the flight manual or the pilot in command's judgement.\n`
	});
	return { ok: true, mailedTo: pilot.email };
}

async function slugOf(flightId: string): Promise<string> {
	const [row] = await db.select({ slug: organisations.slug }).from(flights).innerJoin(organisations, eq(organisations.id, flights.orgId)).where(eq(flights.id, flightId));
	return row?.slug ?? '';
}

// ---- share links ----------------------------------------------------------------------------

export async function createShare(flightId: string, userId: string, days: number): Promise<{ token: string; expiresAt: Date }> {
	const token = newToken('bds_');
	const expiresAt = new Date(Date.now() + days * 86_400_000);
	await db.insert(debriefShares).values({ flightId, tokenHash: hashToken(token), createdBy: userId, expiresAt });
	return { token, expiresAt };
}

export async function sharesOf(flightId: string) {
	return db
		.select({ id: debriefShares.id, createdAt: debriefShares.createdAt, expiresAt: debriefShares.expiresAt, revokedAt: debriefShares.revokedAt })
		.from(debriefShares)
		.where(eq(debriefShares.flightId, flightId))
		.orderBy(asc(debriefShares.createdAt));
}

export async function revokeShare(flightId: string, shareId: string): Promise<boolean> {
	const done = await db
		.update(debriefShares)
		.set({ revokedAt: new Date() })
		.where(and(eq(debriefShares.id, shareId), eq(debriefShares.flightId, flightId), isNull(debriefShares.revokedAt)))
		.returning({ id: debriefShares.id });
	return done.length > 0;
}

/** The flight a share token opens, when the link is neither revoked nor expired. */
export async function flightOfShare(token: string): Promise<string | null> {
	if (!/^bds_[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
	const [row] = await db
		.select({ flightId: debriefShares.flightId })
		.from(debriefShares)
		// A flight in the trash is shown to nobody, through a shared link neither.
		.innerJoin(flights, and(eq(flights.id, debriefShares.flightId), isNull(flights.deletedAt)))
		.where(and(eq(debriefShares.tokenHash, hashToken(token)), isNull(debriefShares.revokedAt), gt(debriefShares.expiresAt, new Date())));
	return row?.flightId ?? null;
}
