// A new user's first minutes: sign up, create an organisation, add the first aircraft.
import { expect, test } from '@playwright/test';
import { finishSignUp, uniqueEmail } from './support';

test('sign up, create an organisation and add an aircraft with field-level errors', async ({ page }) => {
	const email = uniqueEmail('owner');
	await page.goto('/sign-up');
	await page.getByLabel('Your name').fill('Avery Quill');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('short');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('Use at least 8 characters.')).toBeVisible();
	// The name and address the user typed are still there; the password is not echoed.
	await expect(page.getByLabel('Your name')).toHaveValue('Avery Quill');
	await expect(page.getByLabel('E-mail')).toHaveValue(email);

	await page.getByLabel('Password').fill('a long enough passphrase');
	await finishSignUp(page, email);
	await expect(page).toHaveURL(/\/orgs$/);

	await page.getByLabel('Name').fill('Quill Hangar');
	await page.getByRole('button', { name: 'Create organisation' }).click();
	await expect(page).toHaveURL(/\/o\/quill-hangar(-\d+)?\/aircraft\/new$/);

	// A bad capacity and a lower level above it: errors beside the fields, input kept.
	await page.getByLabel('Registration').fill('bd-qa1');
	await page.getByLabel('Type', { exact: true }).fill('Two-seat trainer');
	await page.getByLabel(/Usable fuel when full/).fill('lots');
	await page.getByLabel(/Lower fill level/).fill('30');
	await page.getByRole('button', { name: 'Add aircraft' }).click();
	await expect(page.getByText('Enter the usable capacity as a number.')).toBeVisible();
	await expect(page.getByLabel('Registration')).toHaveValue('bd-qa1');

	await page.getByLabel(/Usable fuel when full/).fill('24');
	await page.getByLabel(/Lower fill level/).fill('30');
	await page.getByRole('button', { name: 'Add aircraft' }).click();
	await expect(page.getByText('The lower fill level must be below the full capacity.')).toBeVisible();

	await page.getByLabel(/Lower fill level/).fill('16');
	await page.getByLabel(/Baseline cruise flow/).fill('5.5');
	await page.getByRole('button', { name: 'Add aircraft' }).click();
	await expect(page.getByRole('heading', { name: /BD-QA1/ })).toBeVisible();
	await expect(page.getByText('24.0 US gal')).toBeVisible();
	await page.setViewportSize({ width: 1024, height: 1366 });
	await page.screenshot({ path: 'test-results/onboarding-aircraft.png', fullPage: true });

	// Below 1280 px the sections sit behind the header's menu.
	await page.getByTestId('menu-button').click();
	await page.getByTestId('menu-panel').getByRole('link', { name: 'Aircraft' }).click();
	await expect(page.getByRole('cell', { name: 'BD-QA1', exact: true })).toBeVisible();
});
