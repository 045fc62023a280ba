// The upload page: the organisation's active aircraft and import profiles for the browser's
// column mapper; saving a mapping as a named profile. The file itself goes to POST /api/v1/flights.
import { z } from 'zod';
import { requireMember } from '$lib/server/access';
import { listImportProfiles, saveImportProfile } from '$lib/server/ingest/profiles';
import { listAircraft } from '$lib/server/services/aircraft';
import { usualAircraftOf } from '$lib/server/flights/list';
import { failForm, parseForm } from '$lib/schemas/form';
import { plainText } from '$lib/schemas/text';
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_LABEL, columnMappingSchema } from '$lib/csv';
import type { Actions, PageServerLoad } from './$types';

// Aircraft with what the declaration needs; profiles with what matching needs.
export const load = (async (event) => {
	const { org, user } = await requireMember(event, event.params.org, 'upload');
	const [fleet, profiles, usual] = await Promise.all([listAircraft(org.id), listImportProfiles(org.id), usualAircraftOf(org.id, user.id)]);
	return {
		fleet: fleet.map((a) => ({
			id: a.id,
			registration: a.registration,
			type: a.type,
			fuelType: a.fuelType,
			displayUnit: a.displayUnit,
			densityKgPerL: a.densityKgPerL,
			capacityL: a.capacityL,
			lowerLevelL: a.lowerLevelL,
			lastOnBoardL: a.lastOnBoardL
		})),
		profiles,
		// The aircraft asked for in the address, else the one of the member's latest flight.
		preselect: event.url.searchParams.get('aircraft') ?? usual,
		maxBytes: MAX_UPLOAD_BYTES,
		maxLabel: MAX_UPLOAD_LABEL
	};
}) satisfies PageServerLoad;

/** A NUL byte inside parsed JSON (written as \\u0000 in the field): jsonb cannot store it. */
const holdsNul = (v: unknown) => JSON.stringify(v).includes('\\u0000');

const profileFormSchema = z.object({
	name: plainText(60, { required: 'Give the profile a name.' }),
	headers: z.string().transform((raw, ctx) => {
		try {
			const v = z.array(z.string().max(200)).min(1).max(200).parse(JSON.parse(raw));
			if (holdsNul(v)) {
				ctx.addIssue({ code: 'custom', message: 'A column name of the file holds a NUL byte (U+0000): the profile cannot be saved for it.' });
				return z.NEVER;
			}
			return v;
		} catch {
			ctx.addIssue({ code: 'custom', message: 'Choose a file first: the profile is saved for its columns.' });
			return z.NEVER;
		}
	}),
	mapping: z.string().transform((raw, ctx) => {
		let json: unknown;
		try {
			json = JSON.parse(raw);
		} catch {
			ctx.addIssue({ code: 'custom', message: 'The mapping could not be read.' });
			return z.NEVER;
		}
		if (holdsNul(json)) {
			ctx.addIssue({ code: 'custom', message: 'The mapping holds a NUL byte (U+0000).' });
			return z.NEVER;
		}
		const m = columnMappingSchema.safeParse(json);
		if (m.success) return m.data;
		ctx.addIssue({ code: 'custom', message: m.error.issues[0].message });
		return z.NEVER;
	}),
	replace: z.string().optional()
});

export const actions = {
	saveProfile: async (event) => {
		const { org, user } = await requireMember(event, event.params.org, 'upload');
		// parseForm: the same checks as every form, NUL bytes included (jsonb cannot hold one).
		const parsed = parseForm(profileFormSchema, await event.request.formData());
		const values = parsed.values;
		if (!parsed.ok) return failForm(400, parsed.errors, values, 'saveProfile');
		const done = await saveImportProfile(org.id, user.id, { ...parsed.data, replace: parsed.data.replace === '1' });
		if (!done.ok) return failForm(400, { [done.field]: done.message }, values, 'saveProfile');
		return { action: 'saveProfile', saved: done.saved };
	}
} satisfies Actions;
