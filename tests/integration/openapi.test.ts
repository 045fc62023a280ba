// The OpenAPI document at /api/v1/openapi.json: valid OpenAPI 3.1 (checked by
// @readme/openapi-parser against the specification's own schema, with no reference outside the
// document), and complete: every endpoint file under src/routes/api/v1, with each method it
// exports, is described, and nothing else is.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { compileErrors, validate } from '@readme/openapi-parser';
import { GET } from '../../src/routes/api/v1/openapi.json/+server';

const ROUTES = fileURLToPath(new URL('../../src/routes/api/v1', import.meta.url));
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** Every +server.ts under the folder: its OpenAPI path ([id] → {id}) and the methods it exports. */
function endpointFiles(dir: string): { path: string; methods: string[] }[] {
	const out: { path: string; methods: string[] }[] = [];
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) out.push(...endpointFiles(full));
		else if (entry.name === '+server.ts') {
			const source = fs.readFileSync(full, 'utf8');
			const rel = path.relative(ROUTES, dir).split(path.sep).filter(Boolean);
			const apiPath = '/api/v1' + rel.map((s) => '/' + s.replace(/^\[(\w+)\]$/, '{$1}')).join('');
			out.push({ path: apiPath, methods: METHODS.filter((m) => new RegExp(`export const ${m}\\b`).test(source)).map((m) => m.toLowerCase()) });
		}
	}
	return out;
}

async function document() {
	const res = await GET({} as never);
	expect(res.status).toBe(200);
	return (await res.json()) as { openapi: string; paths: Record<string, Record<string, unknown>> };
}

describe('the OpenAPI document', () => {
	it('is valid OpenAPI 3.1', async () => {
		const doc = await document();
		expect(doc.openapi).toBe('3.1.0');
		const result = await validate(structuredClone(doc) as never, { resolve: { external: false } } as never);
		expect(result.valid, result.valid ? '' : compileErrors(result)).toBe(true);
		expect(result.specification).toBe('OpenAPI');
	});

	it('describes every endpoint file under src/routes/api/v1 and each of its methods, and no other', async () => {
		const doc = await document();
		const files = endpointFiles(ROUTES);
		expect(files.length).toBeGreaterThanOrEqual(9);
		for (const f of files) {
			expect(Object.keys(doc.paths), f.path).toContain(f.path);
			expect(Object.keys(doc.paths[f.path]).sort(), f.path).toEqual([...f.methods].sort());
		}
		expect(Object.keys(doc.paths).sort()).toEqual(files.map((f) => f.path).sort());
	});

	it('every error answer of every operation is a problem (application/problem+json)', async () => {
		const doc = (await document()) as unknown as { paths: Record<string, Record<string, { responses: Record<string, { $ref?: string; content?: Record<string, unknown> }> }>>; components: { responses: Record<string, { content: Record<string, unknown> }> } };
		for (const [p, ops] of Object.entries(doc.paths))
			for (const [m, op] of Object.entries(ops))
				for (const [status, r] of Object.entries(op.responses)) {
					if (Number(status) < 400) continue;
					const content = r.$ref ? doc.components.responses[r.$ref.split('/').at(-1)!].content : r.content!;
					expect(Object.keys(content), `${m} ${p} ${status}`).toEqual(['application/problem+json']);
				}
	});
});
