import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expect, test } from '@playwright/test';

/**
 * A deploy stops the old process with SIGTERM: adapter-node closes the HTTP server, and the
 * process must then end by itself. Timers still running (the scheduled jobs) used to keep it
 * alive until it was killed.
 */

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.once('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
		});
	});
}

test('the built server ends on its own after SIGTERM', async () => {
	test.setTimeout(90_000);
	const port = await freePort();
	const dataDir = mkdtempSync(path.join(tmpdir(), 'patchwright-shutdown-'));
	const url = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, [process.env.BUILD_DIR || 'build'], {
		env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), ORIGIN: url, DATA_DIR: dataDir, AUTH_SECRET: randomBytes(32).toString('hex'), SEED_DEMO: '0', FAKES: '0' },
		stdio: 'ignore'
	});
	const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
	try {
		await expect.poll(async () => (await fetch(`${url}/api/v1/health`).catch(() => null))?.status ?? 0, { timeout: 60_000 }).toBe(200);
		const stoppedAt = Date.now();
		child.kill('SIGTERM');
		const code = await Promise.race([exited, new Promise<'still running'>((r) => setTimeout(() => r('still running'), 10_000))]);
		expect(code).toBe(0);
		expect(Date.now() - stoppedAt).toBeLessThan(10_000);
	} finally {
		if (child.exitCode === null) child.kill('SIGKILL');
		rmSync(dataDir, { recursive: true, force: true });
	}
});
