// The live page tells the viewer's own connection apart from the aircraft's: with this browser's
// stream to Burndown blocked, the page says so (never a green "live" over "waiting for the
// recorder"), and once the link is back the figures come in and the badge says what is true.
import { expect, test } from '@playwright/test';
import { DEMO_ORG, DEMO_USERS, signIn } from './support';

// The demo flight followed live through the trainer's recorder (scripts/demo-flights.ts).
const LONG = 'The long way round against a headwind';

test("the viewer's own lost connection is named as such, and the page recovers when it is back", async ({ page }) => {
	await signIn(page, DEMO_USERS.instructor);
	await page.goto(`/o/${DEMO_ORG}/flights`);
	const href = await page.getByTestId('flight-row').filter({ hasText: LONG }).getByRole('link').first().getAttribute('href');
	const stream = /\/api\/v1\/flights\/[0-9a-f-]{36}\/stream/;
	await page.route(stream, (route) => route.abort('internetdisconnected'));
	await page.goto(`${href}/live`);

	const status = page.getByTestId('live-status');
	await expect(status).toHaveAttribute('data-state', 'link-lost');
	await expect(status).not.toHaveText(/^live$/);
	await expect(page.getByTestId('link-banner')).toContainText('Your connection to Burndown is lost');
	await expect(page.getByTestId('link-banner')).toContainText("not the aircraft's");
	await expect(page.getByTestId('last-sample')).toHaveText('Nothing received yet: your connection to Burndown is down.');
	await expect(page.getByText('Waiting for the first samples from the recorder')).toHaveCount(0);

	// The link comes back: the samples arrive and the badge says the flight is finished.
	await page.unroute(stream);
	await expect(page.getByTestId('last-sample')).toHaveText(/11,457 samples/, { timeout: 20_000 });
	await expect(status).toHaveText('flight finished');
	await expect(status).toHaveAttribute('data-state', 'ended');
	await expect(page.getByTestId('link-banner')).toHaveCount(0);
});
