// The API page renders the OpenAPI document the server serves (every operation in it, the kinds
// of problem), signed out; and a token made on the account page with the read scope lists
// flights through the API but cannot upload (403 problem).
import { expect, request, test } from '@playwright/test';
import { DEMO_AIRCRAFT, DEMO_USERS, signIn } from './support';

test('the API page shows every operation of the OpenAPI document', async ({ page }) => {
	const doc = (await (await page.request.get('/api/v1/openapi.json')).json()) as { paths: Record<string, Record<string, unknown>> };
	const operations = Object.entries(doc.paths).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`));
	await page.setViewportSize({ width: 1366, height: 900 });
	await page.goto('/api-docs');
	await expect(page.getByRole('heading', { name: 'The Burndown API' })).toBeVisible();
	await expect(page.getByTestId('api-operation')).toHaveCount(operations.length);
	for (const op of operations) await expect(page.getByRole('heading', { name: new RegExp(`^${op.replace(/[{}]/g, '\\$&')} —`) })).toBeVisible();
	await expect(page.locator('#problem-not-found')).toContainText('Not found');
	await page.screenshot({ path: 'test-results/api-page.png', fullPage: false });
	await page.locator('#listFlights').scrollIntoViewIfNeeded();
	await page.screenshot({ path: 'test-results/api-page-flights.png', fullPage: false });
});

test('a read-only token from the account page lists flights and may not upload', async ({ page, baseURL }) => {
	await signIn(page, DEMO_USERS.pilot);
	await page.goto('/account');
	await page.getByLabel('New token name').fill(`e2e reader ${Date.now()}`);
	await page.getByLabel('Scope').selectOption('read');
	await page.getByLabel('Expires').selectOption('7');
	await page.getByRole('button', { name: 'Create' }).click();
	const token = (await page.getByTestId('new-token').textContent())!.trim();
	expect(token).toMatch(/^bdk_/);
	await expect(page.getByTestId('token-row').filter({ hasText: 'Read only · expires' }).first()).toBeVisible();
	await page.screenshot({ path: 'test-results/account-tokens.png', fullPage: false });

	const api = await request.newContext({ baseURL, extraHTTPHeaders: { authorization: `Bearer ${token}` } });
	const list = await api.get('/api/v1/flights?limit=2');
	expect(list.status()).toBe(200);
	const page1 = await list.json();
	expect(page1.items.length).toBeGreaterThan(0);
	const upload = await api.post(`/api/v1/flights?aircraftId=${DEMO_AIRCRAFT.trainer}&declaration=full`, { data: 'time_utc,fuel_flow_usgph\n', headers: { 'content-type': 'text/csv' } });
	expect(upload.status()).toBe(403);
	expect(upload.headers()['content-type']).toBe('application/problem+json');
	expect(await upload.json()).toMatchObject({ status: 403, outcome: 'error', detail: expect.stringMatching(/may only read/) });
	await api.dispose();
});
