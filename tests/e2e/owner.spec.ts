// The owner's tools in the browser: the trainer's fuel history with the demo's full-rich trip
// marked against the aircraft's usual burn, and that trip compared with the leaned one of the same
// route. Screenshots go to test-results/.
import { expect, test } from '@playwright/test';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const RICH = 'Merrow and back, never leaned';
const LEANED = 'Merrow and back, leaned in cruise';

test('the owner sees the rich trip marked, and its difference from the leaned trip at a glance', async ({ page }) => {
	await signIn(page, DEMO_USERS.admin);
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}`);
	await page.getByTestId('aircraft-history-link').click();
	await expect(page.getByTestId('history-table')).toBeVisible();
	await expect(page.getByTestId('burn-trend').locator('canvas').first()).toBeVisible();

	const rich = page.getByTestId('history-row').filter({ hasText: RICH });
	const leaned = page.getByTestId('history-row').filter({ hasText: LEANED });
	await expect(rich).toHaveAttribute('data-marked', '1');
	await expect(leaned).toHaveAttribute('data-marked', '0');
	// The extra fuel is quantified and a likely cause named, as a possibility.
	await expect(rich.getByTestId('high-burn')).toContainText(/cruise [\d.]+ US gal\/h over usual .* about [\d.]+ US gal extra/);
	await expect(rich.getByTestId('high-burn')).toContainText('mixture may not have been leaned');
	// The reserve column reads the flight's stored verdict, in the flights list's words.
	await expect(rich.getByTestId('history-verdict')).toHaveText(/^(Reserve kept|Landed below the reserve|No reserve amount to judge)/);
	await page.screenshot({ path: 'test-results/owner-history.png', fullPage: true });

	await leaned.getByRole('checkbox').check();
	await rich.getByRole('checkbox').check();
	await page.getByTestId('compare-selected').click();
	await expect(page).toHaveURL(/\/flights\/compare\?id=/);
	await expect(page.getByTestId('compare-flow').locator('canvas').first()).toBeVisible();
	// Newest first in the history, so the rich trip is the reference and the leaned one burns less.
	const cruise = page.getByTestId('compare-cruise');
	await expect(cruise.getByTestId('compare-delta')).toContainText(/−[\d.]+ US gal, flow −\d+ %/);
	await page.screenshot({ path: 'test-results/owner-compare-rich-leaned.png', fullPage: true });
});

test('the maintenance viewer reads the history and gets no forms to change it', async ({ page }) => {
	await signIn(page, DEMO_USERS.viewer);
	await page.goto(`/o/${DEMO_ORG}/aircraft/${DEMO_AIRCRAFT.trainer}/history`);
	await expect(page.getByTestId('history-row').filter({ hasText: RICH })).toHaveAttribute('data-marked', '1');
	await expect(page.getByRole('button', { name: /Mark unusual/ })).toHaveCount(0);
	await expect(page.getByRole('heading', { name: 'High-burn settings' })).toHaveCount(0);
});
