// Local time beside UTC: with no preference the browser's zone (Playwright's timezoneId) appears
// after mount while the server's HTML carries UTC alone (so hydration never disagrees); with a
// zone chosen on the account page the server already writes it, on the flights list, the replay
// and the overview. The viewer account is used and its preference put back at the end.
import pg from 'pg';
import { expect, test, type Page } from '@playwright/test';
import { DEMO_ORG, DEMO_USERS, signIn } from './support';

test.use({ timezoneId: 'America/New_York' });

// "09:05 UTC (04:05 EST)" or, in summer, "(05:05 EDT)"; the local date may come first. The flights
// table sets the local time on a line of its own (markup between them, no space in the text).
const NEW_YORK = /\d\d:\d\d UTC(\s|<[^>]*>)*\((\d{4}-\d\d-\d\d )?\d\d:\d\d E[SD]T\)/;
const TOKYO = /\d\d:\d\d UTC(\s|<[^>]*>)*\((\d{4}-\d\d-\d\d )?\d\d:\d\d GMT\+9\)/;

async function resetZone() {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		await client.query(`update users set time_zone = null where email = $1`, [DEMO_USERS.viewer]);
	} finally {
		await client.end();
	}
}

test.beforeAll(resetZone);
test.afterAll(resetZone);

/** The page's HTML as the server sends it, before any script runs. */
async function serverHtml(page: Page, path: string): Promise<string> {
	const res = await page.request.get(path, { headers: { accept: 'text/html' } });
	expect(res.status()).toBe(200);
	return res.text();
}

function watchErrors(page: Page): string[] {
	const errors: string[] = [];
	page.on('pageerror', (e) => errors.push(e.message));
	page.on('console', (m) => {
		if (m.type() === 'error' || /hydrat/i.test(m.text())) errors.push(m.text());
	});
	return errors;
}

test('without a preference the browser’s zone appears beside UTC after mount, never in the server’s HTML', async ({ page }) => {
	const errors = watchErrors(page);
	await signIn(page, DEMO_USERS.viewer);
	const html = await serverHtml(page, `/o/${DEMO_ORG}/flights`);
	expect(html).toMatch(/\d{4}-\d\d-\d\d \d\d:\d\d UTC/);
	expect(html).not.toMatch(/ E[SD]T\)/);

	await page.goto(`/o/${DEMO_ORG}/flights`);
	const first = page.getByTestId('flight-row').first();
	await expect(first.locator('td').first()).toContainText(NEW_YORK);
	await page.screenshot({ path: 'test-results/time-zone-browser-flights.png' });

	await page.goto(`/o/${DEMO_ORG}`);
	await expect(page.getByRole('main').getByRole('table').locator('tbody tr').first()).toContainText(NEW_YORK);

	await page.goto(`/o/${DEMO_ORG}/flights`);
	await first.locator('a').first().click();
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	await expect(page.getByTestId('flight-start')).toContainText(NEW_YORK);
	await expect(page.getByTestId('scrub-local')).toHaveText(/^\(\d\d:\d\d:\d\d E[SD]T\)$/);
	expect(errors).toEqual([]);
});

test('a zone chosen on the account page is written by the server on the flights list, the replay and the overview', async ({ page }) => {
	const errors = watchErrors(page);
	await signIn(page, DEMO_USERS.viewer);
	await page.goto('/account');
	await page.getByTestId('time-zone').selectOption('Asia/Tokyo');
	await page.getByTestId('time-zone').locator('xpath=ancestor::form').getByRole('button', { name: 'Save' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();
	await expect(page.getByTestId('time-zone-example')).toContainText(TOKYO);

	// Known on the server: the HTML already carries the local time, and the browser's own zone
	// (New York) never shows.
	const list = await serverHtml(page, `/o/${DEMO_ORG}/flights`);
	expect(list).toMatch(TOKYO);
	const overview = await serverHtml(page, `/o/${DEMO_ORG}`);
	expect(overview).toMatch(TOKYO);

	await page.goto(`/o/${DEMO_ORG}/flights`);
	const first = page.getByTestId('flight-row').first();
	await expect(first.locator('td').first()).toContainText(TOKYO);
	await expect(page.getByRole('main')).not.toContainText(/ E[SD]T\)/);
	await page.screenshot({ path: 'test-results/time-zone-tokyo-flights.png' });

	await first.locator('a').first().click();
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	await expect(page.getByTestId('flight-start')).toContainText(TOKYO);
	await expect(page.getByTestId('scrub-local')).toHaveText(/^\(\d\d:\d\d:\d\d GMT\+9\)$/);
	await expect(page.getByTestId('fig-time')).toContainText(/UTC \(\d\d:\d\d:\d\d GMT\+9\)/);
	await page.screenshot({ path: 'test-results/time-zone-tokyo-replay.png' });

	await page.goto(`/o/${DEMO_ORG}`);
	await expect(page.getByRole('main').getByRole('table').locator('tbody tr').first()).toContainText(TOKYO);

	// Back to the browser's zone.
	await page.goto('/account');
	await page.getByTestId('time-zone').selectOption('');
	await page.getByTestId('time-zone').locator('xpath=ancestor::form').getByRole('button', { name: 'Save' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();
	await expect(page.getByTestId('time-zone-example')).toContainText(NEW_YORK);
	expect(errors).toEqual([]);
});

test('a zone the platform does not know is refused with a message, and nothing is stored', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	const res = await page.request.post('/account?/preferences', {
		form: { prefFuelUnit: '', timeZone: 'Mars/Olympus_Mons' },
		headers: { origin: new URL(page.url()).origin, accept: 'application/json', 'x-sveltekit-action': 'true' }
	});
	const body = await res.text();
	expect(body).toContain('Choose a time zone from the list.');
	const html = await serverHtml(page, `/o/${DEMO_ORG}/flights`);
	expect(html).not.toContain('Mars/Olympus_Mons');
	expect(html).not.toMatch(/UTC \(\d\d:\d\d/);
});
