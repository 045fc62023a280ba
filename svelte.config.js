import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// npm test builds into its own folder (BURNDOWN_BUILD_DIR) so it never replaces the files of
		// an app that npm start is serving from build/.
		adapter: adapter({ out: process.env.BURNDOWN_BUILD_DIR || 'build', envPrefix: '' }),
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// Svelte and uPlot set element styles; inline style attributes need this.
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				// Vite inlines the smallest font subsets as data: URIs.
				'font-src': ['self', 'data:'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
