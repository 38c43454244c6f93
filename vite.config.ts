import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: {
		fs: { allow: ['content', 'migrations'] }
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
});
