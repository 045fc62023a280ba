import { error } from '@sveltejs/kit';
import { isUnclaimed } from '$lib/permissions';
import { claimFlight, peopleChoices, setPilot } from '$lib/server/flights/details';
import { z } from 'zod';
import { fuelSetupOf } from '$lib/flight-inputs';
import { recentCruiseFlowLph } from '$lib/server/flights/recent-cruise';
import type { Declaration } from '$lib/fuel';
import { mayOnFlight, requireFlight } from '$lib/server/access';
import { aircraftOf } from '$lib/server/aircraft/lookup';
import { aircraftAt } from '$lib/server/calibration/in-force';
import { flightPeople } from '$lib/server/flights/people';
import { acknowledgeAlarm } from '$lib/server/live/acks';
import { idleCloseMinutes } from '$lib/server/live/config';
import { stopOpenHours } from '$lib/server/live/sweeper';
import { setLiveDeclaration } from '$lib/server/live/declare';
import { isWatching, setWatching } from '$lib/server/live/watches';
import { planOfFlight } from '$lib/server/plans';
import { mapTiles } from '$lib/server/map-tiles';
import { declarationFormSchema, declarationFormValues, reasonFormSchema } from '$lib/schemas/flight';
import { failForm, parseForm } from '$lib/schemas/form';
import type { Actions, PageServerLoad } from './$types';

// The flight's fixed facts and this member's own watches; samples, declaration changes, alarms
// and who acknowledged them arrive through the stream.
export const load = (async (event) => {
	const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
	const { flight, user } = ctx;
	const a = await aircraftOf(flight);
	const unit = user.prefFuelUnit ?? a.displayUnit;
	const [people, plan, watchingFlight, watchingAircraft] = await Promise.all([
		flightPeople(flight),
		planOfFlight(flight.id),
		isWatching(user.id, { flightId: flight.id }),
		isWatching(user.id, { aircraftId: a.id })
	]);
	return {
		flight: {
			id: flight.id,
			title: flight.title,
			source: flight.source,
			startedAt: flight.startedAt,
			pilot: people.pilot,
			instructor: people.instructor
		},
		aircraft: { id: a.id, registration: a.registration, type: a.type, displayUnit: a.displayUnit, densityKgPerL: a.densityKgPerL, lastOnBoardL: a.lastOnBoardL },
		// With the meter factor and K-factor in force at the flight's engine start, as its stored figures.
		setup: fuelSetupOf(await aircraftAt(a, flight.startedAt), await recentCruiseFlowLph(a.id, flight)),
		unit,
		declarationValues: declarationFormValues(flight.declaration as Declaration, flight.previousOnBoardL, unit, a.densityKgPerL),
		unclaimed: isUnclaimed(flight),
		may: { edit: mayOnFlight(ctx, flight, 'edit'), acknowledge: mayOnFlight(ctx, flight, 'acknowledge'), claim: mayOnFlight(ctx, flight, 'claim'), setPilot: mayOnFlight(ctx, flight, 'setPilot') },
		pilots: mayOnFlight(ctx, flight, 'setPilot') ? (await peopleChoices(flight.orgId)).pilots : [],
		// The plan (made ahead, or added since): the legs passed so far set against it.
		plan,
		tiles: mapTiles(),
		watchingFlight,
		watchingAircraft,
		idleCloseMinutes: idleCloseMinutes(),
		stopOpenHours: stopOpenHours(),
		streamUrl: `/api/v1/flights/${flight.id}/stream`
	};
}) satisfies PageServerLoad;

const alarmIdSchema = z.object({ alarmId: z.uuid('That alarm is not on this flight.') });
const watchSchema = z.object({ on: z.enum(['1', '0']) });
const pilotSchema = z.object({ pilotId: z.string().trim().max(200).transform((v) => (v === '' ? null : v)) });

export const actions = {
	declaration: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'edit');
		const a = await aircraftOf(flight);
		const body = await event.request.formData();
		const form = parseForm(declarationFormSchema(a.densityKgPerL), body);
		const why = parseForm(reasonFormSchema, body);
		if (!form.ok || !why.ok) return failForm(400, { ...(form.ok ? {} : form.errors), ...(why.ok ? {} : why.errors) }, form.values, 'declaration');
		await setLiveDeclaration(flight.id, form.data.declaration, form.data.previousOnBoardL, { userId: user.id, reason: why.data.reason });
		return { action: 'declaration', saved: true };
	},
	// The flight's pilot, instructors and admins acknowledge (read-only viewers see alarms only); every
	// viewer sees who and when, and the alarm stays on the timeline for everyone.
	ack: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'acknowledge');
		const form = parseForm(alarmIdSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'ack');
		if (!(await acknowledgeAlarm(flight.id, form.data.alarmId, user.id))) return failForm(404, { alarmId: 'That alarm is not on this flight.' }, form.values, 'ack');
		return { action: 'ack', alarmId: form.data.alarmId };
	},
	// The pilot of a recorder-opened flight takes it: from then on it is theirs like an upload.
	claim: async (event) => {
		const ctx = await requireFlight(event, event.params.org, event.params.id, 'view');
		if (!mayOnFlight(ctx, ctx.flight, 'claim')) {
			if (!isUnclaimed(ctx.flight)) return failForm(409, { form: 'This flight already has its pilot.' }, {}, 'claim');
			error(403, 'Only a member who flies can claim a flight.');
		}
		if (!(await claimFlight(ctx.flight.id, ctx.user.id))) return failForm(409, { form: 'Someone claimed this flight a moment ago.' }, {}, 'claim');
		return { action: 'claim', claimed: true };
	},
	setPilot: async (event) => {
		const { flight } = await requireFlight(event, event.params.org, event.params.id, 'setPilot');
		const form = parseForm(pilotSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'setPilot');
		const done = await setPilot(flight, form.data.pilotId);
		if (!done.ok) return failForm(400, { [done.field]: done.message }, form.values, 'setPilot');
		return { action: 'setPilot', saved: true };
	},
	watch: async (event) => {
		const { flight, user } = await requireFlight(event, event.params.org, event.params.id, 'view');
		const form = parseForm(watchSchema, await event.request.formData());
		if (!form.ok) return failForm(400, form.errors, form.values, 'watch');
		await setWatching(user.id, { flightId: flight.id }, form.data.on === '1');
		return { action: 'watch', watching: form.data.on === '1' };
	}
} satisfies Actions;
