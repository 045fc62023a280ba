// Hostile text through real form actions: NUL bytes, control and bidirectional-override
// characters answer 400 naming the field and the character, and nothing is stored.
import { describe, expect, it } from 'vitest';
import { isRedirect, type RequestEvent } from '@sveltejs/kit';
import { count, eq, like } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { organisations, users } from '$lib/server/db/schema';
import { actions as orgActions } from '../../src/routes/orgs/+page.server';
import { requireMember } from '$lib/server/access';

const stamp = Date.now().toString(36);
const user = { id: `ih-${stamp}`, email: `ih-${stamp}@hygiene.example`, name: 'Hana Hygiene', prefFuelUnit: null, timeZone: null };

function post(route: string, form: Record<string, string>) {
	const url = new URL(`http://127.0.0.1:4173${route}`);
	const body = new FormData();
	for (const [k, v] of Object.entries(form)) body.set(k, v);
	return {
		locals: { user, session: null, authVia: 'session' },
		params: {},
		url,
		route: { id: route.split('?')[0] },
		request: new Request(url, { method: 'POST', body })
	} as unknown as RequestEvent;
}

/** The action's answer: a failure's status and data, or 303 for a redirect. */
async function run(action: (e: never) => unknown, event: RequestEvent): Promise<{ status: number; data?: any }> {
	try {
		const r = (await action(event as never)) as { status?: number; data?: unknown } | undefined;
		return { status: r?.status ?? 200, data: r?.data };
	} catch (e) {
		if (isRedirect(e)) return { status: e.status };
		throw e;
	}
}

const orgsNamed = async (prefix: string) => (await db.select({ n: count() }).from(organisations).where(like(organisations.name, `${prefix}%`)))[0].n;

describe('form fields', () => {
	it('a NUL byte answers 400 naming the field and where, and stores nothing', async () => {
		await db.insert(users).values({ id: user.id, email: user.email, name: user.name, passwordHash: 'not-used' }).onConflictDoNothing();
		const r = await run(orgActions.create, post('/orgs?/create', { name: `Nul Club ${stamp}\u0000x` }));
		expect(r.status).toBe(400);
		expect(r.data.errors.name).toMatch(/NUL byte \(U\+0000\) at character \d+/);
		expect(r.data.values.name).not.toContain('\u0000');
		expect(await orgsNamed(`Nul Club ${stamp}`)).toBe(0);
	});

	it('a bidirectional override or control character in a name answers 400 and stores nothing', async () => {
		for (const c of ['\u202e', '\u2066', '\u0007', '\u001b']) {
			const r = await run(orgActions.create, post('/orgs?/create', { name: `Bidi Club ${stamp} ${c}bulc` }));
			expect(r.status, JSON.stringify(c)).toBe(400);
			expect(r.data.errors.name).toMatch(/U\+[0-9A-F]{4}\) at character/);
		}
		expect(await orgsNamed(`Bidi Club ${stamp}`)).toBe(0);
		// The same form with a clean name goes through.
		expect((await run(orgActions.create, post('/orgs?/create', { name: `Bidi Club ${stamp}` }))).status).toBe(303);
		expect(await orgsNamed(`Bidi Club ${stamp}`)).toBe(1);
		await db.delete(organisations).where(eq(organisations.name, `Bidi Club ${stamp}`));
	});
});

describe('path parameters', () => {
	it('an organisation slug with a NUL byte (/o/%00) is not found, not a server error', async () => {
		const event = { locals: { user }, url: new URL('http://127.0.0.1:4173/o/a%00b'), route: { id: '/o/[org]' } } as never;
		await expect(requireMember(event, 'a\u0000b')).rejects.toMatchObject({ status: 404 });
	});
});
