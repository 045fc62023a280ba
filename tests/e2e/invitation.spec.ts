// An admin invites a new member by e-mail; the invitee follows the link from the e-mail (read from
// the test mail sink's folder), creates an account and lands in the organisation with the invited
// role. The demo mailbox page shows a signed-in user only their own mail.
import { expect, test } from '@playwright/test';
import { linksIn, waitForMail } from '../helpers/mailbox';
import { DEMO_ORG, DEMO_USERS, finishSignUp, signIn, signUp, uniqueEmail } from './support';

test('invitation by e-mail', async ({ page, browser }) => {
	const invitee = uniqueEmail('newpilot');
	await signIn(page, DEMO_USERS.admin);
	await page.goto(`/o/${DEMO_ORG}/members`);
	await page.getByLabel('E-mail').fill(invitee);
	await page.getByLabel('Role', { exact: true }).selectOption('instructor');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByText(`Invitation sent to ${invitee}.`)).toBeVisible();
	await expect(page.getByText(`${invitee} · Instructor`)).toBeVisible();

	// A fresh browser without a session, as the invitee would be.
	const guest = await browser.newContext();
	const p = await guest.newPage();
	const mail = await waitForMail(invitee);
	expect(mail.subject).toBe('Join Kestrel Field Flying Club on Burndown');
	const href = linksIn(mail).find((l) => l.includes('/invite/'));
	expect(href).toMatch(/\/invite\/inv_/);

	await p.goto(new URL(href!).pathname);
	await expect(p.getByRole('heading', { name: 'Join Kestrel Field Flying Club' })).toBeVisible();
	await p.getByRole('link', { name: 'Create an account' }).click();
	await p.getByLabel('Your name').fill('Rowan Ashdown');
	await p.getByLabel('E-mail').fill(invitee);
	await p.getByLabel('Password').fill('invited and welcome');
	await finishSignUp(p, invitee);
	await expect(p).toHaveURL(/\/invite\/inv_/);
	await p.getByRole('button', { name: 'Accept and join' }).click();
	await expect(p).toHaveURL(new RegExp(`/o/${DEMO_ORG}$`));
	await expect(p.getByRole('heading', { name: 'Kestrel Field Flying Club' })).toBeVisible();

	// The same link cannot be used twice.
	const again = await p.goto(new URL(href!).pathname);
	expect(again?.status()).toBe(404);

	// The admin now sees the new instructor among the members.
	await page.reload();
	await expect(page.getByRole('row', { name: /Rowan Ashdown/ })).toBeVisible();
	await guest.close();
});

test('password reset by e-mailed link', async ({ page }) => {
	const email = uniqueEmail('forgetful');
	await signUp(page, 'Jules Fenwick', email, 'first passphrase here');
	await page.getByRole('button', { name: 'Sign out' }).click();

	await page.goto('/reset-password');
	await page.getByLabel('E-mail').fill(email);
	await page.getByRole('button', { name: 'E-mail me a link' }).click();
	await expect(page.getByRole('status')).toContainText(email);

	const mail = await waitForMail(email, { predicate: (m) => m.subject.includes('Reset') });
	const href = linksIn(mail).find((l) => l.includes('/reset-password/'));
	await page.goto(new URL(href!).pathname);
	await page.getByLabel('New password').fill('second passphrase here');
	await page.getByLabel('The same again').fill('second passphrase here');
	await page.getByRole('button', { name: 'Save and sign in' }).click();
	await expect(page).toHaveURL(/\/orgs$/);

	await page.getByRole('button', { name: 'Sign out' }).click();
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('first passphrase here');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match');
});

test('the demo mailbox shows a signed-in user only their own messages', async ({ page, browser }) => {
	const invitee = uniqueEmail('bystander');
	await signIn(page, DEMO_USERS.admin);
	await page.goto(`/o/${DEMO_ORG}/members`);
	await page.getByLabel('E-mail').fill(invitee);
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByText(`Invitation sent to ${invitee}.`)).toBeVisible();
	await waitForMail(invitee);

	// Signed out: sent to sign in, nothing listed.
	const guest = await browser.newContext();
	const g = await guest.newPage();
	await g.goto('/dev/mailbox');
	await expect(g).toHaveURL(/\/sign-in\?next=%2Fdev%2Fmailbox/);
	await guest.close();

	// Another demo user sees none of the invitee's mail.
	const other = await browser.newContext();
	const o = await other.newPage();
	await signIn(o, DEMO_USERS.viewer);
	await o.goto('/dev/mailbox');
	await expect(o.getByRole('heading', { name: 'Demo mailbox' })).toBeVisible();
	await expect(o.getByText(invitee)).toHaveCount(0);
	for (const to of await o.getByTestId('mail-to').allTextContents()) expect(to).toContain(DEMO_USERS.viewer);
	await other.close();
});
