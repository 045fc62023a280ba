import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	// The bundler's per-plugin timing report is noise in every build log.
	build: { rolldownOptions: { checks: { bundlerTimings: false } } },
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					include: ['src/**/*.test.ts'],
					environment: 'node'
				}
			},
			{
				extends: true,
				test: {
					name: 'integration',
					include: ['tests/integration/**/*.test.ts'],
					setupFiles: ['tests/integration/setup.ts'],
					environment: 'node',
					// Each file gets its own database cloned from the migrated template; files run in
					// parallel on the two cores, tests inside a file in order.
					testTimeout: 30_000,
					hookTimeout: 60_000
				}
			}
		]
	}
});
