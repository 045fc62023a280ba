// A live flight end to end: the recorder simulator feeds the demo tourer's recorder over a
// lossy link (dropped and duplicated batches), the instructor watches the live page fill in, a
// low-fuel alarm banner appears and is acknowledged, and the flight closes into a replayable one.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { liveRecording } from './live-recording';
import { DEMO_ORG, DEMO_USERS, ORIGIN, signIn } from './support';

// The demo recorder of BD-KTT (scripts/demo-scenario.ts), whose low-fuel alarm is 20 US gal.
const DEMO_RECORDER_TOKEN = 'bdr_demo_kestrel_tourer_0001';

let simulator: ChildProcess | null = null;
let simulatorLog = '';

test.afterEach(() => {
	simulator?.kill('SIGTERM');
	simulator = null;
});

async function samplesShown(text: string): Promise<number> {
	const m = /^([\d,]+) samples/.exec(text.trim());
	return m ? Number(m[1].replace(/,/g, '')) : 0;
}

test('the simulator feeds a live flight; the alarm banner appears and is acknowledged', async ({ page }) => {
	test.setTimeout(120_000);
	const dir = path.resolve('test-results');
	fs.mkdirSync(dir, { recursive: true });
	const file = path.join(dir, 'live-e2e-recording.csv');
	fs.writeFileSync(file, liveRecording(1200));

	await signIn(page, DEMO_USERS.instructor);

	// 22 US gal at engine start: about 2 US gal go in taxi and climb, so the alarm below 20 US gal
	// is raised some 7 minutes into the recording, 11 s into a 40× replay.
	simulator = spawn(
		path.resolve('node_modules/.bin/tsx'),
		['scripts/simulate.ts', '--file', file, '--token', DEMO_RECORDER_TOKEN, '--url', ORIGIN, '--speed', '40', '--batch-ms', '500', '--drop', '0.1', '--duplicate', '0.1', '--declare', '22usgal'],
		{ stdio: ['ignore', 'pipe', 'pipe'] }
	);
	simulator.stdout?.on('data', (d) => (simulatorLog += String(d)));
	simulator.stderr?.on('data', (d) => (simulatorLog += String(d)));
	const finished = new Promise<number | null>((resolve) => simulator!.on('exit', (code) => resolve(code)));

	// The overview is rendered on the server: look again until the simulator has opened the flight.
	await expect.poll(() => /flight [0-9a-f-]{36} open/.test(simulatorLog), { timeout: 20_000, message: simulatorLog }).toBe(true);
	await page.goto(`/o/${DEMO_ORG}`);
	const card = page.getByTestId('live-flight').filter({ hasText: 'BD-KTT' });
	await expect(card).toBeVisible();
	await card.click();
	await expect(page).toHaveURL(/\/flights\/[0-9a-f-]{36}\/live$/);
	await expect(page.getByTestId('live-status')).toHaveText(/live/);

	// Samples arrive while we watch.
	const lastSample = page.getByTestId('last-sample');
	await expect(lastSample).toHaveText(/samples/, { timeout: 15_000 });
	const first = await samplesShown(await lastSample.innerText());
	await expect.poll(async () => samplesShown(await lastSample.innerText()), { timeout: 15_000 }).toBeGreaterThan(first + 20);
	await expect(lastSample).toHaveText(/received \d+ s ago/);

	// 22 US gal can also be too little to reach the next waypoint with the 30 min reserve (14 CFR
	// 91.151(a)(1)) at hand, so an arrival alarm may show beside this one: pick the low-fuel one.
	const banner = page.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' });
	await expect(banner).toBeVisible({ timeout: 30_000 });
	await page.screenshot({ path: path.join(dir, 'live-alarm.png'), fullPage: true });

	await banner.getByTestId('ack-alarm').click();
	await expect(banner).toHaveCount(0);
	// The acknowledgement is stored: a reload does not bring the banner back.
	await page.reload();
	await expect(page.getByTestId('last-sample')).toHaveText(/samples/, { timeout: 15_000 });
	await expect(page.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' })).toHaveCount(0);
	// The alarm stays on the timeline for everyone.
	await expect(page.getByText(/Low fuel on board \(/)).toBeVisible();
	await page.screenshot({ path: path.join(dir, 'live-acknowledged.png'), fullPage: true });

	// The simulator resends what was lost, closes the flight, and the page says so.
	expect(await finished, simulatorLog).toBe(0);
	expect(simulatorLog).toMatch(/all acknowledged/);
	await expect(page.getByTestId('closed-banner')).toBeVisible({ timeout: 15_000 });
	await expect(lastSample).toHaveText(/^1200 samples/);
	await page.screenshot({ path: path.join(dir, 'live-closed.png') });
});
