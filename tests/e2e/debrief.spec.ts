// The instructor's debrief of the demo student's cross-country, in the browser against the built
// app: plan against actual on the replay page (one leg off plan), a note edited, the plan form's
// errors keeping the input, the debrief written, signed off and published (the student's e-mail
// in the mail sink), the print layout rendered to PDF for A4 and Letter (page count, key
// figures in its text, pages as PNGs in test-results/ to look at), a share link opened signed out
// and revoked, and the student reading the published debrief.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { expect, test } from '@playwright/test';
import { DEMO_ORG, DEMO_USERS, signIn } from './support';
import { linksIn, waitForMail } from '../helpers/mailbox';

let flightId = '';
const OUT = path.resolve('test-results', 'debrief-pdf');

test.beforeAll(async () => {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		const { rows } = await client.query("select id from flights where title like 'Solo cross-country%' limit 1");
		flightId = rows[0].id;
	} finally {
		await client.end();
	}
	fs.mkdirSync(OUT, { recursive: true });
});

const pdfText = (file: string) => execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
const pdfPages = (file: string) => Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1]);

test('instructor debriefs the student cross-country: plan against actual, notes, sign-off, PDF, share', async ({ page, browser }) => {
	test.setTimeout(120_000);
	const base = `/o/${DEMO_ORG}/flights/${flightId}`;
	await signIn(page, DEMO_USERS.instructor);

	// Replay: the plan against actual, FENWAY off plan, the planned line over the fuel chart.
	await page.goto(base);
	const legs = page.getByTestId('plan-leg');
	await expect(legs).toHaveCount(5);
	await expect(page.locator('[data-testid=plan-leg][data-off-plan=true]')).toHaveCount(1);
	await expect(page.locator('[data-testid=plan-leg][data-off-plan=true]')).toContainText('FENWAY');
	await expect(page.locator('[data-testid=plan-leg][data-off-plan=true]')).toContainText('Fuel consumption different than planned');
	await page.getByTestId('plan-section').screenshot({ path: path.join(OUT, 'replay-plan-vs-actual.png') });

	// Edit the demo note: the new words replace the old, marked as edited.
	const note = page.getByTestId('note').first();
	await note.getByText('Edit', { exact: true }).click();
	await note.getByLabel('Note').fill('Climb out of Bramble Down full rich to cruise: lean in the climb above 3000 ft.');
	await note.getByRole('button', { name: 'Save the note' }).click();
	await expect(page.getByTestId('note').first()).toContainText('lean in the climb above 3000 ft.');
	await expect(page.getByTestId('note').first()).toContainText('edited');

	// Plan form: a bad cell is named and keeps what was typed; rows can be added and removed.
	await page.goto(`${base}/plan`);
	await expect(page.getByTestId('leg-row')).toHaveCount(5);
	await page.getByRole('button', { name: 'Add a leg' }).click();
	await expect(page.getByTestId('leg-row')).toHaveCount(6);
	await page.getByRole('button', { name: 'Remove leg 6' }).click();
	await page.getByRole('button', { name: 'Move leg 2 up' }).click();
	await expect(page.getByLabel('Leg 1: To waypoint')).toHaveValue('SALTMR');
	await page.getByRole('button', { name: 'Move leg 1 down' }).click();
	await page.getByLabel('Leg 2: Distance (NM)').fill('far');
	await page.getByRole('button', { name: 'Save the plan' }).click();
	await expect(page.getByTestId('plan-form').getByRole('alert').first()).toContainText('distance');
	await expect(page.getByLabel('Leg 2: Distance (NM)')).toHaveValue('far');
	await page.getByTestId('worked-plan').screenshot({ path: path.join(OUT, 'worked-plan.png') });

	// Debrief: summary, sign-off, publish; the student's e-mail.
	await page.goto(`${base}/debrief`);
	await page.getByLabel("Instructor's summary").fill('Good planning and a reserve well kept. Lean in the climb: the leg to FENWAY used a third more than planned.');
	await page.getByRole('button', { name: 'Save the summary' }).click();
	await expect(page.getByTestId('debrief-summary')).toContainText('a third more than planned');
	await page.getByRole('button', { name: 'Sign off' }).click();
	await expect(page.getByTestId('sign-off')).toContainText('Signed off by Ines Varga');
	await page.getByRole('button', { name: 'Publish to the student' }).click();
	await expect(page.getByTestId('published')).toContainText(DEMO_USERS.student);
	await expect(page.getByTestId('debrief-status')).toContainText('Published');

	// Share link, shown once.
	await page.getByRole('button', { name: 'Make a link' }).click();
	const shareUrl = (await page.getByTestId('share-url').textContent())!.trim();
	expect(shareUrl).toMatch(/\/share\/bds_/);

	// Print layout to PDF, A4 and Letter, light theme, nothing of the site's navigation.
	await page.goto(`${base}/debrief/print`);
	await expect(page.getByTestId('debrief-doc')).toBeVisible();
	await page.emulateMedia({ media: 'print' });
	for (const format of ['A4', 'Letter'] as const) {
		const file = path.join(OUT, `debrief-${format}.pdf`);
		await page.pdf({ path: file, format, printBackground: true });
		const pages = pdfPages(file);
		expect(pages, `${format} pages`).toBeGreaterThanOrEqual(1);
		expect(pages, `${format} pages`).toBeLessThanOrEqual(2);
		const text = pdfText(file);
		for (const want of ['BD-KTT', 'Priya Achebe', 'Ines Varga', 'CAIRNS', 'FENWAY', 'KESTRL', 'Fuel consumption different than planned', '14 CFR 91.151(a)(1)', 'Advisory only', 'Signed off by Ines Varga', 'Mixture leaned'])
			expect(text, `${format} PDF text`).toContain(want);
		for (const never of ['Sign out', 'Print or save as PDF', 'Overview']) expect(text, `${format} PDF text`).not.toContain(never);
		execFileSync('pdftoppm', ['-png', '-r', '60', file, path.join(OUT, `debrief-${format}`)]);
	}

	// The share link opens signed out, read-only.
	const guest = await browser.newContext();
	const g = await guest.newPage();
	await g.goto(new URL(shareUrl).pathname);
	await expect(g.getByTestId('debrief-doc')).toContainText('FENWAY');
	await expect(g.getByRole('button', { name: 'Sign off' })).toHaveCount(0);

	// The student got the e-mail and reads the published debrief.
	// Read from the mail sink's folder: the demo mailbox page shows each signed-in user only their own.
	const mail = await waitForMail(DEMO_USERS.student, { predicate: (m) => m.subject.includes('Debrief of your flight') });
	const link = linksIn(mail).find((l) => l.includes(`/flights/${flightId}/debrief`));
	expect(link).toBeDefined();
	const student = await browser.newContext();
	const s = await student.newPage();
	await signIn(s, DEMO_USERS.student);
	await s.goto(new URL(link!).pathname);
	await expect(s.getByTestId('debrief-doc')).toContainText('a third more than planned');
	await expect(s.getByTestId('debrief-write')).toHaveCount(0);

	// Revoking the link closes it.
	await page.goto(`${base}/debrief`);
	await page.getByTestId('share-row').last().getByRole('button', { name: 'Revoke' }).click();
	await expect(page.getByTestId('share-row').last()).toContainText('revoked');
	const closed = await g.goto(new URL(shareUrl).pathname);
	expect(closed?.status()).toBe(404);
	await guest.close();
	await student.close();
});
