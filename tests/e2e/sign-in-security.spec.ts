import { spawn } from 'node:child_process';
import path from 'node:path';
import Database from 'better-sqlite3';
import { expect, test, type APIRequestContext } from '@playwright/test';
import { baseURL, DEMO_PASSWORD, firstLink, inboxURL, latestMail, signInRequest, signInWithPassword, who } from './support';

const origin = { origin: baseURL };
const sessionCookie = /authjs\.session-token=/;

async function mailsTo(request: APIRequestContext, to: string, subject: RegExp): Promise<number> {
	const messages: { subject: string }[] = await (await request.get(`${inboxURL}api/messages?to=${encodeURIComponent(to)}`)).json();
	return messages.filter((m) => subject.test(m.subject)).length;
}

test.describe("Auth.js's own endpoints are limited too", () => {
	test('password guessing through POST /auth/callback/credentials stops, even for the right password', async ({ request }) => {
		const email = 'ade@tarnside.test';
		for (let i = 0; i < 5; i++) {
			const wrong = await request.post('/auth/callback/credentials', { form: { email, password: `guess-${i}` }, headers: origin, maxRedirects: 0 });
			expect(wrong.headers()['set-cookie'] ?? '').not.toMatch(sessionCookie);
		}
		const right = await request.post('/auth/callback/credentials', { form: { email, password: DEMO_PASSWORD }, headers: origin, maxRedirects: 0 });
		expect(right.status()).toBe(302);
		expect(right.headers()['set-cookie'] ?? '').not.toMatch(sessionCookie);
		expect(right.headers()['location']).toContain('code=too_many_attempts');
		expect(right.headers()['x-content-type-options']).toBe('nosniff');
	});

	test('POST /auth/signin/nodemailer sends at most five links to one address', async ({ request }) => {
		const email = `bombed-${Date.now()}@example.test`;
		for (let i = 0; i < 8; i++) {
			const response = await request.post('/auth/signin/nodemailer', { form: { email }, headers: origin, maxRedirects: 0 });
			expect(response.status()).toBeLessThan(500);
		}
		await latestMail(request, email, /sign-in link/);
		// Give any stragglers time to arrive before counting.
		await new Promise((r) => setTimeout(r, 1000));
		expect(await mailsTo(request, email, /sign-in link/)).toBe(5);
	});
});

test.describe('after signing in, only pages of this site', () => {
	for (const next of ['/%5Cevil.example', '/%09/evil.example', '//evil.example', '/%2F%2Fevil.example', 'https:evil.example', '/\\evil.example', 'https://evil.example/']) {
		test(`next=${next} stays on this site`, async ({ request }) => {
			await signInRequest(request, who.inspector);
			const response = await request.get(`/sign-in?next=${next}`, { maxRedirects: 0 });
			expect(response.status()).toBe(303);
			const target = new URL(response.headers()['location'], baseURL);
			expect(target.origin).toBe(new URL(baseURL).origin);
		});
	}
});

test.describe('an address is claimed only by confirming it', () => {
	test('sign up with a password, confirm by the e-mailed link, then sign in with it', async ({ page, request }) => {
		const email = `confirm-${Date.now()}@example.test`;
		await page.goto('/sign-up');
		await page.getByLabel('Your name').fill('Kit Newhire');
		await page.getByLabel('E-mail address').fill(email);
		await page.getByLabel('Password (optional)').fill('my long password');
		await page.getByRole('button', { name: 'Create account' }).click();
		await expect(page.getByRole('heading', { name: 'Confirm your address' })).toBeVisible();

		await page.goto('/sign-in');
		await page.getByLabel('E-mail address').first().fill(email);
		await page.getByLabel('Password').fill('my long password');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await expect(page.getByRole('alert')).toContainText('not confirmed yet');

		const mail = await latestMail(request, email, /Confirm your address/);
		await page.goto(firstLink(mail.text, '/sign-up/confirm/'));
		await page.getByRole('button', { name: 'Confirm my address' }).click();
		await expect(page.getByRole('status')).toContainText('address is confirmed');
		await signInWithPassword(page, email, 'my long password');
	});

	test("a squatter's password never signs in, also not through Auth.js's endpoint", async ({ request }) => {
		const email = `owner-${Date.now()}@example.test`;
		const signUp = await request.post('/sign-up', { form: { name: 'Squatter', email, password: 'squatters password' }, headers: { ...origin, accept: 'text/html' }, maxRedirects: 0 });
		expect(signUp.status()).toBe(303);
		const direct = await request.post('/auth/callback/credentials', { form: { email, password: 'squatters password' }, headers: origin, maxRedirects: 0 });
		expect(direct.headers()['set-cookie'] ?? '').not.toMatch(sessionCookie);
	});

	test('a double click on "Create account" answers as one click', async ({ playwright }) => {
		const email = `double-${Date.now()}@example.test`;
		const clients = await Promise.all([playwright.request.newContext({ baseURL }), playwright.request.newContext({ baseURL })]);
		const answers = await Promise.all(
			clients.map((c) => c.post('/sign-up', { form: { name: 'Double Click', email, password: 'clicked twice!!' }, headers: { ...origin, accept: 'text/html' }, maxRedirects: 0 }))
		);
		expect(answers.map((a) => a.status())).toEqual([303, 303]);
		await Promise.all(clients.map((c) => c.dispose()));
	});

	test('a name with a text-direction override is refused with a message', async ({ page }) => {
		await page.goto('/sign-up');
		await page.getByLabel('Your name').fill('Ann\u202Eexe.doc');
		await page.getByLabel('E-mail address').fill(`rlo-${Date.now()}@example.test`);
		await page.getByRole('button', { name: 'Create account' }).click();
		await expect(page.locator('#field-name-error')).toContainText('no control or text-direction characters');
	});
});

test.describe('sessions end when they should', () => {
	test('the cookie of a signed-out session no longer works', async ({ page, playwright }) => {
		await signInWithPassword(page, who.trainer);
		const cookies = await page.context().cookies();
		const copy = await playwright.request.newContext({ baseURL, storageState: { cookies, origins: [] } });
		expect((await copy.get('/api/v1/me')).status()).toBe(200);
		await page.getByRole('button', { name: 'Sign out' }).click();
		await expect(page.getByRole('link', { name: 'Sign in' }).first()).toBeVisible();
		expect((await copy.get('/api/v1/me')).status()).toBe(401);
		await copy.dispose();
	});

	test('a registrar signs a person out everywhere', async ({ page, playwright }) => {
		const trainee = await playwright.request.newContext({ baseURL });
		await signInRequest(trainee, 'priya@brindlewick.test');
		expect((await trainee.get('/api/v1/me')).status()).toBe(200);

		await page.setViewportSize({ width: 360, height: 800 });
		await signInWithPassword(page, who.registrar);
		await page.goto('/registrar/people?q=priya');
		await page.getByRole('button', { name: 'Sign out everywhere: priya@brindlewick.test' }).click();
		await expect(page.getByRole('status')).toContainText('Signed priya@brindlewick.test out everywhere (1 session ended)');
		await page.screenshot({ path: 'tests/.artifacts/sign-out-everywhere-360.png', fullPage: true });
		expect((await trainee.get('/api/v1/me')).status()).toBe(401);
		await trainee.dispose();
	});

	test('signed-in pages and the API are not stored by caches; Auth.js answers carry the security headers', async ({ page, request }) => {
		const health = await request.get('/api/v1/health');
		expect(health.headers()['cache-control']).toBe('no-store');
		const csrf = await request.get('/auth/csrf');
		expect(csrf.headers()['x-frame-options']).toBe('DENY');
		expect(csrf.headers()['x-content-type-options']).toBe('nosniff');
		await signInWithPassword(page, who.inspector);
		const dashboard = await page.request.get('/dashboard');
		expect(dashboard.headers()['cache-control']).toBe('no-store');
	});
});

test.describe('a database locked by another process', () => {
	test('writes answer 503 with Retry-After (JSON for the API) and the rest stays fast', async ({ request }) => {
		await signInRequest(request, 'luca@brindlewick.test');
		const file = path.resolve('tests/.artifacts/e2e-data/patchwright.sqlite');
		const other = new Database(file);
		other.pragma('busy_timeout = 2000');
		other.exec('begin immediate');
		try {
			const write = await request.put('/api/v1/progress/point-repair-installer/materials', { data: { done: true }, headers: origin });
			expect(write.status()).toBe(503);
			expect(Number(write.headers()['retry-after'])).toBeGreaterThan(0);
			expect(await write.json()).toEqual({ error: { code: 'unavailable', message: expect.any(String) } });

			const timings: number[] = [];
			for (let i = 0; i < 5; i++) {
				const started = Date.now();
				const [health, calc] = await Promise.all([
					request.get('/api/v1/health'),
					request.post('/api/v1/calculations/groundwater-head', { data: { inputs: { headM: 3 } }, headers: origin }),
					request.put('/api/v1/progress/point-repair-installer/materials', { data: { done: true }, headers: origin })
				]);
				timings.push(Date.now() - started);
				expect(health.status()).toBe(200);
				expect(calc.status()).toBe(200);
			}
			expect(Math.max(...timings)).toBeLessThan(1000);
		} finally {
			other.exec('rollback');
			other.close();
		}
		const after = await request.put('/api/v1/progress/point-repair-installer/materials', { data: { done: true }, headers: origin });
		expect(after.status()).toBe(200);
	});
});

test.describe('a start that cannot work says why in one line', () => {
	const start = (env: Record<string, string>) =>
		new Promise<{ code: number | null; stderr: string }>((resolve) => {
			const child = spawn(process.execPath, [process.env.BUILD_DIR || 'build'], {
				env: { ...process.env, PORT: '0', AUTH_SECRET: 'e2e-only-secret', ...env },
				stdio: ['ignore', 'ignore', 'pipe']
			});
			let stderr = '';
			child.stderr.on('data', (d) => (stderr += d));
			const timer = setTimeout(() => child.kill(), 15_000);
			child.on('exit', (code) => {
				clearTimeout(timer);
				resolve({ code, stderr });
			});
		});

	test('a bad setting', async () => {
		const { code, stderr } = await start({ DATA_DIR: 'tests/.artifacts/bad-setting', SIGN_IN_LIMIT_PER_EMAIL: 'abc' });
		expect(code).toBe(1);
		expect(stderr.trim()).toMatch(/^Patchwright cannot start\. Setting SIGN_IN_LIMIT_PER_EMAIL="abc" must be a whole number/);
		expect(stderr.trim().split('\n')).toHaveLength(1);
	});

	test('a data folder that cannot be written', async () => {
		const { code, stderr } = await start({ DATA_DIR: '/sys/patchwright-data' });
		expect(code).toBe(1);
		expect(stderr.trim()).toMatch(/^Patchwright cannot start\. The data folder \/sys\/patchwright-data cannot be written/);
		expect(stderr.trim().split('\n')).toHaveLength(1);
	});
});
