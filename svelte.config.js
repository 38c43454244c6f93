import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';
import { mdsvex } from 'mdsvex';
import mdsvexConfig from './mdsvex.config.js';
import { withFastFront } from './scripts/adapter-fast-front.js';

const out = process.env.BUILD_DIR || 'build';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	extensions: ['.svelte', ...mdsvexConfig.extensions],
	preprocess: [vitePreprocess(), mdsvex(mdsvexConfig)],
	kit: {
		// BUILD_DIR lets a second build (for example a test run) sit beside the main one. The
		// entry point answers the hot JSON routes before SvelteKit does (src/lib/server/fast-api.ts).
		adapter: withFastFront(adapter({ out }), out),
		// Everything a page needs ships with the app: nothing is loaded from another origin.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self', 'data:'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'frame-ancestors': ['none']
			}
		},
		alias: {
			$content: 'content',
			$migrations: 'migrations'
		}
	}
};

export default config;
