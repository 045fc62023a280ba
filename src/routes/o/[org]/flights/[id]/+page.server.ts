import { fuelSetupOf } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from '$lib/server/flights/recent-cruise';
import { mayOnFlight, requireFlight } from '$lib/server/access';
import { aircraftOf } from '$lib/server/aircraft/lookup';
import { aircraftAt } from '$lib/server/calibration/in-force';
import { addFuelEvent, addNote, editNote, removeFuelEvent, removeNote, saveDeclaration } from '$lib/server/flights/edit';
import { planOfFlight } from '$lib/server/plans';
import { mapTiles } from '$lib/server/map-tiles';
import { alarmAcksOf } from '$lib/server/live/acks';
import { debriefOf } from '$lib/server/debriefs';
import { listCorrections } from '$lib/server/flights/corrections';
import { loadEvents } from '$lib/server/flights/load';
import { listNotes } from '$lib/server/flights/notes';
import { flightPeople } from '$lib/server/flights/people';
import { can } from '$lib/permissions';
import { declarationFormSchema, declarationFormValues, flightDetailsFormSchema, fuelEventFormSchema, idFormSchema, mergeFormSchema, noteEditFormSchema, noteFormSchema, reasonFormSchema, splitFormSchema } from '$lib/schemas/flight';
import { mergeFlights, mergeNeighbours, splitFlight } from '$lib/server/flights/split';
import { droppedLinesOf } from '$lib/server/flights/upload-report';
import { peopleChoices, saveDetails } from '$lib/server/flights/details';
import { trashFlight } from '$lib/server/flights/trash';
import { redirect } from '@sveltejs/kit';
import { failForm, parseForm } from '$lib/schemas/form';
import type { Declaration } from '$lib/fuel';
import type { Actions, PageServerLoad } from './$types';

// The flight's fuel inputs, people and notes; the samples come from the samples API in the browser.
export const load = (async (event) => {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	const { flight, user, role } = ctx;
	const [a, events, corrections, notes, plan, debrief, people, droppedLines, alarmAcks] = await Promise.all([
		aircraftOf(flight),
		loadEvents(flight.id),
		listCorrections(flight.id),
		listNotes(flight.id),
		planOfFlight(flight.id),
		debriefOf(flight.id),
		flightPeople(flight),
		droppedLinesOf(flight),
		alarmAcksOf(flight.id)
	]);
	const mayEdit = mayOnFlight(ctx, flight, 'edit');
	const unit = user.prefFuelUnit ?? a.displayUnit;
	return {
		flight: {
			id: flight.id,
			title: flight.title,
			status: flight.status,
			source: flight.source,
			startedAt: flight.startedAt,
			endedAt: flight.endedAt,
			declaration: flight.declaration as Declaration,
			previousOnBoardL: flight.previousOnBoardL,
			declarationConfirmed: flight.declarationConfirmed,
			sampleCount: flight.sampleCount,
			notes: flight.notes,
			route: flight.route,
			pilotId: flight.pilotId,
			instructorId: flight.instructorId,
			pilot: people.pilot,
			instructor: people.instructor
		},
		aircraft: { id: a.id, registration: a.registration, type: a.type, displayUnit: a.displayUnit, densityKgPerL: a.densityKgPerL, fuelType: a.fuelType },
		// With the meter factor and K-factor in force at the flight's engine start, as its stored figures.
		setup: fuelSetupOf(await aircraftAt(a, flight.startedAt), await recentCruiseFlowLph(a.id, flight)),
		events: events.map((e) => ({ id: e.id, t: e.t.getTime() / 1000, kind: e.kind, amountL: e.amountL, note: e.note })),
		notes,
		corrections,
		droppedLines,
		// Who acknowledged the alarms raised while it was followed live, for the timeline.
		alarmAcks,
		plan,
		// Tiles behind the track, when the server has a source configured (none by default).
		tiles: mapTiles(),
		debriefStatus: debrief.status,
		declarationValues: declarationFormValues(flight.declaration as Declaration, flight.previousOnBoardL, unit, a.densityKgPerL),
		unit,
		// Who can be chosen, only for those who may change the details.
		people: mayEdit ? await peopleChoices(flight.orgId) : null,
		// The aircraft's flights just before and after, to merge with (for those who may edit).
		neighbours: mayEdit && flight.status === 'closed' ? await mergeNeighbours(flight) : null,
		may: {
			edit: mayEdit,
			setPilot: mayOnFlight(ctx, flight, 'setPilot'),
			annotate: mayOnFlight(ctx, flight, 'annotate'),
			removeAnyNote: can(role, 'editAnyFlight')
		},
		userId: user.id
	};
}) satisfies PageServerLoad;

export const actions = {
	// Into the trash (the page asks first); its editors restore it from the trash page.
	trash: async (event) => {
		const { flight, user, org } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const done = await trashFlight(flight, user.id);
		if (!done.ok) return failForm(409, { [done.field]: done.message }, {}, 'trash');
		redirect(303, `/o/${org.slug}/trash?moved=${flight.id}`);
	},
	// Cuts the flight at one of its stops into two flights (the page asks first).
	split: async (event) => {
		const { flight, org } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const form = parseForm(splitFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'split');
		const done = await splitFlight(flight, form.data.stop);
		if (!done.ok) return failForm(done.status, { stop: done.message }, form.values, 'split');
		redirect(303, `/o/${org.slug}/flights/${done.flightIds[0]}?split=${done.flightIds[1]}`);
	},
	// Joins this flight and another of the same aircraft into the earlier one (the page asks first).
	merge: async (event) => {
		const { flight, org } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const form = parseForm(mergeFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'merge');
		// The other flight needs the same right: it disappears into this one (or this one into it).
		const other = await requireFlight(event, event.params.org, form.data.otherId, 'edit');
		const done = await mergeFlights(flight, other.flight);
		if (!done.ok) return failForm(done.status, { otherId: done.message }, form.values, 'merge');
		redirect(303, `/o/${org.slug}/flights/${done.flightId}?merged=1`);
	},
	details: async (event) => {
		const ctx = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const form = parseForm(flightDetailsFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'details');
		const done = await saveDetails(ctx.flight, form.data, mayOnFlight(ctx, ctx.flight, 'setPilot'));
		if (!done.ok) return failForm(400, { [done.field]: done.message }, form.values, 'details');
		return { action: 'details', saved: true };
	},
	declaration: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const a = await aircraftOf(flight);
		const body = await event.request.formData();
		const form = parseForm(declarationFormSchema(a.densityKgPerL), body);
		const why = parseForm(reasonFormSchema, body);
		if (!form.ok || !why.ok) return failForm(400, { ...(form.ok ? {} : form.errors), ...(why.ok ? {} : why.errors) }, form.values, 'declaration');
		await saveDeclaration(flight, form.data, { userId: user.id, reason: why.data.reason });
		return { action: 'declaration', saved: true };
	},
	addEvent: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const a = await aircraftOf(flight);
		const body = await event.request.formData();
		const form = parseForm(fuelEventFormSchema(a.densityKgPerL), body);
		const why = parseForm(reasonFormSchema, body);
		if (!form.ok || !why.ok) return failForm(400, { ...(form.ok ? {} : form.errors), ...(why.ok ? {} : why.errors) }, form.values, 'addEvent');
		const done = await addFuelEvent(flight, form.data, { userId: user.id, reason: why.data.reason });
		if (!done.ok) return failForm(400, { [done.field]: done.message }, form.values, 'addEvent');
		return { action: 'addEvent', saved: true };
	},
	removeEvent: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const body = await event.request.formData();
		const form = parseForm(idFormSchema, body);
		const why = parseForm(reasonFormSchema, body);
		if (!form.ok || !why.ok) return failForm(400, { ...(form.ok ? {} : form.errors), ...(why.ok ? {} : why.errors) }, form.values, 'removeEvent');
		const done = await removeFuelEvent(flight, form.data.id, { userId: user.id, reason: why.data.reason });
		if (!done.ok) return failForm(404, { [done.field]: done.message }, form.values, 'removeEvent');
		return { action: 'removeEvent', saved: true };
	},
	addNote: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const form = parseForm(noteFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'addNote');
		await addNote(flight, form.data, user.id);
		return { action: 'addNote', saved: true };
	},
	editNote: async (event) => {
		const { flight, user, role } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const form = parseForm(noteEditFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'editNote');
		const done = await editNote(flight, form.data.id, form.data, user.id, can(role, 'editAnyFlight'));
		if (!done.ok) return failForm(404, { [done.field]: done.message }, form.values, 'editNote');
		return { action: 'editNote', saved: true };
	},
	removeNote: async (event) => {
		const { flight, user, role } = await requireFlight(event, event.params.org, event.params.id, 'annotate');
		const form = parseForm(idFormSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'removeNote');
		const done = await removeNote(flight, form.data.id, user.id, can(role, 'editAnyFlight'));
		if (!done.ok) return failForm(404, { [done.field]: done.message }, form.values, 'removeNote');
		return { action: 'removeNote', saved: true };
	}
} satisfies Actions;
