// Sign-in throttling: after 10 failed attempts in 15 minutes an account is refused with a clear
// message, even with the right password (OWASP ASVS 2.2.1 allows at most 100 failures an hour).
import { expect, test } from '@playwright/test';
import { signUp, uniqueEmail } from './support';

test('an account is throttled after repeated failed sign-ins', async ({ page }) => {
	const email = uniqueEmail('target');
	const password = 'the real passphrase';
	await signUp(page, 'Casey Marsh', email, password);
	await page.getByRole('button', { name: 'Sign out' }).click();

	const attempt = (pw: string) =>
		page.request.post('/sign-in', { form: { email, password: pw }, headers: { accept: 'text/html', origin: 'http://127.0.0.1:4173' }, maxRedirects: 0 });

	for (let i = 0; i < 10; i++) {
		const res = await attempt(`wrong guess ${i}`);
		expect(res.status(), `failed attempt ${i + 1}`).toBe(400);
	}
	const locked = await attempt(password);
	expect(locked.status()).toBe(429);
	expect(await locked.text()).toContain('Too many failed sign-ins for this account');

	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('Wait 15 minutes');
});
