import { expect as baseExpect, request as newRequest, test, type APIRequestContext, type Page } from '@playwright/test';
import { baseURL, DEMO_PASSWORD, firstLink, latestMail, signInRequest, who } from './support';

/**
 * Buying seats through the real `stripe` SDK against the local payments fake, at 360 px:
 * a declined card leaves no seats; the success card pays; the seats arrive with the webhook;
 * the admin invites three by CSV; one accepts from the local inbox and opens the course;
 * a person without a company buys one seat and starts the course.
 */
test.use({ viewport: { width: 360, height: 780 } });
// Payment pages, webhooks and mail cross three processes; allow for a loaded machine.
const expect = baseExpect.configure({ timeout: 15_000 });
test.describe.configure({ timeout: 240_000 });

const COURSE = 'transition-patches';

async function signedInPage(page: Page, email: string) {
	const api = await newRequest.newContext({ baseURL });
	await signInRequest(api, email);
	await page.context().addCookies((await api.storageState()).cookies);
	return api;
}

async function ledger(api: APIRequestContext, companyId: string) {
	const body = await (await api.get(`/api/v1/companies/${companyId}/seats`)).json();
	return (body.ledger as { courseSlug: string; bought: number; assigned: number; inUse: number; invited: number; free: number }[]).find((l) => l.courseSlug === COURSE) ?? { bought: 0, assigned: 0, inUse: 0, invited: 0, free: 0 };
}

test('a company admin buys 5 seats, invites 3 by CSV, and a crew member accepts and starts the course', async ({ page, browser }) => {
	const admin = await signedInPage(page, who.companyAdmin);
	const companyId = ((await (await admin.get('/api/v1/me')).json()).companies as { id: string; role: string }[]).find((c) => c.role === 'admin')!.id;

	await page.goto(`/courses/${COURSE}`);
	await page.getByRole('link', { name: 'Buy seats' }).first().click();
	await expect(page.getByRole('heading', { name: 'Buy seats' })).toBeVisible();
	await page.getByLabel('Number of seats').fill('5');
	await expect(page.getByTestId('order-total')).toHaveText('€2,450.00');
	await page.screenshot({ path: 'tests/.artifacts/seats-buy.png', fullPage: true });
	await page.getByRole('button', { name: 'Go to payment' }).click();

	// The local test payment page: a declined card first.
	await expect(page.getByText('LOCAL TEST PAYMENT SERVICE')).toBeVisible();
	await page.getByLabel('Card number').fill('4000 0000 0000 0002');
	await page.getByRole('button', { name: /^Pay/ }).click();
	await expect(page.getByRole('alert')).toHaveText('Your card was declined.');
	expect((await ledger(admin, companyId)).bought).toBe(0);
	await page.screenshot({ path: 'tests/.artifacts/seats-pay-declined.png', fullPage: true });

	await page.getByLabel('Card number').fill('4242 4242 4242 4242');
	await page.getByRole('button', { name: /^Pay/ }).click();
	await expect(page).toHaveURL(/\/orders\/[0-9a-f-]+\?paid=1$/);
	// The page waits for the webhook, then shows the seats.
	await expect(page.getByTestId('order-paid')).toContainText('5 seats added for Brindlewick Drainage', { timeout: 20_000 });
	await expect(page.getByTestId('order-state')).toHaveText('Paid');
	await page.screenshot({ path: 'tests/.artifacts/seats-paid.png', fullPage: true });
	expect(await ledger(admin, companyId)).toMatchObject({ bought: 5, assigned: 0, free: 5 });

	// The receipt page and its PDF.
	await page.getByRole('link', { name: 'Receipt' }).click();
	await page.waitForURL(/\/receipt$/);
	await expect(page.getByRole('heading', { name: 'Receipt' })).toBeVisible();
	const orderId = page.url().match(/orders\/([0-9a-f-]+)\/receipt/)![1];
	const pdf = await admin.get(`/orders/${orderId}/receipt.pdf`);
	expect(pdf.headers()['content-type']).toBe('application/pdf');
	expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');

	// Three people by CSV roster: semicolons, a byte-order mark, a quoted comma.
	const stamp = Date.now();
	const crew = [0, 1, 2].map((i) => ({ name: `Crew ${i}, Test`, email: `crew${i}-${stamp}@brindlewick.test` }));
	await page.goto(`/orders/${orderId}`);
	await page.getByRole('link', { name: 'Invite the crew' }).click();
	await page.getByLabel('Or paste the rows').fill(`\uFEFFname;email;course\n${crew.map((c) => `"${c.name}";${c.email};TP-200`).join('\n')}\n`);
	await page.getByRole('button', { name: 'Check the roster' }).click();
	const preview = page.getByTestId('roster-preview');
	await expect(preview).toContainText('3 rows: 3 ready, 0 with errors');
	await page.screenshot({ path: 'tests/.artifacts/seats-roster-preview.png', fullPage: true });
	await page.getByRole('button', { name: 'Send 3 invitations' }).click();
	await expect(page.getByRole('status')).toContainText('3 invitations sent.');
	expect(await ledger(admin, companyId)).toMatchObject({ bought: 5, invited: 3, free: 2 });

	// The first crew member accepts from the local inbox, as someone without an account.
	const mail = await latestMail(admin, crew[0].email, /has a seat for you/);
	const link = firstLink(mail.text, '/invitations/');
	const crewContext = await browser.newContext({ viewport: { width: 360, height: 780 } });
	const crewPage = await crewContext.newPage();
	await crewPage.goto(link);
	await expect(crewPage.getByRole('heading', { name: 'A seat for you' })).toBeVisible();
	await crewPage.getByLabel('Choose a password').fill('a long enough password');
	await crewPage.getByRole('button', { name: 'Create the account and accept' }).click();
	await expect(crewPage).toHaveURL(new RegExp(`/courses/${COURSE}\\?welcome=1$`));
	expect(await ledger(admin, companyId)).toMatchObject({ bought: 5, assigned: 1, inUse: 0, invited: 2, free: 2 });
	await crewPage.goto(`/courses/${COURSE}/sizing-the-taper`);
	await expect(crewPage.getByRole('heading', { level: 1 })).toBeVisible();
	expect(await ledger(admin, companyId)).toMatchObject({ assigned: 1, inUse: 1 });
	// The link works once.
	await crewPage.goto(link);
	await expect(crewPage.getByRole('alert')).toContainText('already been accepted');
	await crewContext.close();

	await page.goto(`/company/seats?c=${companyId}`);
	await expect(page.getByTestId('seat-ledger')).toContainText('Transition patches');
	await page.screenshot({ path: 'tests/.artifacts/seats-company.png', fullPage: true });
	await admin.dispose();
});

test('a person without a company buys one seat and starts the course', async ({ page }) => {
	const inspector = await signedInPage(page, who.inspector);
	await page.goto('/courses/point-repair-installer/buy');
	await expect(page.getByLabel('Myself (one seat)')).toBeChecked();
	await expect(page.getByTestId('order-total')).toHaveText('€390.00');
	await page.getByRole('button', { name: 'Go to payment' }).click();
	await page.getByLabel('Card number').fill('4242424242424242');
	await page.getByRole('button', { name: /^Pay/ }).click();
	await expect(page.getByTestId('order-paid')).toContainText('Your seat is ready', { timeout: 20_000 });
	await page.getByRole('link', { name: 'Start the course' }).click();
	await expect(page.getByText('Your progress')).toBeVisible();
	const lesson = await inspector.get('/courses/point-repair-installer/wet-out', { maxRedirects: 0 });
	expect(lesson.status()).toBe(200);
	// A second seat for the same person is refused.
	const again = await inspector.post('/api/v1/orders', { headers: { origin: baseURL }, data: { course: 'point-repair-installer', quantity: 1 } });
	expect(again.status()).toBe(409);
	expect((await again.json()).error.code).toBe('conflict');
	await inspector.dispose();
});

test('the API refuses other companies, bad bodies and forged webhooks', async () => {
	const trainee = await newRequest.newContext({ baseURL });
	await signInRequest(trainee, who.trainee);
	const me = await newRequest.newContext({ baseURL });
	await signInRequest(me, who.companyAdmin);
	const companyId = ((await (await me.get('/api/v1/me')).json()).companies as { id: string }[])[0].id;
	const origin = { origin: baseURL };
	expect((await trainee.post(`/api/v1/companies/${companyId}/invitations`, { headers: origin, data: { invitations: [{ name: 'X', email: 'x@x.test', course: 'PR-100' }] } })).status()).toBe(403);
	expect((await trainee.get(`/api/v1/companies/${companyId}/seats`)).status()).toBe(403);
	expect((await trainee.post('/api/v1/orders', { headers: origin, data: { course: 'point-repair-installer', quantity: 3, companyId } })).status()).toBe(403);
	// A state change from another site is refused before anything runs.
	expect((await me.post('/api/v1/orders', { headers: { origin: 'http://evil.test' }, data: { course: 'point-repair-installer', quantity: 1, companyId } })).status()).toBe(403);

	const bad = await me.post('/api/v1/orders', { headers: origin, data: { course: 'point-repair-installer', quantity: 201, companyId } });
	expect(bad.status()).toBe(400);
	expect((await bad.json()).error.fields.quantity).toBeTruthy();
	const proto = await me.post('/api/v1/orders', { headers: { ...origin, 'content-type': 'application/json' }, data: '{"course":"point-repair-installer","quantity":1,"__proto__":{"admin":true}}' });
	expect(proto.status()).toBe(400);
	const preview = await me.post(`/api/v1/companies/${companyId}/invitations?preview=1`, { headers: { ...origin, 'content-type': 'text/csv' }, data: 'name,email,course\n"=HYPERLINK(""http://x.test"")",f@x.test,PR-100\nBad,nope,PR-100\n' });
	const rows = (await preview.json()).rows;
	expect(rows[0].name).toBe('=HYPERLINK("http://x.test")');
	expect(rows[1]).toMatchObject({ line: 3, errors: ['"nope" is not an e-mail address.'] });

	const anonymous = await newRequest.newContext({ baseURL });
	const forged = await anonymous.post('/api/v1/payments/webhook', {
		headers: { 'stripe-signature': `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}`, 'content-type': 'application/json' },
		data: JSON.stringify({ id: 'evt_forged', type: 'checkout.session.completed', data: { object: {} } })
	});
	expect(forged.status()).toBe(400);
	expect((await forged.json()).error).toMatchObject({ code: 'bad_request', reason: 'signature-invalid' });
	await Promise.all([trainee.dispose(), me.dispose(), anonymous.dispose()]);
	void DEMO_PASSWORD;
});
