import { expect, test } from '@playwright/test';
import { firstLink, latestMail, signInWithPassword, who } from './support';

test.describe('signing up and in', () => {
	test('sign up without a password, follow the e-mailed link, land signed in', async ({ page, request }) => {
		test.slow(); // two sign-ups and an e-mail round trip
		const email = `new-${Date.now()}@example.test`;
		const problems: string[] = [];
		page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
		page.on('request', (r) => r.url().includes('/auth/verify-request') && problems.push(r.url()));
		await page.goto('/sign-up');
		await page.getByLabel('Your name').fill('Casey Newhire');
		// A first try with an address that has an account is refused...
		await page.getByLabel('E-mail address').fill(who.trainee);
		await page.getByRole('button', { name: 'Create account' }).click();
		await expect(page.getByText('already has an account').first()).toBeVisible();
		// ...and the refusal is gone the moment the corrected form is sent.
		await page.getByLabel('E-mail address').fill(email);
		await page.getByRole('button', { name: 'Create account' }).click();
		await expect(page.getByText('already has an account')).toHaveCount(0, { timeout: 500 });
		await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
		expect(problems).toEqual([]);

		const mail = await latestMail(request, email, /sign-in link/);
		await page.goto(firstLink(mail.text, '/auth/callback/nodemailer'));
		await expect(page).toHaveURL(/\/dashboard$/);
		await expect(page.getByRole('heading', { name: 'Hello, Casey Newhire' })).toBeVisible();
	});

	test('sign up with a bad address: message at the field, nothing created', async ({ page }) => {
		await page.goto('/sign-up');
		await page.getByLabel('Your name').fill('Typo Person');
		await page.getByLabel('E-mail address').fill('not-an-address');
		await page.getByRole('button', { name: 'Create account' }).click();
		const field = page.getByLabel('E-mail address');
		await expect(field).toHaveAttribute('aria-invalid', 'true');
		await expect(page.locator('#field-email-error')).toHaveText(/e-mail address like/);
		await expect(page.getByLabel('Your name')).toHaveValue('Typo Person');
	});

	test('password sign-in: wrong password gets a clear message, the right one signs in', async ({ page }) => {
		await page.goto('/sign-in');
		await page.getByLabel('E-mail address').first().fill(who.trainer);
		await page.getByLabel('Password').fill('not the password');
		await page.getByRole('button', { name: 'Sign in', exact: true }).click();
		await expect(page.getByRole('alert')).toContainText('do not match an account');
		await expect(page.getByLabel('E-mail address').first()).toHaveValue(who.trainer);
		await expect(page.getByLabel('Password')).toHaveValue('');

		await signInWithPassword(page, who.trainer);
		await expect(page.getByRole('heading', { name: 'Hello, Mira Calloway' })).toBeVisible();
		await page.getByRole('button', { name: 'Sign out' }).click();
		await expect(page.getByRole('link', { name: 'Sign in' }).first()).toBeVisible();
	});

	test('too many wrong passwords for one address are refused with a wait', async ({ page }) => {
		await page.goto('/sign-in');
		for (let i = 0; i < 6; i++) {
			await page.getByLabel('E-mail address').first().fill('rhea@tarnside.test');
			await page.getByLabel('Password').fill(`wrong-${i}`);
			await page.getByRole('button', { name: 'Sign in', exact: true }).click();
			await expect(page.getByRole('alert')).toBeVisible();
			// The refused password is cleared once the answer is in.
			await expect(page.getByLabel('Password')).toHaveValue('');
		}
		await expect(page.getByRole('alert')).toContainText('Too many sign-in attempts');
	});

	test('reset a forgotten password by e-mail and sign in with the new one', async ({ page, request }) => {
		// a demo person no other spec signs in as with the demo password (this test changes it)
		const email = 'tom@brindlewick.test';
		await page.goto('/sign-in');
		await page.getByRole('link', { name: 'Forgot your password?' }).click();
		await expect(page.getByRole('heading', { name: 'Reset your password' })).toBeVisible();
		await page.getByLabel('E-mail address').fill(email);
		await page.getByRole('button', { name: 'Send reset link' }).click();
		await expect(page.getByRole('status')).toContainText('reset link is on its way');

		const mail = await latestMail(request, email, /Reset your Patchwright password/);
		const link = firstLink(mail.text, '/reset-password/');
		await page.goto(link);
		await page.getByLabel('New password', { exact: true }).fill('a brand new password');
		await page.getByLabel('New password again').fill('a different one!!');
		await page.getByRole('button', { name: 'Save the new password' }).click();
		await expect(page.locator('#field-confirm-error')).toHaveText('The two passwords differ.');

		await page.getByLabel('New password', { exact: true }).fill('a brand new password');
		await page.getByLabel('New password again').fill('a brand new password');
		await page.getByRole('button', { name: 'Save the new password' }).click();
		await expect(page.getByRole('status')).toContainText('new password is saved');
		await signInWithPassword(page, email, 'a brand new password');

		await page.goto(link);
		await expect(page.getByText('expired or was already used')).toBeVisible();
	});
});

test('text typed before the page finishes loading is kept (slow phone connection)', async ({ page }) => {
	let release!: () => void;
	const scriptsHeld = new Promise<void>((resolve) => (release = resolve));
	await page.route('**/_app/immutable/**', async (route) => {
		await scriptsHeld;
		await route.continue();
	});
	await page.goto('/sign-in', { waitUntil: 'commit' });
	const email = page.getByLabel('E-mail address').first();
	await email.fill(who.trainer);
	await page.getByLabel('Password').fill('patchwright-demo');
	release();
	await page.waitForLoadState('networkidle');
	await expect(email).toHaveValue(who.trainer);
	await page.getByRole('button', { name: 'Sign in', exact: true }).click();
	await expect(page).toHaveURL(/\/dashboard$/);
});
