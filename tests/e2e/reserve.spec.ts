// Every reserve statement on the replay and live pages agrees, with each other and with the fuel
// engine: the demo flight that lands below its reserve (14 CFR 91.151(a)(1): 30 min at normal
// cruise) is found by the flights list's verdict filter, then scrubbed, and at several moments the
// waypoint card's state and margin, the "reserve reached" tile, the reserve amount line and the
// alarm pills are read and compared; the summary's verdict says "landed below the reserve". The
// same recording then arrives live through the trainer's recorder, and the live page, scrubbed the
// same way while the flight is still open, must say what the engine says over the same samples.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { ALARM_ARRIVAL_BELOW_RESERVE, ARRIVAL_EATS_INTO, ARRIVAL_KEEPS, ARRIVAL_RUNS_OUT, computeFlight, summarize, type FlightComputation } from '../../src/lib/fuel';
import { engineInputsOf } from '../../src/lib/flight-inputs';
import { alarmLabels, arrivalWords } from '../../src/lib/labels';
import { decodeJson, type JsonPayload } from '../../src/lib/wire/replay';
import { LITRES_PER_US_GALLON } from '../../src/lib/units';
import { count } from '../../src/lib/format';
import { DEMO_ORG, DEMO_USERS, ORIGIN, signIn } from './support';

const TITLE = 'The long way round against a headwind, filled to the tabs';
const gal = (litres: number) => litres / LITRES_PER_US_GALLON;
/** A shown figure as a number; the minus sign on screen is U+2212. */
const num = (text: string) => Number(text.replace(/−/g, '-').replace(/[^0-9.\-]/g, ''));

async function shownIndex(page: Page): Promise<number> {
	return Number(await page.getByTestId('fuel-figures').getAttribute('data-index'));
}

async function checkMoment(page: Page, c: FlightComputation, seen: Set<number>) {
	const i = await shownIndex(page);
	const state = c.arrivalState[i];
	seen.add(state);
	const card = page.getByTestId('fig-waypoint');
	// The card's state is the engine's, in our words.
	await expect(card).toHaveAttribute('data-arrival', arrivalWords[state].id);
	await expect(page.getByTestId('fig-arrival-state')).toHaveText(arrivalWords[state].text);
	// The reserve amount line is the engine's amount at this sample (two decimals, nearest).
	const amountText = await page.getByTestId('fig-reserve-amount').innerText();
	const amount = Number(/Reserve amount ([\d.]+) US gal/.exec(amountText)![1]);
	expect(Math.abs(amount - gal(c.reserveL[i]))).toBeLessThanOrEqual(0.005 + 1e-9);
	// The margin's sign agrees with the state: fuel left on arrival against that same amount.
	if (state === ARRIVAL_KEEPS || state === ARRIVAL_EATS_INTO || state === ARRIVAL_RUNS_OUT) {
		const margin = num(await page.getByTestId('fig-arrival-margin').innerText());
		if (state === ARRIVAL_KEEPS) expect(margin).toBeGreaterThanOrEqual(0);
		else expect(margin).toBeLessThan(0);
		// Rounded down: never more margin than the engine's.
		expect(margin).toBeLessThanOrEqual(gal(c.arrivalL[i] - c.reserveL[i]) + 1e-9);
	}
	// "Reserve reached: now" exactly when fuel on board is at or below the amount — and then the
	// card can never say the reserve is kept on arrival.
	const below = c.onBoard[i] <= c.reserveL[i];
	await expect(page.getByTestId('fig-reserve-now')).toHaveCount(below ? 1 : 0);
	if (below) expect(state).not.toBe(ARRIVAL_KEEPS);
	// The alarm pill is there exactly when the engine's alarm is raised.
	const pill = page.getByRole('list', { name: 'Alarms raised at this moment' }).getByText(alarmLabels.arrivalBelowReserve);
	await expect(pill).toHaveCount(c.alarmState[i] & ALARM_ARRIVAL_BELOW_RESERVE ? 1 : 0);
}

/** Scrubs ten minutes a step through the page's flight, reading every statement at each other step. */
async function scrubAndCheck(page: Page, c: FlightComputation): Promise<Set<number>> {
	const range = page.getByTestId('scrub-range');
	await range.focus();
	await page.keyboard.press('Home');
	const seen = new Set<number>();
	for (let step = 0; step < 20; step++) {
		await page.keyboard.press('PageUp');
		if (step % 2 === 1) await checkMoment(page, c, seen);
	}
	await page.keyboard.press('End');
	await checkMoment(page, c, seen);
	return seen;
}

/** The engine over the samples, inputs and setup the page got for this flight. */
async function engineOf(page: Page, flightId: string): Promise<FlightComputation> {
	const body = (await (await page.request.get(`/api/v1/flights/${flightId}/samples`)).json()) as JsonPayload;
	const d = decodeJson(body);
	return computeFlight({ columns: d.columns, ...engineInputsOf(d.setup, d, d.events) });
}

test('every reserve statement on the replay page agrees with the others and with the engine', async ({ page }) => {
	test.setTimeout(120_000);
	await page.setViewportSize({ width: 1366, height: 1000 });
	await signIn(page, DEMO_USERS.admin);
	// The flights list finds it by its verdict.
	await page.goto(`/o/${DEMO_ORG}/flights?verdict=notKept`);
	const row = page.getByTestId('flight-row').filter({ hasText: TITLE });
	await expect(row).toHaveCount(1);
	await expect(row.getByTestId('flight-verdict')).toHaveAttribute('data-verdict', 'notKept');
	await row.getByRole('link').first().click();
	await expect(page.getByTestId('fuel-figures')).toBeVisible({ timeout: 15_000 });
	const flightId = page.url().split('/').pop()!;

	// The engine on the same samples, inputs and setup the page got.
	const body = (await (await page.request.get(`/api/v1/flights/${flightId}/samples`)).json()) as JsonPayload;
	const d = decodeJson(body);
	const c = computeFlight({ columns: d.columns, ...engineInputsOf(d.setup, d, d.events) });
	const s = summarize(c, d.columns);
	expect(s.verdict?.state).toBe('notKept');

	// The verdict on the page: landed below the reserve, by the engine's margin (rounded down).
	const verdict = page.getByTestId('sum-verdict');
	await expect(verdict).toHaveAttribute('data-verdict', 'notKept');
	const landedMargin = num((await page.getByTestId('sum-landed-margin').innerText()).split('·')[0]);
	expect(landedMargin).toBeLessThan(0);
	expect(landedMargin).toBeLessThanOrEqual(gal(s.verdict!.marginL!) + 1e-9);
	expect(gal(s.verdict!.marginL!) - landedMargin).toBeLessThan(0.1 + 1e-9);
	await expect(page.getByTestId('sum-reserve-reached')).toContainText('from');

	// Scrub through the flight, ten minutes a step, and read every statement at each moment.
	const seen = await scrubAndCheck(page, c);
	// The flight crosses the reserve: both sides were seen.
	expect(seen.has(ARRIVAL_KEEPS)).toBe(true);
	expect(seen.has(ARRIVAL_EATS_INTO) || seen.has(ARRIVAL_RUNS_OUT)).toBe(true);
	// The arrival alarm was raised once in this flight.
	expect(c.alarms.filter((a) => a.kind === 'arrivalBelowReserve')).toHaveLength(1);
});

// The trainer's demo recorder (scripts/demo-scenario.ts); the instructor watches the trainer.
const TRAINER_RECORDER_TOKEN = 'bdr_demo_kestrel_trainer_0002';
const RECORDING = path.resolve('samples/kestrel-trainer-long-way-round.csv');

test('every reserve statement on the live page agrees with the others and with the engine, while the flight is open', async ({ page }) => {
	test.setTimeout(180_000);
	await page.setViewportSize({ width: 1366, height: 1000 });
	// The whole recording, fast, moved to today (so it overlaps no stored flight), the flight kept open.
	// 28 US gal at engine start, the trainer's tab level the demo flight was filled to, given as an
	// amount: "filled to the tabs" would depend on what earlier tests left on board.
	let log = '';
	const sim = spawn(
		path.resolve('node_modules/.bin/tsx'),
		['scripts/simulate.ts', '--file', RECORDING, '--token', TRAINER_RECORDER_TOKEN, '--url', ORIGIN, '--speed', '1500', '--batch-ms', '400', '--declare', '28usgal', '--now', '--keep-open'],
		{ stdio: ['ignore', 'pipe', 'pipe'] }
	);
	sim.stdout?.on('data', (d) => (log += String(d)));
	sim.stderr?.on('data', (d) => (log += String(d)));
	const code = await new Promise<number | null>((resolve) => sim.on('exit', resolve));
	expect(code, log).toBe(0);
	const flightId = /flight ([0-9a-f-]{36}) open/.exec(log)?.[1];
	expect(flightId, log).toBeTruthy();

	try {
		await signIn(page, DEMO_USERS.instructor);
		await page.goto(`/o/${DEMO_ORG}/flights/${flightId}/live`);
		// Open and followed: the recording ends at shutdown, so once its last sample is in the truthful
		// state is "engine stopped" (a planned stop keeps the flight open), before that "live".
		await expect(page.getByTestId('live-status')).toHaveText(/live|engine stopped/);
		const c = await engineOf(page, flightId!);
		// Every sample has reached the page before it is read.
		await expect(page.getByTestId('last-sample')).toContainText(`${count(c.length)} samples`, { timeout: 30_000 });
		const seen = await scrubAndCheck(page, c);
		expect(seen.has(ARRIVAL_KEEPS)).toBe(true);
		expect(seen.has(ARRIVAL_EATS_INTO) || seen.has(ARRIVAL_RUNS_OUT)).toBe(true);
		// The live banner names the one arrival alarm the engine raised.
		expect(c.alarms.filter((a) => a.kind === 'arrivalBelowReserve')).toHaveLength(1);
		await expect(page.getByTestId('alarm-banner').filter({ hasText: alarmLabels.arrivalBelowReserve })).toHaveCount(1);
	} finally {
		// Leave the recorder with no open flight for the tests after this one.
		await page.request.post('/api/v1/live/close', { headers: { authorization: `Bearer ${TRAINER_RECORDER_TOKEN}`, 'content-type': 'application/json' }, data: { flightId } });
	}
});
