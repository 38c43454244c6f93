import { expect, test } from '@playwright/test';
import { baseURL, signInWithPassword, who } from './support';

test('no page requests anything from another origin', async ({ page }) => {
	const outside: string[] = [];
	page.on('request', (r) => {
		const url = r.url();
		if (!url.startsWith(baseURL) && !url.startsWith('data:')) outside.push(url);
	});
	for (const path of ['/', '/about', '/sign-in', '/sign-up']) {
		await page.goto(path);
		await page.waitForLoadState('networkidle');
	}
	await signInWithPassword(page, who.registrar);
	for (const path of ['/dashboard', '/registrar/people', '/registrar/audit']) {
		await page.goto(path);
		await page.waitForLoadState('networkidle');
	}
	expect(outside).toEqual([]);
	// Lora is served by the app itself.
	const fonts = await page.evaluate(() => [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family));
	expect(fonts.join(',')).toContain('Lora');
});

test('the About page speaks to crews: what works today, no code', async ({ page }) => {
	await page.goto('/about');
	await expect(page.getByRole('heading', { level: 1, name: 'About Patchwright' })).toBeVisible();
	await expect(page.getByTestId('capabilities')).toContainText('Course test');
	await expect(page.getByTestId('capabilities')).toContainText('Issued once the test is passed and every sign-off is in.');
	await expect(page.locator('main pre, main code')).toHaveCount(0);
});

test('at phone width every dashboard is usable and the menu opens', async ({ page }) => {
	test.slow(); // six sign-ins with password hashing: about 30 s on a loaded machine
	await page.setViewportSize({ width: 360, height: 780 });
	for (const [role, email] of Object.entries(who)) {
		await signInWithPassword(page, email);
		const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
		expect(overflow, `${role} dashboard scrolls sideways`).toBeLessThanOrEqual(0);
		// the line under the greeting keeps its spaces: "Signed in as <e-mail> · <roles>"
		await expect(page.getByText(`Signed in as ${email}`)).not.toContainText(`${email}·`);
		await page.screenshot({ path: `tests/.artifacts/screens/dashboard-${role}-360.png`, fullPage: true });
		await page.getByRole('button', { name: 'Menu' }).click();
		await page.locator('#mobile-menu').getByRole('button', { name: 'Sign out' }).click();
		await expect(page).toHaveURL(baseURL + '/');
	}
});

test('unknown pages get a friendly 404', async ({ page }) => {
	const response = await page.goto('/no-such-page');
	expect(response?.status()).toBe(404);
	await expect(page.getByRole('heading', { name: 'We could not find that page' })).toBeVisible();
});

test('the API page hydrates cleanly and keeps the backslash of a shell line continuation', async ({ page }) => {
	const messages: string[] = [];
	page.on('console', (m) => (m.type() === 'error' || m.type() === 'warning') && messages.push(m.text()));
	await page.goto('/api-docs');
	await page.waitForLoadState('networkidle');
	await expect(page.locator('pre.shiki').filter({ hasText: 'curl' })).toContainText('\\');
	expect(messages.filter((m) => /hydration/i.test(m))).toEqual([]);
});

test('on a wide screen the header keeps "Sign out" on one line, even with the longest menu (a company admin)', async ({ page }) => {
	await page.setViewportSize({ width: 1280, height: 800 });
	await signInWithPassword(page, who.companyAdmin);
	const signOut = page.getByRole('banner').getByRole('button', { name: 'Sign out' });
	const box = (await signOut.boundingBox())!;
	const lineHeight = await signOut.evaluate((el) => parseFloat(getComputedStyle(el).lineHeight));
	expect(box.height).toBeLessThan(lineHeight * 2);
});
