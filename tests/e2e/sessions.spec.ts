// The account page lists where one is signed in (this device marked) and signs out the other
// devices, or every device.
import { expect, test } from '@playwright/test';
import { signIn, signUp, uniqueEmail } from './support';

test('list of sessions, sign out of other devices, sign out everywhere', async ({ page, browser }) => {
	const email = uniqueEmail('twodevices');
	const password = 'two devices passphrase';
	await signUp(page, 'Morgan Tey', email, password);

	const laptop = await browser.newContext();
	const l = await laptop.newPage();
	await signIn(l, email, password);
	await l.goto('/account');
	await expect(l.getByTestId('session')).toHaveCount(2);
	await expect(l.getByTestId('session').first()).toContainText('This device');
	await expect(l.getByTestId('session').nth(1)).toContainText('Another device');

	await l.getByRole('button', { name: 'Sign out of other devices' }).click();
	await expect(l.getByRole('status')).toContainText('Signed out of every other device');
	await expect(l.getByTestId('session')).toHaveCount(1);
	await page.goto('/account');
	await expect(page).toHaveURL(/\/sign-in/);

	await l.getByRole('button', { name: 'Sign out everywhere' }).click();
	await expect(l).toHaveURL(/\/sign-in/);
	await l.goto('/account');
	await expect(l).toHaveURL(/\/sign-in/);
	await laptop.close();
});
