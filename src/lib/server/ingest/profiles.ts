// Import profiles: an organisation's named column mappings for recorder files in other layouts,
// matched to a file by its header's signature.
import { and, asc, eq } from 'drizzle-orm';
import {
	burndownMapping,
	columnMappingSchema,
	createRowReader,
	headerSignature,
	profileMapping,
	type ColumnMapping,
	type MappingChoice,
	type MappingOrigin,
	type MappingResolver
} from '$lib/csv';
import { db } from '../db';
import { importProfiles, type ImportProfile } from '../db/schema';

export type ProfileForMatching = Pick<ImportProfile, 'id' | 'name' | 'headerSignature' | 'mapping' | 'createdAt'>;

/** The organisation's profiles, A to Z, with what the browser's column mapper needs. */
export async function listImportProfiles(orgId: string) {
	const rows = await db
		.select({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature, mapping: importProfiles.mapping })
		.from(importProfiles)
		.where(eq(importProfiles.orgId, orgId))
		.orderBy(asc(importProfiles.name));
	return rows.map((p) => ({ ...p, mapping: p.mapping as ColumnMapping }));
}

/** The organisation's profiles for picking one for an upload (newest wins a header match). */
export async function profilesForMatching(orgId: string): Promise<ProfileForMatching[]> {
	return db
		.select({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature, mapping: importProfiles.mapping, createdAt: importProfiles.createdAt })
		.from(importProfiles)
		.where(eq(importProfiles.orgId, orgId));
}

export type SaveProfileResult =
	| { ok: true; saved: { id: string; name: string; headerSignature: string; mapping: ColumnMapping } }
	| { ok: false; field: 'mapping' | 'name'; message: string };

/**
 * Saves a mapping for a file's header under a name; an existing name is overwritten only when
 * `replace` is set. A profile naming columns its own header lacks could never apply: refused.
 */
export async function saveImportProfile(
	orgId: string,
	userId: string,
	input: { name: string; headers: string[]; mapping: ColumnMapping; replace: boolean }
): Promise<SaveProfileResult> {
	const { name, headers, mapping } = input;
	const check = createRowReader(mapping, headers, 1, { densityKgPerL: 0.72 });
	if ('problems' in check) return { ok: false, field: 'mapping', message: check.problems[0].message };
	const stored = profileMapping(mapping);
	const existing = await db.query.importProfiles.findFirst({ where: and(eq(importProfiles.orgId, orgId), eq(importProfiles.name, name)), columns: { id: true } });
	if (existing && !input.replace)
		return { ok: false, field: 'name', message: `A profile named "${name}" exists already. Tick "Replace" to overwrite it, or choose another name.` };
	const signature = headerSignature(headers);
	const [row] = await db
		.insert(importProfiles)
		.values({ orgId, name, headerSignature: signature, mapping: stored, createdBy: userId })
		.onConflictDoUpdate({ target: [importProfiles.orgId, importProfiles.name], set: { headerSignature: signature, mapping: stored, createdBy: userId, createdAt: new Date() } })
		.returning({ id: importProfiles.id, name: importProfiles.name, headerSignature: importProfiles.headerSignature });
	return { ok: true, saved: { ...row, mapping: stored } };
}

/** What an upload says about its mapping (IngestRequest's fields of the same names). */
export interface MappingRequest {
	/** A mapping from the column mapper; null for our format or a matching import profile. */
	mapping?: ColumnMapping | null;
	/** An import profile of the organisation to apply. */
	profileId?: string | null;
	/** The date (clock times) or start (elapsed seconds) of this file, for a profile that needs it. */
	timeBase?: { date?: string; start?: string };
}

/**
 * Picks the mapping: the one given, the chosen profile, our own format, or the newest profile
 * matching the header. The profiles are read before the upload takes its connection: a query
 * needing a second connection while every pooled one waits for it would never finish.
 */
export function mappingResolver(req: MappingRequest, profiles: readonly ProfileForMatching[]): MappingResolver {
	const withTimeBase = (m: ColumnMapping, origin: MappingOrigin, line: number): MappingChoice => {
		const merged = { ...m, time: { ...m.time, ...(req.timeBase?.date ? { date: req.timeBase.date } : {}), ...(req.timeBase?.start ? { start: req.timeBase.start } : {}) } };
		const checked = columnMappingSchema.safeParse(merged);
		if (checked.success) return { mapping: checked.data, origin };
		const issue = checked.error.issues[0];
		return { problem: { line, column: '', value: '', message: `${origin.profileName ? `Import profile "${origin.profileName}": ` : ''}${issue.message}` } };
	};
	const fromProfile = (p: ProfileForMatching, line: number) => withTimeBase(p.mapping as ColumnMapping, { kind: 'profile', profileId: p.id, profileName: p.name }, line);
	return (header) => {
		if (req.mapping) return withTimeBase(req.mapping, { kind: 'given' }, header.line);
		if (req.profileId) {
			const p = profiles.find((x) => x.id === req.profileId);
			if (!p) return { problem: { line: header.line, column: '', value: req.profileId, message: 'The chosen import profile does not exist in this organisation.' } };
			return fromProfile(p, header.line);
		}
		const ours = burndownMapping(header.names);
		if ('mapping' in ours) return { mapping: ours.mapping, origin: { kind: 'burndown' } };
		const match = profiles.filter((x) => x.headerSignature === header.signature).sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())[0];
		if (match) return fromProfile(match, header.line);
		return {
			problem: {
				line: header.line,
				column: '',
				value: header.names.join(header.layout.delimiter).slice(0, 200),
				message: `${ours.message} No import profile of this organisation matches these columns either: map the columns on the upload page, or send a mapping.`
			}
		};
	};
}
