// The upload page: the organisation's active aircraft and import profiles for the browser's
// column mapper; saving a mapping as a named profile. The file itself goes to POST /api/v1/flights.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { requireMember } from '$lib/server/access';
import { db } from '$lib/server/db';
import { aircraft, importProfiles } from '$lib/server/db/schema';
import { failForm, parseForm } from '$lib/schemas/form';
import { plainText } from '$lib/schemas/text';
import { MAX_UPLOAD_BYTES, MAX_UPLOAD_LABEL, columnMappingSchema, createRowReader, headerSignature, profileMapping, type ColumnMapping } from '$lib/csv';
import type { Actions, PageServerLoad } from './$types';

// Aircraft with what the declaration needs; profiles with what matching needs.
export const load = (async (event) => {
	const { org } = await requireMember(event, event.params.org, 'upload');
	const fleet = await db
		.select({
			id: aircraft.id,
			registration: aircraft.registration,
			type: aircraft.type,
			fuelType: aircraft.fuelType,
			displayUnit: aircraft.displayUnit,
			densityKgPerL: aircraft.densityKgPerL,
			capacityL: aircraft.capacityL,
			lowerLevelL: aircraft.lowerLevelL,
			lastOnBoardL: aircraft.lastOnBoardL
		})
		.from(aircraft)
		.where(and(eq(aircraft.orgId, org.id), isNull(aircraft.archivedAt)))
		.orderBy(asc(aircraft.registration));
	const profiles = await db
		.select({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature, mapping: importProfiles.mapping })
		.from(importProfiles)
		.where(eq(importProfiles.orgId, org.id))
		.orderBy(asc(importProfiles.name));
	return {
		fleet,
		profiles: profiles.map((p) => ({ ...p, mapping: p.mapping as ColumnMapping })),
		preselect: event.url.searchParams.get('aircraft'),
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
		const { name, headers, mapping } = parsed.data;
		// A profile naming columns its own header lacks could never apply.
		const check = createRowReader(mapping, headers, 1, { densityKgPerL: 0.72 });
		if ('problems' in check) return failForm(400, { mapping: check.problems[0].message }, values, 'saveProfile');
		const stored = profileMapping(mapping);
		const existing = await db.query.importProfiles.findFirst({ where: and(eq(importProfiles.orgId, org.id), eq(importProfiles.name, name)) });
		if (existing && parsed.data.replace !== '1')
			return failForm(400, { name: `A profile named "${name}" exists already. Tick "Replace" to overwrite it, or choose another name.` }, values, 'saveProfile');
		const [row] = await db
			.insert(importProfiles)
			.values({ orgId: org.id, name, headerSignature: headerSignature(headers), mapping: stored, createdBy: user.id })
			.onConflictDoUpdate({ target: [importProfiles.orgId, importProfiles.name], set: { headerSignature: headerSignature(headers), mapping: stored, createdBy: user.id, createdAt: new Date() } })
			.returning({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature });
		return { action: 'saveProfile', saved: { ...row, mapping: stored } };
	}
} satisfies Actions;
