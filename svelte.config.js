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
		// entry point answers the hot JSON routes and shared pages before SvelteKit does (src/lib/server/fast-front.ts).
		adapter: withFastFront(adapter({ out }), out),
		// Everything a page needs ships with the app: nothing is loaded from another origin.
		// Hashes rather than nonces: a page shared by every visitor who is not signed in
		// (src/lib/server/page-cache.ts) is served again as it is, and a hash stays true for it.
		csp: {
			mode: 'hash',
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
