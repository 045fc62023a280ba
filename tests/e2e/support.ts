// Shared steps for the end-to-end tests: demo accounts, signing in through the real form, and a
// request context signed in as a role (for the route × role matrix).
import { expect, request, type APIRequestContext, type Page } from '@playwright/test';
import { linksIn, waitForMail } from '../helpers/mailbox';

export const ORIGIN = 'http://127.0.0.1:4173';
export const DEMO_PASSWORD = 'burndown-demo';
export const DEMO_ORG = 'kestrel';
export const OTHER_ORG = 'harrier';

export const DEMO_USERS = {
	admin: 'admin@kestrel.example',
	instructor: 'instructor@kestrel.example',
	pilot: 'pilot@kestrel.example',
	student: 'student@kestrel.example',
	viewer: 'viewer@kestrel.example',
	other: 'chief@harrier.example'
} as const;
export type DemoRole = keyof typeof DEMO_USERS;

export const DEMO_AIRCRAFT = {
	trainer: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000001',
	tourer: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000002',
	diesel: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000003',
	otherOrg: '6f1d2a40-0c1b-4c55-8f4e-7d1a00000004'
} as const;

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).not.toHaveURL(/\/sign-in/);
}

/** A request context holding a session for `role` (or none for 'anonymous'); no redirects followed. */
export async function apiAs(role: DemoRole | 'anonymous'): Promise<APIRequestContext> {
	const ctx = await request.newContext({ baseURL: ORIGIN, extraHTTPHeaders: { origin: ORIGIN } });
	if (role === 'anonymous') return ctx;
	const res = await ctx.post('/sign-in', {
		form: { email: DEMO_USERS[role], password: DEMO_PASSWORD },
		headers: { accept: 'text/html' },
		maxRedirects: 0
	});
	expect(res.status(), `sign-in as ${role}`).toBe(303);
	return ctx;
}

/** A unique address per test run, so reruns against the same database do not collide. */
export function uniqueEmail(prefix: string): string {
	return `${prefix}-${Date.now().toString(36)}${Math.floor(Math.random() * 1e4)}@example.org`;
}

/**
 * Submits the sign-up form already filled on `page`, then follows the e-mailed link (read from
 * the test mail sink's folder) and creates the account.
 */
export async function finishSignUp(page: Page, email: string): Promise<void> {
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByRole('status')).toContainText(email);
	const mail = await waitForMail(email, { predicate: (m) => m.subject.startsWith('Finish creating') });
	const href = linksIn(mail).find((l) => l.includes('/sign-up/'));
	expect(href, 'sign-up link in the e-mail').toBeTruthy();
	await page.goto(new URL(href!).pathname);
	await page.getByRole('button', { name: 'Create my account' }).click();
	await expect(page).not.toHaveURL(/\/sign-up/);
}

/** Signs up a new account through the form and the e-mailed link. */
export async function signUp(page: Page, name: string, email: string, password: string): Promise<void> {
	await page.goto('/sign-up');
	await page.getByLabel('Your name').fill(name);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await finishSignUp(page, email);
}
