import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: {
		fs: { allow: ['content', 'migrations'] }
	},
	test: {
		include: ['src/**/*.test.ts', 'tests/unit/**/*.test.ts'],
		environment: 'node',
		testTimeout: 20_000,
		fileParallelism: true,
		// the AWS SDK's notice that its 2027 releases will need Node 22 (known; see README)
		env: { AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' }
	}
});
