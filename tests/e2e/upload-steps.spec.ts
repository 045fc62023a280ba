// The upload page's steps in the browser: the pilot's usual aircraft preselected, the steps shown
// in their order, the reason the button is disabled said beside it, two files sent at once with a
// report each, and a file whose last line was cut off stored without it by explicit choice, the
// line then listed on the flight. The flights made here are deleted again at the end.
import pg from 'pg';
import { expect, test } from '@playwright/test';
import { DEMO_AIRCRAFT, DEMO_ORG, DEMO_USERS, signIn } from './support';

const made: string[] = [];

async function withDb<T>(fn: (c: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		return await fn(client);
	} finally {
		await client.end();
	}
}

/** A short flight in our recorder format, one sample a second. */
function file(start: number, seconds: number): string {
	const lines = ['time_utc,fuel_flow_usgph,ground_speed_kt,distance_to_go_nm'];
	for (let i = 0; i <= seconds; i++) lines.push(`${new Date(start + i * 1000).toISOString()},11.5,${i < 20 ? 0 : 110},${(30 - i / 40).toFixed(2)}`);
	return lines.join('\n') + '\n';
}
const csv = (name: string, text: string) => ({ name, mimeType: 'text/csv', buffer: Buffer.from(text) });

test.afterAll(async () => {
	await withDb(async (c) => {
		const { rows } = await c.query<{ upload_id: string | null }>('delete from flights where id = any($1::uuid[]) returning upload_id', [made]);
		await c.query('delete from uploads where id = any($1::uuid[])', [rows.map((r) => r.upload_id).filter(Boolean)]);
	});
});

test('usual aircraft preselected, steps in order, the disabled reason shown, two files at once with a report each', async ({ page }) => {
	const usual = await withDb(async (c) => {
		const { rows } = await c.query<{ aircraft_id: string }>(
			"select f.aircraft_id from flights f join users u on u.id = f.pilot_id join aircraft a on a.id = f.aircraft_id where u.email = $1 and f.deleted_at is null and a.archived_at is null order by f.started_at desc limit 1",
			[DEMO_USERS.pilot]
		);
		return rows[0].aircraft_id;
	});
	await signIn(page, DEMO_USERS.pilot);
	await page.goto(`/o/${DEMO_ORG}/flights/upload`);
	await expect(page.getByTestId('upload-aircraft')).toHaveValue(usual);
	const headings = await page.locator('main h2, h2').allInnerTexts();
	const steps = headings.filter((h) => /^\d\./.test(h)).map((h) => Number(h.split('.')[0]));
	expect(steps).toEqual([...steps].sort((a, b) => a - b));
	expect(steps.slice(0, 2)).toEqual([1, 2]);
	await expect(page.getByTestId('upload-submit')).toBeDisabled();
	await expect(page.getByTestId('upload-not-ready')).toHaveText('Choose a recorder file in step 1.');

	await page.getByTestId('upload-aircraft').selectOption(DEMO_AIRCRAFT.tourer);
	const day = Date.UTC(2027, 0, 5, 9);
	await page.getByTestId('upload-file').setInputFiles([csv('steps-a.csv', file(day, 300)), csv('steps-b.csv', file(day + 3600_000, 300))]);
	await expect(page.getByTestId('upload-file-count')).toContainText('File 1 of 2');
	await page.getByTestId('decl-full').check();
	await expect(page.getByTestId('upload-not-ready')).toHaveCount(0);
	await page.getByTestId('upload-submit').click();
	await expect(page.getByTestId('upload-report')).toHaveCount(2, { timeout: 30_000 });
	await expect(page.locator('[data-testid="upload-report"][data-status="stored"]')).toHaveCount(2);
	await expect(page.getByTestId('upload-all-sent')).toHaveText('All 2 files sent: their reports are below.');
	await expect(page.getByTestId('upload-file-count')).toHaveCount(0);
	for (const href of await page.getByTestId('upload-report').getByRole('link').evaluateAll((as) => as.map((a) => a.getAttribute('href')!))) made.push(href.split('/').pop()!);
	expect(made).toHaveLength(2);
	await page.screenshot({ path: 'test-results/upload-two-files.png', fullPage: true });
});

test('a file whose last line was cut off is refused first, then stored without that line by choice', async ({ page }) => {
	await signIn(page, DEMO_USERS.pilot);
	await page.goto(`/o/${DEMO_ORG}/flights/upload?aircraft=${DEMO_AIRCRAFT.tourer}`);
	const whole = file(Date.UTC(2027, 0, 6, 9), 300);
	await page.getByTestId('upload-file').setInputFiles([csv('cut.csv', whole.slice(0, whole.length - 25))]);
	await page.getByTestId('decl-full').check();
	await page.getByTestId('upload-submit').click();
	await expect(page.getByTestId('upload-problems')).toContainText('cut off when the recorder lost power');
	await page.getByTestId('drop-lines-submit').click();
	await expect(page).toHaveURL(/\/flights\/[0-9a-f-]{36}$/, { timeout: 30_000 });
	made.push(page.url().split('/').pop()!);
	await expect(page.getByTestId('dropped-lines')).toContainText('1 line of the recorder file was left out');
});
