import { expect, request as newRequest, test, type APIRequestContext, type Browser } from '@playwright/test';
import sharp from 'sharp';
import { baseURL, latestMail, signInRequest, signInWithPassword, who } from './support';

/**
 * Practical sign-offs end to end, at 360 px as on a phone at the rig: evidence with a real
 * JPEG carrying EXIF GPS, sent back, sent again, signed off, with the e-mails in the local inbox.
 */
const trainee = 'luca@brindlewick.test';

/** A phone photo: JPEG with camera make, orientation and GPS tags (EXIF IFD3 in libvips' naming). */
async function phonePhoto(): Promise<Buffer> {
	return sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 150, g: 110, b: 70 } } })
		.jpeg()
		.withExif({ IFD0: { Make: 'InventedPhone' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' } })
		.withMetadata({ orientation: 6 })
		.toBuffer();
}

async function phonePage(browser: Browser, email: string) {
	const context = await browser.newContext({ viewport: { width: 360, height: 740 }, baseURL });
	const page = await context.newPage();
	await signInWithPassword(page, email);
	return { context, page };
}

async function api(email: string): Promise<APIRequestContext> {
	const request = await newRequest.newContext({ baseURL });
	await signInRequest(request, email);
	return request;
}

test('a trainee sends evidence, the trainer sends it back, the trainee sends again, the trainer signs off', async ({ browser }) => {
	test.setTimeout(120_000);
	const photo = await phonePhoto();
	expect((await sharp(photo).metadata()).exif, 'the test photo carries EXIF').toBeTruthy();

	const luca = await phonePage(browser, trainee);
	await luca.page.goto('/courses/point-repair-installer/practicals');
	const placement = luca.page.getByRole('link', { name: /Place the patch at the defect/ });
	await expect(placement).toContainText('Not started');
	await placement.click();
	await luca.page.waitForLoadState('networkidle');
	await luca.page.getByLabel(/Photos or PDF/).setInputFiles({ name: 'placement.jpg', mimeType: 'image/jpeg', buffer: photo });
	await expect(luca.page.getByRole('img', { name: 'Preview of placement.jpg' })).toBeVisible();
	await luca.page.getByLabel('Note for the trainer').fill('Counter zeroed at MH1, patch centred on the mark.');
	await luca.page.getByRole('button', { name: 'Send evidence' }).click();
	await expect(luca.page.getByText('Evidence sent.')).toBeVisible();
	await expect(luca.page.getByText('With a trainer').first()).toBeVisible();
	expect(await luca.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

	// The stored photo has no EXIF left and is served only with safe headers.
	const lucaApi = await api(trainee);
	const skills = await (await lucaApi.get('/api/v1/courses/point-repair-installer/practicals')).json();
	const sent = skills.skills.find((s: { id: string }) => s.id === 'placement');
	const fileUrl: string = sent.history[0].files[0].url;
	const file = await lucaApi.get(fileUrl);
	expect(file.status()).toBe(200);
	expect(file.headers()['content-type']).toBe('image/jpeg');
	expect(file.headers()['x-content-type-options']).toBe('nosniff');
	expect(file.headers()['content-disposition']).toMatch(/^inline; filename="placement.jpg"/);
	expect(file.headers()['content-security-policy']).toContain("default-src 'none'");
	const stored = await sharp(await file.body()).metadata();
	expect(stored.exif).toBeUndefined();
	expect([stored.width, stored.height]).toEqual([480, 640]);

	// Another trainee, and the admin and trainer of another company, get a 404 for the file.
	for (const other of ['priya@brindlewick.test', 'admin@tarnside.test']) {
		const ctx = await api(other);
		expect((await ctx.get(fileUrl)).status(), other).toBe(404);
		await ctx.dispose();
	}
	const ownAdmin = await api(who.companyAdmin);
	expect((await ownAdmin.get(fileUrl)).status()).toBe(200);
	await ownAdmin.dispose();
	// A trainee cannot post an assessment.
	const refused = await lucaApi.post(`/api/v1/practicals/${sent.history[0].id}/assessment`, { data: { outcome: 'signed off' }, headers: { origin: baseURL } });
	expect(refused.status()).toBe(403);

	// The trainer sends it back with a reason.
	const mira = await phonePage(browser, who.trainer);
	await mira.page.goto('/dashboard');
	await expect(mira.page.getByText(/waiting for assessment/)).toBeVisible();
	await mira.page.goto('/trainer/practicals');
	await mira.page.getByRole('link', { name: /Luca Marsh/ }).click();
	await expect(mira.page.getByRole('img', { name: /placement\.jpg/ })).toBeVisible();
	await mira.page.locator('input[name="criterion.0"][value="met"]').check();
	await mira.page.locator('input[name="criterion.1"][value="not met"]').check();
	await mira.page.locator('input[name="remark.1"]').fill('The overlap past the defect is not shown on camera.');
	await mira.page.getByLabel('Send back with reasons').check();
	await mira.page.getByLabel(/^Reasons/).fill('Show the camera view of both ends, 150 mm past the defect.');
	await mira.page.getByLabel('Where the practical took place').fill('Fenmoor rig bay 1');
	await mira.page.getByRole('button', { name: 'Record the assessment' }).click();
	await expect(mira.page.getByText('Sent back. The trainee has been told')).toBeVisible();
	expect((await latestMail(lucaApi, trainee, /^Sent back: Place the patch/)).text).toContain('150 mm past the defect');

	// The trainee sees the reasons and sends again.
	await luca.page.goto('/courses/point-repair-installer/practicals/placement');
	await luca.page.waitForLoadState('networkidle');
	await expect(luca.page.getByText('Show the camera view of both ends').first()).toBeVisible();
	await luca.page.getByLabel(/Photos or PDF/).setInputFiles({ name: 'placement-ends.jpg', mimeType: 'image/jpeg', buffer: photo });
	await luca.page.getByLabel('Note for the trainer').fill('Both ends shown on the camera, 160 mm and 170 mm past the defect.');
	await luca.page.getByRole('button', { name: 'Send evidence' }).click();
	await expect(luca.page.getByText('Evidence sent.')).toBeVisible();

	// The trainer signs it off.
	await mira.page.goto('/trainer/practicals');
	await mira.page.getByRole('link', { name: /Luca Marsh/ }).click();
	for (const input of await mira.page.locator('input[type=radio][value="met"]').all()) await input.check();
	await mira.page.getByLabel('Sign off: every criterion met').check();
	await mira.page.getByLabel('Where the practical took place').fill('Fenmoor rig bay 1');
	await expect(mira.page.getByLabel('Your name, typed as your signature')).toHaveValue('Mira Calloway');
	await mira.page.getByRole('button', { name: 'Record the assessment' }).click();
	await expect(mira.page.getByText('Signed off. The trainee has been told')).toBeVisible();
	expect((await latestMail(lucaApi, trainee, /^Signed off: Place the patch/)).text).toContain('Mira Calloway');

	await luca.page.goto('/courses/point-repair-installer/practicals');
	const done = luca.page.getByRole('link', { name: /Place the patch at the defect/ });
	await expect(done).toContainText('Signed off');
	await expect(done).toContainText('by Mira Calloway');
	await luca.page.screenshot({ path: 'tests/.artifacts/practicals-360.png', fullPage: true });
	await lucaApi.dispose();
	await luca.context.close();
	await mira.context.close();
});

test('a trainer cannot assess themselves, and sees only their own company crew when a company trainer', async () => {
	const mira = await api(who.trainer);
	const me = await (await mira.get('/api/v1/me')).json();
	const own = await mira.post('/trainer/practicals/in-person?/assess', { multipart: { traineeId: me.id, skill: 'point-repair-installer/placement' }, headers: { origin: baseURL, accept: 'application/json' } });
	const body = await own.json();
	expect(body.type).toBe('failure');
	expect(body.status).toBe(403);
	await mira.dispose();

	// Dana trains for Tarnside only: Brindlewick's waiting evidence is not in her queue.
	const dana = await api('admin@tarnside.test');
	const queue = await (await dana.get('/api/v1/practicals/queue')).json();
	expect(queue.items.length).toBeGreaterThan(0);
	expect(queue.items.every((q: { companies: string }) => q.companies === 'Tarnside Pipe Works')).toBe(true);
	await dana.dispose();
});

test('bad uploads through the API are refused with a clear 4xx', async () => {
	const priya = await api('priya@brindlewick.test');
	const url = '/api/v1/courses/point-repair-installer/practicals/placement/evidence';
	const html = await priya.post(url, { multipart: { note: 'x', photos: { name: 'photo.jpg', mimeType: 'image/jpeg', buffer: Buffer.from('<html><script>alert(1)</script></html>') } }, headers: { origin: baseURL } });
	expect(html.status()).toBe(415);
	expect((await html.json()).error.message).toContain('photo.jpg is not a JPEG, PNG, WebP or PDF');
	const skills = await (await priya.get('/api/v1/courses/point-repair-installer/practicals')).json();
	expect(skills.skills.find((s: { id: string }) => s.id === 'placement').history).toEqual([]);
	await priya.dispose();
});
