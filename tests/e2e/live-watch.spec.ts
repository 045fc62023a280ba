// The live watch on a tablet, against the built app: the trainer's demo recorder sends samples
// straight to the recorder API (no simulator, so each step is exact). The view follows the newest
// sample until moved back; an alarm acknowledged in one browser shows who and when in another and
// on both timelines; a read-only viewer sees alarms without the button; an engine stopped on the
// ground is named as such; the cockpit layout puts the large figures first at 1024×768 and
// 768×1024 in both themes (screenshots in test-results/live-watch-*.png), keeps the screen on while
// following and sounds an alarm only once the viewer turned the sound on.
import fs from 'node:fs';
import path from 'node:path';
import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import { DEMO_ORG, DEMO_USERS, ORIGIN, signIn } from './support';

// The trainer BD-KTR (scripts/demo-scenario.ts): low-fuel alarm below 10 US gal.
const TRAINER_TOKEN = 'bdr_demo_kestrel_trainer_0002';
const US_GAL = 3.785411784; // NIST Handbook 44, Appendix C
const PILOT_NAME = 'Theo Lindqvist';
const shots = path.resolve('test-results');

interface Spec {
	gph?: number;
	gs?: number;
}
/** Samples one a second from `start` (epoch ms): cruise at 9 US gal/h and 110 kt towards HOLLOW by default. */
function samplesFrom(from: number, count: number, start: number, o: Spec = {}) {
	return Array.from({ length: count }, (_, i) => {
		const seq = from + i;
		return { seq, t: new Date(start + seq * 1000).toISOString(), flow: (o.gph ?? 9) * US_GAL, gs: o.gs ?? 110, dtg: Math.max(1, 18 - seq * 0.03), wpt: 'HOLLOW', alt: 3500 };
	});
}

class Recorder {
	flightId = '';
	constructor(private readonly request: APIRequestContext) {}
	private async post(route: string, data: unknown) {
		const res = await this.request.post(`${ORIGIN}/api/v1/live/${route}`, { headers: { authorization: `Bearer ${TRAINER_TOKEN}` }, data });
		expect(res.status(), `${route}: ${await res.text()}`).toBeLessThan(300);
		return res.json();
	}
	async open(onBoardUsgal: number) {
		const r = await this.post('open', { declaration: { kind: 'onBoard', amount: onBoardUsgal, unit: 'usgal' }, pilot: DEMO_USERS.pilot, title: 'Tablet watch over Hollow Ridge' });
		this.flightId = r.flightId;
	}
	async send(samples: unknown[]) {
		for (let k = 0; k < samples.length; k += 1000) await this.post('samples', { flightId: this.flightId, samples: samples.slice(k, k + 1000) });
	}
	async close() {
		if (this.flightId) await this.post('close', { flightId: this.flightId });
	}
}

async function signedInPage(browser: Browser, email: string, viewport = { width: 1024, height: 768 }, theme: 'light' | 'dark' = 'light'): Promise<Page> {
	const context = await browser.newContext({ viewport });
	await context.addInitScript((t) => localStorage.setItem('burndown-theme', t), theme);
	const page = await context.newPage();
	await signIn(page, email);
	return page;
}

const liveUrl = (id: string) => `/o/${DEMO_ORG}/flights/${id}/live`;
const scrubTime = (page: Page) => page.getByTestId('scrub-time').innerText();
const clockOf = (start: number, seq: number) => new Date(start + seq * 1000).toISOString().slice(11, 19);

test.describe.configure({ mode: 'serial' });

test('the view follows the newest sample; moving back pauses it, with one control back to now and no speed buttons while following', async ({ browser, request }) => {
	const rec = new Recorder(request);
	const start = Date.now() - 3600_000;
	await rec.open(30);
	await rec.send(samplesFrom(0, 300, start));
	const page = await signedInPage(browser, DEMO_USERS.instructor);
	try {
		await page.goto(liveUrl(rec.flightId));
		await expect(page.getByTestId('following')).toBeVisible();
		await expect(page.getByTestId('speeds')).toHaveCount(0);
		await expect(page.getByTestId('play')).toHaveCount(0);
		await expect.poll(() => scrubTime(page)).toBe(clockOf(start, 299));

		// New samples: the view moves on with them.
		await rec.send(samplesFrom(300, 30, start));
		await expect.poll(() => scrubTime(page)).toBe(clockOf(start, 329));

		// Back to the first sample: following pauses, the player and one "back to now" are offered.
		await page.getByTestId('scrub-range').focus();
		await page.keyboard.press('Home');
		await expect(page.getByTestId('following')).toHaveCount(0);
		await expect(page.getByTestId('follow-now')).toHaveCount(1);
		await expect(page.getByTestId('speeds')).toBeVisible();
		await expect.poll(() => scrubTime(page)).toBe(clockOf(start, 0));
		await rec.send(samplesFrom(330, 30, start));
		await expect(page.getByTestId('last-sample')).toHaveText(/^360 samples/);
		expect(await scrubTime(page)).toBe(clockOf(start, 0));

		await page.getByTestId('follow-now').click();
		await expect(page.getByTestId('following')).toBeVisible();
		await expect(page.getByTestId('speeds')).toHaveCount(0);
		await expect.poll(() => scrubTime(page)).toBe(clockOf(start, 359));
		await rec.send(samplesFrom(360, 10, start));
		await expect.poll(() => scrubTime(page)).toBe(clockOf(start, 369));
	} finally {
		await rec.close();
		await page.context().close();
	}
});

test('an acknowledgement is shared: one acknowledges, the others see who and when; the read-only viewer cannot acknowledge', async ({ browser, request }) => {
	const rec = new Recorder(request);
	const start = Date.now() - 3600_000;
	// 10.6 US gal at 9 US gal/h: below the 10 US gal alarm some 240 s in.
	await rec.open(10.6);
	const pilot = await signedInPage(browser, DEMO_USERS.pilot);
	const instructor = await signedInPage(browser, DEMO_USERS.instructor);
	const viewer = await signedInPage(browser, DEMO_USERS.viewer);
	try {
		for (const p of [pilot, instructor, viewer]) await p.goto(liveUrl(rec.flightId));
		// The instructor watches this flight (the demo's watch of the aircraft may have been turned
		// off by other tests): its alarms e-mail exactly one watcher.
		await instructor.getByTestId('watch-flight').click();
		await expect(instructor.getByTestId('watch-flight')).toHaveText('Watching ✓');
		await rec.send(samplesFrom(0, 420, start));
		for (const p of [pilot, instructor, viewer]) await expect(p.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' })).toBeVisible({ timeout: 15_000 });
		// The banner says one watcher was e-mailed, once it was.
		await expect(instructor.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' })).toContainText('e-mailed to 1 watcher', { timeout: 15_000 });
		// Read-only: the alarm, never the button.
		await expect(viewer.getByTestId('ack-alarm')).toHaveCount(0);

		await pilot.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' }).getByTestId('ack-alarm').click();
		const who = new RegExp(`acknowledged by ${PILOT_NAME} at \\d\\d:\\d\\d:\\d\\d UTC`);
		for (const p of [pilot, instructor, viewer]) {
			const acked = p.getByTestId('alarm-acked').filter({ hasText: 'Low fuel on board' });
			await expect(acked).toBeVisible({ timeout: 10_000 });
			await expect(acked).toContainText(who);
			await expect(p.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' })).toHaveCount(0);
		}
		// On the live timeline too.
		await expect(instructor.getByTestId('timeline-list')).toContainText(who);
		await instructor.screenshot({ path: path.join(shots, 'live-watch-acknowledged.png'), fullPage: true });

		await rec.close();
		await instructor.goto(`/o/${DEMO_ORG}/flights/${rec.flightId}`);
		await expect(instructor.getByTestId('timeline-list')).toContainText(who, { timeout: 15_000 });
	} finally {
		await rec.close();
		for (const p of [pilot, instructor, viewer]) await p.context().close();
	}
});

test('an engine stopped on the ground is said as such, and the alarm sounds only once the sound is on', async ({ browser, request }) => {
	const rec = new Recorder(request);
	const start = Date.now() - 3600_000;
	await rec.open(10.6);
	const page = await signedInPage(browser, DEMO_USERS.pilot);
	// Count the tones the page makes (Web Audio oscillators started): nothing is fetched for them.
	await page.context().addInitScript(() => {
		const w = window as unknown as { __tones: number; AudioContext: typeof AudioContext };
		w.__tones = 0;
		const Real = w.AudioContext;
		w.AudioContext = class extends Real {
			createOscillator() {
				const osc = super.createOscillator();
				const start = osc.start.bind(osc);
				osc.start = (when?: number) => {
					w.__tones++;
					start(when);
				};
				return osc;
			}
		} as typeof AudioContext;
	});
	const tones = () => page.evaluate(() => (window as unknown as { __tones: number }).__tones);
	try {
		await page.goto(liveUrl(rec.flightId));
		await rec.send(samplesFrom(0, 120, start));
		await expect(page.getByTestId('last-sample')).toHaveText(/^120 samples/);
		const sound = page.getByTestId('sound-toggle');
		await expect(sound).toHaveAttribute('aria-pressed', 'false');
		await sound.click();
		await expect(sound).toHaveAttribute('aria-pressed', 'true');
		expect(await tones()).toBe(0);
		await rec.send(samplesFrom(120, 300, start));
		await expect(page.getByTestId('alarm-banner').filter({ hasText: 'Low fuel on board' })).toBeVisible({ timeout: 15_000 });
		await expect.poll(tones).toBeGreaterThan(0);

		// Landed and shut down: flow and ground speed zero.
		await rec.send(samplesFrom(420, 40, start, { gph: 0, gs: 0 }));
		const status = page.getByTestId('live-status');
		await expect(status).toHaveAttribute('data-state', 'engine-stopped');
		await expect(status).toHaveText('engine stopped');
		await expect(page.getByTestId('stopped-banner')).toContainText(`Engine stopped on the ground since ${clockOf(start, 420)} UTC`);
		await expect(page.getByTestId('stopped-banner')).toContainText('stays open for up to 4 h');
		await expect(page.getByTestId('stale-banner')).toHaveCount(0);
		await expect(page.getByText('link may be down')).toHaveCount(0);

		await rec.close();
		await expect(status).toHaveText('flight finished', { timeout: 15_000 });
		await expect(page.getByTestId('closed-banner')).toContainText('finished and kept');
	} finally {
		await rec.close();
		await page.context().close();
	}
});

const SIZES = [
	{ name: 'landscape', width: 1024, height: 768 },
	{ name: 'portrait', width: 768, height: 1024 }
] as const;

for (const size of SIZES)
	for (const theme of ['light', 'dark'] as const)
		test(`cockpit layout on a ${size.width}×${size.height} tablet, ${theme}: large figures first, one-row header, 44 px controls, caution folded once read, screen kept on while following`, async ({ browser, request }) => {
			const rec = new Recorder(request);
			const start = Date.now() - 3600_000;
			await rec.open(24);
			await rec.send(samplesFrom(0, 900, start));
			const page = await signedInPage(browser, DEMO_USERS.pilot, size, theme);
			// The Screen Wake Lock API, observed: what the page asks for and gives back.
			await page.context().addInitScript(() => {
				const w = window as unknown as { __wake: string[] };
				w.__wake = [];
				Object.defineProperty(navigator, 'wakeLock', {
					configurable: true,
					value: {
						request: async () => {
							w.__wake.push('request');
							const s = new EventTarget() as EventTarget & { released: boolean; release(): Promise<void> };
							s.released = false;
							s.release = async () => {
								s.released = true;
								w.__wake.push('release');
							};
							return s;
						}
					}
				});
			});
			try {
				await page.goto(liveUrl(rec.flightId));
				await expect(page.getByTestId('cockpit')).toBeVisible({ timeout: 15_000 });
				await expect(page.locator('html')).toHaveAttribute('data-theme', theme);
				await expect(page.getByTestId('cockpit-onboard')).toHaveText(/\d/);

				// The caution is read once, then folds to one line, also after a reload (this device).
				await page.getByTestId('caution-read').click();
				await expect(page.getByTestId('caution-folded')).toBeVisible();
				await page.reload();
				await expect(page.getByTestId('caution-folded')).toBeVisible();
				await expect(page.getByTestId('caution')).toHaveCount(0);
				await expect(page.getByTestId('cockpit')).toBeVisible({ timeout: 15_000 });

				// The live figures come first: on screen without scrolling, above the caution.
				const cockpit = (await page.getByTestId('cockpit').boundingBox())!;
				expect(cockpit.y + cockpit.height).toBeLessThanOrEqual(size.height);
				expect(cockpit.y).toBeLessThan((await page.getByTestId('caution-folded').boundingBox())!.y);
				// The site's header and the page's header each stay on one row.
				expect((await page.locator('body > div header, header').first().boundingBox())!.height).toBeLessThan(70);
				await expect(page.getByTestId('awake')).toBeVisible();
				const registration = (await page.locator('h1').boundingBox())!;
				const units = (await page.getByTestId('live-units').boundingBox())!;
				expect(Math.abs(units.y + units.height / 2 - (registration.y + registration.height / 2))).toBeLessThan(12);
				// In-flight controls at least 44 px tall.
				for (const id of ['sound-toggle', 'watch-flight', 'following', 'ack-alarm']) {
					const el = page.getByTestId(id).first();
					if ((await el.count()) === 0) continue;
					expect((await el.boundingBox())!.height, id).toBeGreaterThanOrEqual(44);
				}
				await expect.poll(() => page.evaluate(() => (window as unknown as { __wake: string[] }).__wake.join(','))).toBe('request');
				fs.mkdirSync(shots, { recursive: true });
				await page.screenshot({ path: path.join(shots, `live-watch-${size.name}-${theme}.png`) });

				// Moving back stops keeping the screen on; leaving the page releases it too.
				await page.getByTestId('scrub-range').focus();
				await page.keyboard.press('Home');
				await expect.poll(() => page.evaluate(() => (window as unknown as { __wake: string[] }).__wake.join(','))).toBe('request,release');
				const back = page.getByTestId('follow-now');
				expect((await back.boundingBox())!.height).toBeGreaterThanOrEqual(44);
				await back.click();
				await expect.poll(() => page.evaluate(() => (window as unknown as { __wake: string[] }).__wake.join(','))).toBe('request,release,request');
			} finally {
				await rec.close();
				await page.context().close();
			}
		});
