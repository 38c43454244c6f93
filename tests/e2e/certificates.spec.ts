import fs from 'node:fs';
import { expect, request as newRequest, test } from '@playwright/test';
import sharp from 'sharp';
import { parse } from 'yaml';
import { baseURL, signInRequest, signInWithPassword, who } from './support';

/**
 * The certificate's whole life at phone width: the last sign-off issues it, the holder
 * downloads the PDF, an inspector checks the number and an altered copy, a registrar revokes
 * it and the inspector sees the change.
 */
test.use({ viewport: { width: 360, height: 780 } });
const HOLDER = 'nell@brindlewick.test';

test('issued on the last sign-off, verified, an altered PDF refused, revoked', async ({ browser }) => {
	test.setTimeout(240_000);
	// Nell sends evidence for her last packer skill; the trainer signs it off
	const nell = await newRequest.newContext({ baseURL });
	await signInRequest(nell, HOLDER);
	const photo = await sharp({ create: { width: 96, height: 96, channels: 3, background: '#8a7a66' } }).jpeg().toBuffer();
	const sent = await nell.post('/api/v1/courses/packer-pressure-safety/practicals/ppe-and-resin/evidence', {
		headers: { origin: baseURL },
		multipart: { note: 'Gloves, sleeves and eye protection on before opening the resin; spill kit at hand.', photos: { name: 'ppe.jpg', mimeType: 'image/jpeg', buffer: photo } }
	});
	expect(sent.status(), await sent.text()).toBe(201);
	const trainer = await newRequest.newContext({ baseURL });
	await signInRequest(trainer, who.trainer);
	const queue: { items: { submissionId: string; courseSlug: string; skillId: string; traineeName: string }[] } = await (await trainer.get('/api/v1/practicals/queue')).json();
	const waiting = queue.items.find((e) => e.courseSlug === 'packer-pressure-safety' && e.traineeName === 'Nell Garrow');
	expect(waiting, 'Nell\u2019s waiting packer evidence').toBeTruthy();
	const course = parse(fs.readFileSync('content/courses/packer-pressure-safety/course.md', 'utf8').split('---')[1]);
	const criteriaCount = course.practicalSkills.find((s: { id: string }) => s.id === waiting!.skillId).criteria.length;
	const assessed = await trainer.post(`/api/v1/practicals/${waiting!.submissionId}/assessment`, {
		headers: { origin: baseURL },
		data: {
			criteria: Array.from({ length: criteriaCount }, () => ({ result: 'met', remark: '' })),
			outcome: 'signed off',
			reasons: '',
			place: 'Training yard rig',
			practicalDate: new Date().toISOString().slice(0, 10),
			signatureName: 'Mira Calloway'
		}
	});
	expect(assessed.status(), await assessed.text()).toBe(201);

	// the holder finds the certificate on the dashboard and downloads the PDF
	const holder = await browser.newPage({ viewport: { width: 360, height: 780 } });
	await signInWithPassword(holder, HOLDER);
	const section = holder.getByTestId('my-certificates');
	const item = section.getByRole('listitem').filter({ hasText: 'PS-150' });
	await expect(item).toContainText('Valid');
	const number = (await item.locator('strong.num').innerText()).trim();
	expect(number).toMatch(/^[0-9A-Z]{4}(-[0-9A-Z]{4}){3}$/);
	const downloading = holder.waitForEvent('download');
	await item.getByRole('link', { name: 'PDF A4' }).click();
	const pdfPath = await (await downloading).path();
	const genuine = fs.readFileSync(pdfPath);
	expect(genuine.subarray(0, 5).toString()).toBe('%PDF-');
	await holder.screenshot({ path: 'tests/.artifacts/certificates-holder-360.png', fullPage: true });

	// the inspector types the number sloppily and reads "Valid"
	const inspector = await browser.newPage({ viewport: { width: 360, height: 780 } });
	await signInWithPassword(inspector, who.inspector);
	await inspector.goto('/verify');
	await inspector.getByLabel('Certificate number').fill(number.toLowerCase().replace(/-/g, ' ').replace(/0/g, 'o'));
	await inspector.getByRole('button', { name: 'Check', exact: true }).click();
	await expect(inspector).toHaveURL(new RegExp(`/verify/${number}$`));
	await expect(inspector.locator('[data-status="valid"]')).toContainText('Valid');
	await expect(inspector.getByTestId('holder')).toHaveText('Nell Garrow');
	await expect(inspector.locator('main')).not.toContainText('@');
	await inspector.screenshot({ path: 'tests/.artifacts/certificates-verify-valid-360.png', fullPage: true });

	// an altered copy (one byte changed) is refused, and the number it claims is shown
	const altered = Buffer.from(genuine);
	altered[Math.floor(altered.length / 2)] ^= 0x20;
	await inspector.goto('/verify');
	await inspector.getByLabel('Certificate PDF or credential').setInputFiles({ name: 'certificate.pdf', mimeType: 'application/pdf', buffer: altered });
	await inspector.getByRole('button', { name: 'Check the file' }).click();
	await expect(inspector.getByRole('alert')).toContainText('This file is not the one we issued');
	await expect(inspector.getByRole('alert')).toContainText(number);
	await inspector.screenshot({ path: 'tests/.artifacts/certificates-altered-360.png', fullPage: true });
	await inspector.getByLabel('Certificate PDF or credential').setInputFiles({ name: 'certificate.pdf', mimeType: 'application/pdf', buffer: genuine });
	await inspector.getByRole('button', { name: 'Check the file' }).click();
	await expect(inspector.getByTestId('file-verdict')).toContainText('This file is the one we issued');

	// the registrar revokes it
	const registrar = await browser.newPage({ viewport: { width: 360, height: 780 } });
	await signInWithPassword(registrar, who.registrar);
	await registrar.goto(`/registrar/certificates?q=${number}`);
	await expect(registrar.getByTestId('waiting')).toContainText('Kit Mendel');
	const row = registrar.locator(`[data-number="${number}"]`);
	await row.getByText('Revoke or correct the name').click();
	await row.getByLabel('Reason').selectOption('misconduct');
	await row.getByLabel('Note for the record').fill('Worked in line with an inflated packer.');
	await row.getByRole('button', { name: `Revoke ${number}` }).click();
	await expect(registrar.getByRole('status')).toContainText(`Certificate ${number} revoked`);

	// the inspector sees "Revoked", without the reason
	await inspector.goto(`/verify/${number}`);
	await expect(inspector.locator('[data-status="revoked"]')).toContainText('Revoked');
	await expect(inspector.locator('main')).toContainText('withdrawn by the issuer');
	await expect(inspector.locator('main')).not.toContainText('inflated packer');
	await inspector.screenshot({ path: 'tests/.artifacts/certificates-verify-revoked-360.png', fullPage: true });

	// and a crew check lists it among the others
	await inspector.goto('/inspector');
	await inspector.getByLabel('Site or crew').fill('Mill Lane, crew 2');
	await inspector.getByLabel(/Certificate numbers/).fill(`${number}\nABCD-EFGH\n0000-0000-0000-0000`);
	await inspector.getByRole('button', { name: 'Check the crew' }).click();
	await expect(inspector).toHaveURL(/\/inspector\/checks\//);
	await expect(inspector.getByRole('row').filter({ hasText: number })).toContainText('Revoked');
	await expect(inspector.getByRole('row').filter({ hasText: 'ABCD-EFGH' })).toContainText('Not found');
	await inspector.goto('/inspector');
	await expect(inspector.getByRole('link', { name: 'Mill Lane, crew 2' })).toBeVisible();
	await trainer.dispose();
});

test('the JSON API answers the same shape for an unknown and a malformed number', async ({ request }) => {
	const unknown = await request.get('/api/v1/certificates/0000-0000-0000-0000');
	const malformed = await request.get('/api/v1/certificates/nonsense');
	expect(unknown.status()).toBe(404);
	expect(malformed.status()).toBe(404);
	expect(await unknown.json()).toEqual(await malformed.json());
	const list = await request.post('/api/v1/certificates/verify', { data: { numbers: ['0000-0000-0000-0000'] } });
	expect((await list.json()).results[0]).toMatchObject({ found: false });
	const tooMany = await request.post('/api/v1/certificates/verify', { data: { numbers: Array.from({ length: 201 }, () => 'x') } });
	expect(tooMany.status()).toBe(400);
	expect((await tooMany.json()).error.code).toBe('bad_request');
	const proto = await request.post('/api/v1/certificates/verify', { data: { __proto__: { numbers: ['x'] }, constructor: 1 } });
	expect(proto.status()).toBe(400);
});
