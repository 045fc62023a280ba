// The demo mailbox page: signed-in users read only what was sent to them, signed-out visitors are
// sent to sign in, and outside demo mode the page does not exist. It once listed every message,
// reset links included, to anyone.
import { afterEach, describe, expect, it } from 'vitest';
import { isHttpError, isRedirect } from '@sveltejs/kit';
import { sendMail } from '$lib/server/mail';
import { load } from '../../src/routes/dev/mailbox/+page.server';

const stamp = Date.now().toString(36);
const alice = `alice-${stamp}@example.org`;
const bob = `bob-${stamp}@example.org`;

type LoadEvent = Parameters<typeof load>[0];
function eventFor(email: string | null): LoadEvent {
	const user = email ? { id: `id-${email}`, email, name: 'Someone', prefFuelUnit: null, timeZone: null } : null;
	return { locals: { user, session: null, authVia: user ? 'session' : null }, url: new URL('http://127.0.0.1:4173/dev/mailbox'), route: { id: '/dev/mailbox' } } as unknown as LoadEvent;
}

async function outcome(fn: () => Promise<unknown>) {
	try {
		return { value: await fn() };
	} catch (thrown) {
		return { thrown };
	}
}

const demo = process.env.BURNDOWN_DEMO;
afterEach(() => {
	process.env.BURNDOWN_DEMO = demo;
});

describe('/dev/mailbox', () => {
	it('shows a signed-in user only the messages addressed to them', async () => {
		process.env.BURNDOWN_DEMO = '1';
		await sendMail({ to: alice, subject: 'for alice', text: 'https://127.0.0.1/reset-password/rst_alice' });
		await sendMail({ to: bob, subject: 'for bob', text: 'https://127.0.0.1/reset-password/rst_bob' });
		const page = (await load(eventFor(alice.toUpperCase()))) as { messages: { to: string[]; subject: string }[] };
		expect(page.messages.map((m) => m.subject)).toEqual(['for alice']);
		expect(page.messages.every((m) => m.to.includes(alice))).toBe(true);
	});

	it('sends a signed-out visitor to sign in and lists nothing', async () => {
		process.env.BURNDOWN_DEMO = '1';
		const result = await outcome(() => load(eventFor(null)) as Promise<unknown>);
		expect('thrown' in result && isRedirect(result.thrown) && result.thrown.location.startsWith('/sign-in')).toBe(true);
	});

	it('is not found outside demo mode, even signed in', async () => {
		delete process.env.BURNDOWN_DEMO;
		const result = await outcome(() => load(eventFor(alice)) as Promise<unknown>);
		expect('thrown' in result && isHttpError(result.thrown) && result.thrown.status).toBe(404);
	});
});
