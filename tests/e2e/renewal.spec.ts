import Database from 'better-sqlite3';
import { expect, request as newRequest, test } from '@playwright/test';
import type { DrawnItem } from '../../src/lib/practice/test-items';
import { rightAnswer } from '../helpers/answer-key';
import { plainPng } from '../helpers/photos';
import { baseURL, firstLink, latestMail, signInRequest, signInWithPassword, who } from './support';

/**
 * Renewal end to end, at 360 px: the expiry reminder sent at start-up (demo: Owen Tarrant's
 * PS-150 certificate expires within a month) reaches Owen and his company admin; the admin buys
 * a renewal seat through the payments fake; Owen follows the e-mail's link, starts the renewal,
 * passes the course test again and has the skills marked for renewal signed off by a trainer;
 * the new certificate verifies and the old one shows as replaced by it.
 */
const OWEN = 'owen@brindlewick.test';
const COURSE = 'packer-pressure-safety';
const RENEWAL_SKILLS = ['pre-use-check', 'staged-inflation', 'gas-and-confined-space', 'emergency-drill'];
const DB_FILE = 'tests/.artifacts/e2e-data/patchwright.sqlite';

function query<T>(sql: string, ...params: unknown[]): T {
	const db = new Database(DB_FILE, { readonly: true, fileMustExist: true });
	try {
		return db.prepare(sql).get(...params) as T;
	} finally {
		db.close();
	}
}

test('a crew member renews from the reminder e-mail; the new certificate verifies and the old one shows replaced', async ({ page, browser }) => {
	test.setTimeout(120_000);
	await page.setViewportSize({ width: 360, height: 800 });

	// The reminder job ran at start-up: the holder and the company admin each got one.
	const reminder = await latestMail(page.request, OWEN, /^Your PS-150 certificate expires in \d+ days$/);
	const link = firstLink(reminder.text, '/renew');
	const oldNumber = link.match(/\/certificates\/([0-9A-Z-]+)\/renew$/)![1];
	expect(link.startsWith(baseURL)).toBe(true);
	const adminMail = await latestMail(page.request, who.companyAdmin, /^Owen Tarrant: PS-150 certificate expires in \d+ days$/);
	expect(adminMail.text).toContain(`${baseURL}/company`);
	const old = query<{ expires_on: string }>('select expires_on from certificate where number = ?', oldNumber);

	// The admin sees who expires, and buys one renewal seat through the same checkout as course seats.
	const adminContext = await browser.newContext({ viewport: { width: 360, height: 800 } });
	const admin = await adminContext.newPage();
	await signInWithPassword(admin, who.companyAdmin);
	await expect(admin.getByTestId('crew-expiring')).toContainText('Owen Tarrant (PS-150');
	await admin.goto('/company/seats');
	await admin.getByRole('link', { name: 'Buy PS-150 renewal seats' }).click();
	await expect(admin.getByRole('heading', { name: 'Buy renewal seats' })).toBeVisible();
	await admin.getByLabel('Number of seats').fill('1');
	await expect(admin.getByTestId('order-total')).toHaveText('€145.00');
	await admin.getByRole('button', { name: 'Go to payment' }).click();
	await admin.getByLabel('Card number').fill('4242 4242 4242 4242');
	await admin.getByRole('button', { name: /^Pay/ }).click();
	await expect(admin).toHaveURL(/\/orders\/[0-9a-f-]+\?paid=1$/);
	await expect(admin.getByTestId('order-state')).toHaveText('Paid', { timeout: 20_000 });
	await admin.goto('/company/seats');
	await expect(admin.getByTestId('renewal-seats')).toContainText('1 bought, 0 used, 1 free');
	await adminContext.close();

	// Owen: the dashboard says what is next; the e-mail's link opens the renewal.
	await signInWithPassword(page, OWEN);
	await expect(page.getByTestId('renewals-due')).toContainText('Packer pressure and site safety (PS-150) certificate expires in');
	await page.goto(link);
	await expect(page.getByTestId('renewal')).toHaveAttribute('data-stage', 'open');
	await page.screenshot({ path: 'tests/.artifacts/renewal-open-360.png', fullPage: true });
	await page.getByRole('button', { name: 'Start the renewal' }).click();
	await expect(page.getByTestId('renewal')).toHaveAttribute('data-stage', 'started');
	await expect(page.getByTestId('renewal-steps')).toContainText('Course test: not passed yet.');
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

	// The course test again, answered through the API the test runner uses.
	const started = await page.request.post(`/api/v1/courses/${COURSE}/attempts`, { data: {}, headers: { origin: baseURL } });
	expect(started.ok()).toBe(true);
	const attemptId: string = (await started.json()).attempt.id;
	const draw: DrawnItem[] = JSON.parse(query<{ items: string }>('select items from test_attempt where id = ?', attemptId).items);
	for (let i = 0; i < draw.length; i++) {
		const saved = await page.request.put(`/api/v1/attempts/${attemptId}/answers/${i}`, { data: rightAnswer(draw[i]), headers: { origin: baseURL } });
		expect(saved.ok(), `answer ${i}`).toBe(true);
	}
	const submitted = await page.request.post(`/api/v1/attempts/${attemptId}/submit`, { data: {}, headers: { origin: baseURL } });
	expect(submitted.ok()).toBe(true);

	// Evidence for each skill marked for renewal; a skill not marked stays signed off and takes none.
	const photo = await plainPng(480, 640);
	const sent: string[] = [];
	for (const skill of RENEWAL_SKILLS) {
		const response = await page.request.post(`/api/v1/courses/${COURSE}/practicals/${skill}/evidence`, {
			multipart: { photos: { name: `${skill}.png`, mimeType: 'image/png', buffer: photo }, note: 'Shown again at the rig for the renewal.' },
			headers: { origin: baseURL }
		});
		expect(response.status(), skill).toBe(201);
		sent.push((await response.json()).id);
	}
	const notMarked = await page.request.post(`/api/v1/courses/${COURSE}/practicals/spill-kit/evidence`, {
		multipart: { photos: { name: 'spill.png', mimeType: 'image/png', buffer: photo }, note: 'Not needed.' },
		headers: { origin: baseURL }
	});
	expect(notMarked.status()).toBe(409);
	const overview = await (await page.request.get(`/api/v1/courses/${COURSE}/practicals`)).json();
	const criteriaOf = (id: string) => (overview.skills as { id: string; criteria: string[] }[]).find((s) => s.id === id)!.criteria;

	// The trainer's dashboard says evidence is waiting; the trainer signs each one off.
	const trainerContext = await browser.newContext({ viewport: { width: 360, height: 800 } });
	const trainerPage = await trainerContext.newPage();
	await signInWithPassword(trainerPage, who.trainer);
	await expect(trainerPage.getByTestId('trainer-next')).toHaveAttribute('data-busy', 'yes');
	const trainer = await newRequest.newContext({ baseURL });
	await signInRequest(trainer, who.trainer);
	const today = new Date().toISOString().slice(0, 10);
	for (const [i, id] of sent.entries()) {
		const assessed = await trainer.post(`/api/v1/practicals/${id}/assessment`, {
			data: { criteria: criteriaOf(RENEWAL_SKILLS[i]).map(() => ({ result: 'met' })), outcome: 'signed off', place: 'Training rig, Fenmoor', practicalDate: today, signatureName: 'Mira Calloway' },
			headers: { origin: baseURL }
		});
		expect(assessed.status(), RENEWAL_SKILLS[i]).toBe(201);
	}
	await trainer.dispose();
	await trainerContext.close();

	// Renewed: a new certificate continuing from the old expiry date.
	await page.goto(link);
	await expect(page.getByTestId('renewal')).toHaveAttribute('data-stage', 'completed');
	const newNumber = (await page.getByTestId('renewal').locator('a.num').first().textContent())!.trim();
	expect(newNumber).not.toBe(oldNumber);
	const fresh = query<{ expires_on: string; replaces_id: string }>('select expires_on, replaces_id from certificate where number = ?', newNumber);
	// PS-150 is valid 24 months (content/courses/packer-pressure-safety/course.md), counted from the old expiry date
	const [y, m, d] = old.expires_on.split('-').map(Number);
	expect(fresh.expires_on).toBe(`${y + 2}-${String(m).padStart(2, '0')}-${String(m === 2 && d === 29 ? 28 : d).padStart(2, '0')}`);
	await page.screenshot({ path: 'tests/.artifacts/renewal-done-360.png', fullPage: true });

	const anonymous = await browser.newContext({ viewport: { width: 360, height: 800 } });
	const inspector = await anonymous.newPage();
	await inspector.goto(`/verify/${newNumber}`);
	await expect(inspector.getByText(/^Valid until \d/)).toBeVisible();
	await inspector.goto(`/verify/${oldNumber}`);
	await expect(inspector.getByText('Replaced by')).toBeVisible();
	await inspector.getByRole('link', { name: newNumber }).click();
	await expect(inspector).toHaveURL(new RegExp(`/verify/${newNumber}$`));
	await anonymous.close();

	// The holder's own list shows both: the new one valid, the old one replaced and linked.
	await page.goto('/dashboard');
	await expect(page.getByTestId('renewals-due')).toHaveCount(0);
	await expect(page.getByRole('link', { name: newNumber }).first()).toBeVisible();
});
