// Route files only authorize, parse, call and answer: every query lives in a server domain module
// (src/lib/server/{accounts,aircraft,flights,ingest,live,services,…}). This check fails when any
// file under src/routes imports drizzle-orm or the database client/schema ($lib/server/db…),
// whether by a static, type-only, re-export or dynamic import, or by a relative path into it.
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '..', '..');
const ROUTES = join(ROOT, 'src', 'routes');
const DB_DIR = join(ROOT, 'src', 'lib', 'server', 'db');

/** Every module specifier a source file names: import/export … from '…', import '…', import('…'). */
export function specifiersOf(source: string): string[] {
	const found: string[] = [];
	const patterns = [/\b(?:import|export)\s[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]/g, /\bimport\s*['"]([^'"]+)['"]/g, /\bimport\s*\(\s*['"`]([^'"`]+)['"`]\s*\)/g];
	for (const re of patterns) for (const m of source.matchAll(re)) found.push(m[1]);
	return found;
}

/** Whether a specifier, named in `file`, reaches drizzle-orm or the database module. */
export function isDatabaseImport(specifier: string, file: string): boolean {
	if (specifier === 'drizzle-orm' || specifier.startsWith('drizzle-orm/')) return true;
	if (specifier === '$lib/server/db' || specifier.startsWith('$lib/server/db/')) return true;
	if (specifier.startsWith('.')) {
		const target = resolve(dirname(file), specifier);
		return target === DB_DIR || target.startsWith(DB_DIR + sep) || target.startsWith(DB_DIR + '.');
	}
	return false;
}

function sourceFiles(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
		const path = join(dir, e.name);
		if (e.isDirectory()) return sourceFiles(path);
		return /\.(ts|js|svelte)$/.test(e.name) ? [path] : [];
	});
}

describe('the import detector', () => {
	const route = join(ROUTES, 'o', '[org]', '+page.server.ts');
	it('finds every form of import', () => {
		const src = [
			"import { eq } from 'drizzle-orm';",
			'import type { Flight } from "$lib/server/db/schema";',
			"export { db } from '$lib/server/db';",
			"import '$lib/server/db';",
			"const m = await import('drizzle-orm/pg-core');",
			"import {\n\tand,\n\tor\n} from 'drizzle-orm';"
		].join('\n');
		const specs = specifiersOf(src);
		expect(specs.filter((s) => isDatabaseImport(s, route))).toHaveLength(6);
	});
	it('catches a relative path into the database module and lets domain modules through', () => {
		expect(isDatabaseImport('../../../lib/server/db/schema', route)).toBe(true);
		expect(isDatabaseImport('../../lib/server/db', join(ROUTES, 'o', 'x.ts'))).toBe(true);
		expect(isDatabaseImport('$lib/server/flights/list', route)).toBe(false);
		expect(isDatabaseImport('$lib/server/dbx', route)).toBe(false);
		expect(isDatabaseImport('./$types', route)).toBe(false);
	});
});

describe('route files', () => {
	it('import neither drizzle-orm nor $lib/server/db (queries live in the server domain modules)', () => {
		const files = sourceFiles(ROUTES);
		expect(files.length).toBeGreaterThan(20);
		const offenders = files.flatMap((file) =>
			specifiersOf(readFileSync(file, 'utf8'))
				.filter((s) => isDatabaseImport(s, file))
				.map((s) => `${relative(ROOT, file)} imports ${s}`)
		);
		expect(offenders).toEqual([]);
	});
});
