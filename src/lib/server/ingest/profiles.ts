// Import profiles: an organisation's named column mappings for recorder files in other layouts,
// matched to a file by its header's signature.
import { and, asc, eq } from 'drizzle-orm';
import { createRowReader, headerSignature, profileMapping, type ColumnMapping } from '$lib/csv';
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
