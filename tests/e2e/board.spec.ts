import fs from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import Papa from 'papaparse';
import { extractText, getDocumentProxy } from 'unpdf';
import { signInRequest, who } from './support';

/**
 * The company admin's compliance board, as Brindlewick's admin uses it (the demo gives that
 * company every state; see src/lib/server/demo-board.ts): filter "expiring within 60 days",
 * see the right people, export the CSV and the crew-list PDF, and read a person's record.
 */
const shots = 'tests/.artifacts/screens';
const EXPIRING_60 = ['Mae Ridley', 'Owen Tarrant'];

async function boardNames(page: Page) {
	return page.getByTestId('board-row').locator('th[scope=row] a').allTextContents();
}

test('the admin filters "expiring within 60 days", then exports the CSV and the crew list of exactly those people', async ({ page }) => {
	test.slow();
	fs.mkdirSync(shots, { recursive: true });
	await signInRequest(page.request, who.companyAdmin);
	await page.setViewportSize({ width: 1280, height: 900 });
	await page.goto('/dashboard');
	await page.getByRole('link', { name: 'Compliance board' }).first().click();
	await expect(page.getByRole('heading', { name: 'Compliance board' })).toBeVisible();
	await expect(page.getByTestId('board-counts')).toContainText('2 expiring within 60 days');
	await expect(page.getByTestId('board-counts')).toContainText('1 expired');
	await expect(page.getByTestId('board-counts')).toContainText('1 revoked');
	for (const state of ['not-enrolled', 'learning', 'test-passed', 'skills', 'certified', 'expiring', 'expired', 'revoked']) {
		await expect(page.getByTestId('board-table').locator(`[data-state="${state}"]`).first(), state).toBeVisible();
	}
	await page.screenshot({ path: `${shots}/board-1280.png`, fullPage: true });

	await page.getByLabel('Certificate expiring').selectOption({ label: 'Within 60 days' });
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page).toHaveURL(/expiring=60/);
	await expect.poll(() => boardNames(page)).toEqual(EXPIRING_60);
	await expect(page.getByTestId('board-shown')).toContainText('Showing 2 people of');
	await page.screenshot({ path: `${shots}/board-expiring-60-1280.png`, fullPage: true });

	// the CSV: the same people, and each course cell says what the board says
	const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
	expect(csvDownload.suggestedFilename()).toMatch(/^compliance-board-\d{4}-\d{2}-\d{2}\.csv$/);
	const csv = Papa.parse<Record<string, string>>(fs.readFileSync(await csvDownload.path(), 'utf8').replace(/^\ufeff/, ''), { header: true, skipEmptyLines: true });
	expect(csv.errors).toEqual([]);
	expect(csv.data.map((r) => r.Name)).toEqual(EXPIRING_60);
	const headings = (await page.getByTestId('board-table').locator('thead th').allTextContents()).map((h) => h.trim()).slice(1);
	const rows = page.getByTestId('board-row');
	for (let i = 0; i < EXPIRING_60.length; i++) {
		const cells = rows.nth(i).locator('td');
		for (let j = 0; j < headings.length; j++) {
			const label = (await cells.nth(j).locator('[data-state] span.block').first().textContent())!.trim();
			expect(csv.data[i][headings[j]], `${EXPIRING_60[i]} ${headings[j]}`).toMatch(new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}`));
		}
	}

	// the crew list: one page with the same people's valid certificates
	const [pdfDownload] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-pdf').click()]);
	expect(pdfDownload.suggestedFilename()).toMatch(/^crew-list-\d{4}-\d{2}-\d{2}\.pdf$/);
	const bytes = new Uint8Array(fs.readFileSync(await pdfDownload.path()));
	const pdf = await getDocumentProxy(bytes);
	expect(pdf.numPages).toBe(1);
	const { text } = await extractText(pdf, { mergePages: true });
	const flat = text.replace(/\s+/g, ' ');
	for (const name of EXPIRING_60) expect(flat).toContain(name);
	expect(flat).not.toContain('Tom Quarrie');
	expect(flat).toContain('expiring within 60 days');
	const numbers = csv.data.flatMap((r) => Object.entries(r).filter(([k, v]) => k.endsWith('certificate number') && v).map(([, v]) => v));
	expect(numbers.length).toBeGreaterThanOrEqual(2);
	for (const n of numbers) expect(flat).toContain(n);

	// a person's record, from the board
	await page.getByRole('link', { name: 'Mae Ridley' }).click();
	await expect(page.getByRole('heading', { name: 'Mae Ridley', level: 1 })).toBeVisible();
	await expect(page.getByTestId('record-certificate').first()).toBeVisible();
	await page.screenshot({ path: `${shots}/board-person-1280.png`, fullPage: true });
});

test('on a phone the board is a card per person, and a bad filter falls back with a notice', async ({ page }) => {
	fs.mkdirSync(shots, { recursive: true });
	await signInRequest(page.request, who.companyAdmin);
	await page.setViewportSize({ width: 360, height: 780 });
	const response = await page.goto('/company/board?expiring=45&state=expiring&sort=nonsense');
	expect(response?.status()).toBe(200);
	await expect(page.getByTestId('board-notices')).toContainText('Choose 30, 60 or 90 days');
	await expect(page.getByTestId('board-notices')).toContainText('sorted by name');
	await expect(page.getByTestId('board-table')).toBeHidden();
	const cards = page.getByTestId('board-card');
	await expect(cards.locator('h2')).toHaveText(EXPIRING_60);
	await expect(cards.first().locator('[data-state="expiring"]')).toContainText(/Expires in \d+ days/);
	await page.screenshot({ path: `${shots}/board-360.png`, fullPage: true });
	await page.goto('/company/board');
	await page.screenshot({ path: `${shots}/board-all-360.png`, fullPage: true });
});

test('the filters work without JavaScript, and a filtered board can be bookmarked', async ({ browser }) => {
	const context = await browser.newContext({ javaScriptEnabled: false, viewport: { width: 1280, height: 900 } });
	await signInRequest(context.request, who.companyAdmin);
	const page = await context.newPage();
	await page.goto('/company/board');
	await page.getByLabel('Names (commas between several)').fill('ivo, bea');
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page).toHaveURL(/q=ivo%2C\+bea|q=ivo%2C%20bea/);
	expect(await boardNames(page)).toEqual(['Bea Holloway', 'Ivo Brack']);
	const bookmark = page.url();
	await page.goto('/company/board');
	await page.goto(bookmark);
	expect(await boardNames(page)).toEqual(['Bea Holloway', 'Ivo Brack']);
	await page.getByRole('link', { name: /^PR-100/ }).first().click();
	await expect(page).toHaveURL(/sort=point-repair-installer/);
	// sorted by that course: the expired certificate before the revoked one
	expect(await boardNames(page)).toEqual(['Ivo Brack', 'Bea Holloway']);
	await context.close();
});
