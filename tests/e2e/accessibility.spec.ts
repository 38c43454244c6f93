import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import { signInWithPassword, who } from './support';

/**
 * Automated accessibility checks with axe-core (WCAG 2.1 A/AA rules: labels, contrast,
 * landmarks, names). They catch a part of the problems, not all; serious and critical
 * findings fail the test.
 */
async function expectAccessible(page: import('@playwright/test').Page, path: string) {
	await page.goto(path);
	await page.waitForLoadState('networkidle');
	const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
	const serious = results.violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).slice(0, 3).join(', ')})`);
	expect(serious, `${path}`).toEqual([]);
}

test('public pages pass the automated accessibility checks', async ({ page }) => {
	for (const path of ['/', '/about', '/sign-in', '/sign-up', '/reset-password', '/tools', '/tools/pressure-window', '/no-such-page']) {
		await expectAccessible(page, path);
	}
});

test('signed-in pages pass the automated accessibility checks', async ({ page }) => {
	test.slow(); // seven pages through axe
	await signInWithPassword(page, who.registrar);
	for (const path of ['/dashboard', '/registrar/people', '/registrar/audit']) await expectAccessible(page, path);
	await page.context().clearCookies();
	await signInWithPassword(page, who.companyAdmin);
	await expectAccessible(page, '/company');
	await expectAccessible(page, '/company/board');
	await expectAccessible(page, '/company/board?expiring=60&state=bogus');
});

test('a refused form announces its errors and ties each to its field', async ({ page }) => {
	await page.goto('/sign-up');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByRole('alert')).toContainText('Please correct the marked fields');
	const name = page.getByLabel('Your name');
	await expect(name).toHaveAttribute('aria-invalid', 'true');
	await expect(name).toHaveAccessibleDescription('Enter your name.');
	await expect(name).toBeFocused();
	await expectAccessible(page, '/sign-up');
});
