// The layering rules of DEVELOPERS.md ("Layout"), checked on every `npm test` by reading each
// source file's imports: the server never reaches into the UI folder, browser code never imports
// server modules (not even for types), the fuel engine stays pure, and route files leave queries
// to the server's domain modules. Each rule is also run on a made-up file that breaks it, so a
// rule that can no longer fail shows up here.
import fs from 'node:fs';
import { builtinModules } from 'node:module';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '..');
const SRC = path.join(ROOT, 'src');

/** Packages the engine may use: pure computation, no I/O. A new one is added here on purpose. */
const ENGINE_PACKAGES = new Set(['geographiclib-geodesic', 'ml-spectra-processing', 'fast-check', 'vitest']);

/** Names whose use means I/O or reaching outside the computation. */
const IO_GLOBALS = [
	'fetch',
	'XMLHttpRequest',
	'WebSocket',
	'EventSource',
	'localStorage',
	'sessionStorage',
	'indexedDB',
	'document',
	'window',
	'navigator',
	'process',
	'require',
	'Deno',
	'Bun'
];

interface SourceFile {
	/** Path from the repository root, with forward slashes. */
	rel: string;
	text: string;
}

function listFiles(dir: string): string[] {
	const out: string[] = [];
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) out.push(...listFiles(full));
		else if (/\.(ts|js|svelte)$/.test(entry.name) && !entry.name.endsWith('.d.ts')) out.push(full);
	}
	return out;
}

/** Comments removed (line and block), so a path named in a comment is not an import. */
function stripComments(text: string): string {
	return text.replace(/\/\*[\s\S]*?\*\//g, ' ').replace(/(^|[^:'"`\\])\/\/[^\n]*/g, '$1').replace(/<!--[\s\S]*?-->/g, ' ');
}

/** Every module specifier a file imports or re-exports, type-only ones included. */
function importsOf(text: string): string[] {
	const code = stripComments(text);
	const found: string[] = [];
	const patterns = [/\b(?:import|export)\s[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]/g, /\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g, /\bimport\s+['"]([^'"]+)['"]/g];
	for (const re of patterns) for (const m of code.matchAll(re)) found.push(m[1]);
	return found;
}

/** A specifier as a path from the repository root ($lib and relative ones), or the bare package. */
function resolve(fromRel: string, spec: string): string {
	if (spec.startsWith('$lib/') || spec === '$lib') return 'src/lib' + spec.slice(4);
	if (spec.startsWith('.')) return path.posix.normalize(path.posix.join(path.posix.dirname(fromRel), spec));
	return spec;
}

const under = (target: string, dir: string) => target === dir || target.startsWith(dir + '/') || target.startsWith(dir + '.');
const isTest = (rel: string) => /\.(test|spec|fuzz\.test)\.ts$/.test(rel);
const isServerOnly = (rel: string) =>
	under(rel, 'src/lib/server') || /(^|\/)\+server\.ts$/.test(rel) || /\.server\.ts$/.test(rel) || rel === 'src/hooks.server.ts';
const packageOf = (spec: string) => (spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]);
const isNodeBuiltin = (spec: string) => spec.startsWith('node:') || builtinModules.includes(packageOf(spec));

/** What is wrong with one file, as lines for the failure message. */
function violations(file: SourceFile): string[] {
	const { rel, text } = file;
	const out: string[] = [];
	const imports = importsOf(text).map((spec) => ({ spec, target: resolve(rel, spec) }));
	if (under(rel, 'src/lib/server')) {
		for (const { spec, target } of imports)
			if (under(target, 'src/lib/components')) out.push(`${rel}: the server imports the UI folder (${spec})`);
	}
	if (!isServerOnly(rel) && !isTest(rel)) {
		for (const { spec, target } of imports)
			if (under(target, 'src/lib/server')) out.push(`${rel}: browser code imports a server module (${spec})`);
	}
	if (under(rel, 'src/lib/fuel')) {
		for (const { spec, target } of imports) {
			if (spec.startsWith('.') || spec.startsWith('$lib/')) {
				if (!under(target, 'src/lib/fuel') && !['src/lib/units', 'src/lib/rounding'].some((d) => under(target, d)))
					out.push(`${rel}: the engine imports ${spec} (only the engine, $lib/units and $lib/rounding)`);
			} else if (isNodeBuiltin(spec)) out.push(`${rel}: the engine imports the Node module ${spec}`);
			else if (!ENGINE_PACKAGES.has(packageOf(spec))) out.push(`${rel}: the engine imports the package ${spec} (not in ENGINE_PACKAGES)`);
		}
		if (!isTest(rel)) {
			const code = stripComments(text).replace(/(['"`])(?:\\.|(?!\1)[^\\\n])*\1/g, '""');
			for (const name of IO_GLOBALS)
				if (!new RegExp(`\\b(?:const|let|var|function|class)\\s+${name}\\b`).test(code) && new RegExp(`(?<![\\w$.])${name}\\s*[.([]`).test(code)) out.push(`${rel}: the engine uses ${name} (I/O)`);
		}
	}
	if (rel.startsWith('src/routes/')) {
		for (const { spec } of imports)
			if (packageOf(spec) === 'drizzle-orm') out.push(`${rel}: a route file imports ${spec}; put the query in a server module`);
	}
	return out;
}

const files: SourceFile[] = listFiles(SRC).map((full) => ({
	rel: path.relative(ROOT, full).split(path.sep).join('/'),
	text: fs.readFileSync(full, 'utf8')
}));

describe('layering', () => {
	it('reads the source tree', () => {
		expect(files.some((f) => f.rel === 'src/lib/fuel/engine.ts')).toBe(true);
		expect(files.some((f) => f.rel.endsWith('.svelte'))).toBe(true);
	});

	it('holds in every source file', () => {
		expect(files.flatMap(violations)).toEqual([]);
	});

	describe('each rule fails on a file that breaks it', () => {
		const check = (rel: string, text: string) => violations({ rel, text });
		it('the server importing a component', () => {
			expect(check('src/lib/server/flights/x.ts', `import { a } from '$lib/components/replay/x';`)).toHaveLength(1);
			expect(check('src/lib/server/flights/x.ts', `import type { A } from '../../components/replay/x';`)).toHaveLength(1);
			expect(check('src/lib/server/flights/x.ts', `// see $lib/components/replay/x\nimport { a } from '$lib/wire/replay';`)).toEqual([]);
		});
		it('browser code importing a server module, even type-only', () => {
			expect(check('src/routes/o/[org]/x/state.svelte.ts', `import type { A } from '$lib/server/live/x';`)).toHaveLength(1);
			expect(check('src/lib/components/X.svelte', `<script lang="ts">\n\timport {\n\t\ta\n\t} from '$lib/server/db';\n</script>`)).toHaveLength(1);
			expect(check('src/lib/flight-inputs.ts', `export type { A } from './server/x';`)).toHaveLength(1);
			expect(check('src/routes/o/[org]/x/+page.server.ts', `import { db } from '$lib/server/db';`)).toEqual([]);
			expect(check('src/routes/api/x/+server.ts', `import { db } from '$lib/server/db';`)).toEqual([]);
		});
		it('the engine doing I/O or importing Node', () => {
			expect(check('src/lib/fuel/x.ts', `import fs from 'node:fs';`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `import { readFile } from 'fs/promises';`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `import { db } from '$lib/server/db';`)).toContain('src/lib/fuel/x.ts: the engine imports $lib/server/db (only the engine, $lib/units and $lib/rounding)');
			expect(check('src/lib/fuel/x.ts', `import { z } from 'zod';`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `export async function f() { return (await fetch('/x')).json(); }`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `const debug = process.env.DEBUG;`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `if (typeof window !== 'undefined') window.localStorage.setItem('a', 'b');`)).toHaveLength(1);
			expect(check('src/lib/fuel/x.ts', `const window = rows.slice(0, 5);\nconst n = window.length;`)).toEqual([]);
			expect(check('src/lib/fuel/x.ts', `import { FT_PER_M } from '$lib/units';\n// fetch(…) would be I/O\nconst s = 'process.env';`)).toEqual([]);
		});
		it('a route file importing drizzle-orm', () => {
			expect(check('src/routes/o/[org]/new/+page.server.ts', `import { eq } from 'drizzle-orm';`)).toHaveLength(1);
			expect(check('src/routes/o/[org]/new/helpers.ts', `import { sql } from 'drizzle-orm';`)).toHaveLength(1);
			expect(check('src/lib/server/flights/new.ts', `import { eq } from 'drizzle-orm';`)).toEqual([]);
		});
	});
});
