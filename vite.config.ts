import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

const FRAMEWORK = [
	/[\\/]node_modules[\\/]svelte[\\/]src[\\/]/,
	/[\\/]node_modules[\\/]@sveltejs[\\/]kit[\\/]src[\\/](runtime|utils)[\\/]/,
	/[\\/]node_modules[\\/]devalue[\\/]/,
	/[\\/]node_modules[\\/]@lucide[\\/]svelte[\\/]dist[\\/](Icon\.svelte|utils[\\/]|defaultAttributes)/,
	/^\0vite[\\/]preload-helper/,
	/[\\/]src[\\/]lib[\\/]api-error\.ts$/
];

const ICONS = /[\\/]@lucide[\\/]svelte[\\/]dist[\\/]icons[\\/]/;
const UNITS = /[\\/]src[\\/]lib[\\/]calc[\\/]units\.ts$/;
/** What every calculator shows with (its own module and picture load on demand). */
const CALCULATOR = /[\\/]src[\\/]lib[\\/](calc[\\/](display|fields|run|load|sources|worksheet)\.ts|components[\\/]calc[\\/](Calculator\.svelte|pictures\.ts))$/;

/** The modules every page loads; SvelteKit's client entry stays its own file. */
function isFramework(id: string): boolean {
	return !/[\\/]runtime[\\/]client[\\/]entry\.js$/.test(id) && FRAMEWORK.some((pattern) => pattern.test(id));
}

export default defineConfig(({ isSsrBuild }) => ({
	plugins: [tailwindcss(), sveltekit()],
	server: {
		fs: { allow: ['content', 'migrations'] }
	},
	// The client build only: the server's chunks are not sent to anyone.
	build: isSsrBuild
		? {}
		: {
				rolldownOptions: {
					output: {
						codeSplitting: {
							// Every page loads the framework (Svelte's runtime, SvelteKit's client, the icon base, the
							// bundler's preload helper and the API error reader): one file instead of several small ones, each with its own headers.
							// A calculator's shared parts travel together, loaded only where a calculator is shown; the
							// units stay apart because the practical sign-off forms use them too. The icons travel as
							// one file (about 4 KB compressed, all of them): split by page they made five or six
							// files of under 1 KB on a lesson, each with its own request and headers.
							groups: [
								{ name: 'framework', test: isFramework, priority: 4 },
								{ name: 'icons', test: ICONS, priority: 3 },
								{ name: 'units', test: UNITS, priority: 2 },
								{ name: 'calculator', test: CALCULATOR, priority: 1 }
							]
						}
					}
				}
			},
	test: {
		// SCALE_TESTS=1: the two-process test against the built app and a PostgreSQL server (test-all)
		include: process.env.SCALE_TESTS === '1' ? ['tests/scale/**/*.test.ts'] : ['src/**/*.test.ts', 'tests/unit/**/*.test.ts'],
		environment: 'node',
		// PostgreSQL engines (TEST_DB=pglite|postgres) start a server or a WebAssembly instance first
		testTimeout: process.env.TEST_DB && process.env.TEST_DB !== 'sqlite' ? 300_000 : 20_000,
		hookTimeout: process.env.TEST_DB && process.env.TEST_DB !== 'sqlite' ? 300_000 : 10_000,
		fileParallelism: true,
		// the AWS SDK's notice that its 2027 releases will need Node 22 (known; see README)
		env: { AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' }
	}
}));
