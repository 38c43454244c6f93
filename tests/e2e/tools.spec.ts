import { expect, test, type Page } from '@playwright/test';

/** Opens a calculator page and waits until it computes in the browser. */
async function openCalculator(page: Page, id: string) {
	await page.goto(`/tools/${id}`);
	await expect(page.locator(`[data-calculator="${id}"]`)).toHaveAttribute('data-live', 'true');
}

/** The field calculator computes in the browser as the crew member types. */
test.describe('resin quantity calculator', () => {
	test('shows the DN150 check values and updates as inputs change', async ({ page }) => {
		await openCalculator(page, 'resin-quantity');
		await expect(page.getByRole('heading', { level: 1, name: 'Resin quantity' })).toBeVisible();

		const withWaste = page.locator('[data-result="resinWithWasteKg"]');
		// DN150, 600 mm, 3 plies of 1000 g/m², ratio 2.0, 15 % waste: 1.95 kg (hand-worked).
		await page.getByLabel(/Pipe internal diameter/).fill('150');
		await page.getByLabel(/Patch length/).fill('600');
		await expect(withWaste).toHaveText('1.95 kg');
		await expect(page.locator('[data-result="matAreaM2"]')).toHaveText('0.848 m²');
		await expect(page.getByText('Mat area = n × π × D × L = 3 × π × 0.150 m × 0.600 m = 0.848 m²')).toBeVisible();

		// Resin grows linearly with length: twice the patch, twice the resin.
		await page.getByLabel(/Patch length/).fill('1200');
		await expect(withWaste).toHaveText('3.90 kg');

		// An out-of-range value is named at the field, and no stale result is shown.
		await page.getByLabel(/Pipe internal diameter/).fill('20');
		await expect(page.getByText('Must be between 50 and 1600 mm')).toBeVisible();
		await expect(withWaste).toHaveCount(0);

		await page.getByLabel(/Pipe internal diameter/).fill('150');
		await expect(withWaste).toHaveText('3.90 kg');
	});

	test('switches to imperial units without changing the answer', async ({ page }) => {
		await openCalculator(page, 'resin-quantity');
		const withWaste = page.locator('[data-result="resinWithWasteKg"]');
		await expect(withWaste).toHaveText('1.95 kg');

		await page.getByRole('button', { name: 'Imperial' }).click();
		await expect(page.getByRole('button', { name: 'Imperial' })).toHaveAttribute('aria-pressed', 'true');
		await expect(page.getByLabel(/Pipe internal diameter/)).toHaveValue('5.906');
		// 1.95093 kg = 4.30 lb (1 lb = 0.45359237 kg).
		await expect(withWaste).toHaveText('4.30 lb');

		await page.getByLabel(/Pipe internal diameter/).fill('6');
		await expect(page.getByLabel(/Pipe internal diameter/)).toHaveValue('6');
		await expect(withWaste).not.toHaveText('4.30 lb');
	});

	test('shows the resin caution and links to the lesson', async ({ page }) => {
		await openCalculator(page, 'resin-quantity');
		await expect(page.getByRole('note', { name: /Resins sensitise skin/ })).toBeVisible();
		await expect(page.getByRole('link', { name: 'The lesson that explains this' })).toHaveAttribute(
			'href',
			'/courses/point-repair-installer/resin-quantity'
		);
	});
});

/** Pictures load only with the calculators that draw them, and are in the page before any script runs. */
test.describe('calculator pictures', () => {
	test('the pressure window is drawn in the server page and follows the inputs', async ({ page }) => {
		const html = await (await page.request.get('/tools/pressure-window')).text();
		expect(html).toContain('<title id="');
		expect(html).toMatch(/<svg[^>]*role="img"[\s\S]*?>Pressure window<\/title>/);

		await openCalculator(page, 'pressure-window');
		const bar = page.getByRole('img', { name: /^Pressure window/ });
		await expect(bar).toBeVisible();
		// Defaults: 3 m of water (0.29 bar), a 0.3 bar margin and a 2.5 bar rating: a window exists.
		await expect(bar).toHaveAccessibleName(/inflate between/);
		// A rating below the head plus margin leaves no window, and the picture says so.
		await page.getByLabel(/rated maximum/).fill('0.4');
		await expect(bar).toHaveAccessibleName(/there is no window/);
	});

	test('a calculator without a picture loads no picture code', async ({ page }) => {
		const scripts: string[] = [];
		page.on('response', async (response) => {
			if (response.request().resourceType() === 'script') scripts.push(await response.text());
		});
		await openCalculator(page, 'resin-quantity');
		await page.waitForLoadState('networkidle');
		expect(scripts.some((code) => code.includes('Pressure window'))).toBe(false);
		expect(scripts.some((code) => code.includes('Side section of the taper'))).toBe(false);
	});
});

test.describe('the calculator list', () => {
	test('lists every group as a named region and ships no calculator definitions to the browser', async ({ page }) => {
		const scripts: string[] = [];
		page.on('response', async (response) => {
			if (response.request().resourceType() === 'script') scripts.push(await response.text());
		});
		await page.goto('/tools');
		await page.waitForLoadState('networkidle');
		await expect(page.getByRole('link', { name: /Resin quantity/ })).toBeVisible();
		await expect(page.getByRole('heading', { name: 'Liner design (ASTM F1216)' })).toBeVisible();
		// each group is a region named by its heading
		await expect(page.getByRole('region', { name: 'Mat and resin' })).toBeVisible();
		await expect(page.getByRole('region', { name: 'Liner design (ASTM F1216)' })).toBeVisible();
		expect(scripts.length).toBeGreaterThan(0);
		// an input label of the resin calculator and a source line of the air test: definitions, not listing
		expect(scripts.some((code) => code.includes('Resin to glass ratio by weight'))).toBe(false);
		expect(scripts.some((code) => code.includes('ASTM F1417, low-pressure air test'))).toBe(false);
	});
});
