// End-to-end tests: Playwright drives Debian's Chromium (never a downloaded browser) against the
// built app (`node build`) on 127.0.0.1:4173. scripts/test.mjs prepares the burndown_e2e database
// and the test mail sink and passes them in through the environment (npm test -- --only e2e).
import { defineConfig } from '@playwright/test';

const port = 4173;
const origin = `http://127.0.0.1:${port}`;

const databaseUrl = process.env.DATABASE_URL;
if (!databaseUrl) {
	throw new Error('playwright.config.ts: DATABASE_URL is not set. Run the end-to-end tests with `npm test -- --only e2e`, which prepares the burndown_e2e database, the mail sink and the build.');
}

export default defineConfig({
	testDir: 'tests/e2e',
	outputDir: 'test-results',
	fullyParallel: false,
	// One app server and one database: tests share them, so run one at a time.
	workers: 1,
	forbidOnly: !!process.env.CI,
	retries: 0,
	timeout: 30_000,
	reporter: 'list',
	use: {
		baseURL: origin,
		screenshot: 'only-on-failure',
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
		}
	},
	webServer: {
		command: `node ${process.env.BURNDOWN_BUILD_DIR || 'build'}`,
		url: `${origin}/api/health`,
		timeout: 60_000,
		reuseExistingServer: false,
		stdout: 'pipe',
		stderr: 'pipe',
		// SIGTERM lets the app close its database pool; SIGKILL only if it hangs.
		gracefulShutdown: { signal: 'SIGTERM', timeout: 10_000 },
		env: {
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: origin,
			DATABASE_URL: databaseUrl,
			BODY_SIZE_LIMIT: '110M',
			BURNDOWN_DEMO: '1',
			SHUTDOWN_TIMEOUT: '5',
			SMTP_HOST: process.env.SMTP_HOST ?? '127.0.0.1',
			SMTP_PORT: process.env.SMTP_PORT ?? '2535',
			...(process.env.MAILBOX_DIR ? { MAILBOX_DIR: process.env.MAILBOX_DIR } : {})
		}
	}
});
