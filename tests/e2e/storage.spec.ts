import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { expect, request as newRequest, test } from '@playwright/test';
import { e2eDataDir, s3Bucket, s3URL, useS3 } from '../../playwright.config';
import { baseURL, signInRequest, signInWithPassword, who } from './support';

/**
 * Where the app keeps its files in this run: the S3 fake (the default for e2e, through the AWS
 * SDK) or DATA_DIR/uploads/ (E2E_STORAGE=filesystem). Downloads must be the stored bytes, with
 * their headers, and a stored object that has gone missing is a 404 that says so.
 */

const client = new S3Client({
	endpoint: s3URL,
	region: 'us-east-1',
	forcePathStyle: true,
	credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
	requestChecksumCalculation: 'WHEN_REQUIRED',
	responseChecksumValidation: 'WHEN_REQUIRED'
});
const uploads = path.join(e2eDataDir, 'uploads');

/** Every stored object in this run: key and SHA-256 of its bytes. */
async function storedObjects(): Promise<Map<string, string>> {
	const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
	const found = new Map<string, string>();
	if (useS3) {
		const listed = await client.send(new ListObjectsV2Command({ Bucket: s3Bucket, MaxKeys: 1000 }));
		for (const { Key } of listed.Contents ?? []) {
			const object = await client.send(new GetObjectCommand({ Bucket: s3Bucket, Key }));
			found.set(Key!, sha(await object.Body!.transformToByteArray()));
		}
	} else {
		for (const file of fs.readdirSync(uploads, { recursive: true }) as string[]) {
			const full = path.join(uploads, file);
			if (fs.statSync(full).isFile()) found.set(file.split(path.sep).join('/'), sha(fs.readFileSync(full)));
		}
	}
	return found;
}

async function readStored(key: string): Promise<Uint8Array> {
	if (!useS3) return fs.readFileSync(path.join(uploads, key));
	return (await client.send(new GetObjectCommand({ Bucket: s3Bucket, Key: key }))).Body!.transformToByteArray();
}
async function removeStored(key: string) {
	if (useS3) await client.send(new DeleteObjectCommand({ Bucket: s3Bucket, Key: key }));
	else fs.rmSync(path.join(uploads, key));
}
async function restoreStored(key: string, bytes: Uint8Array) {
	if (useS3) await client.send(new PutObjectCommand({ Bucket: s3Bucket, Key: key, Body: bytes }));
	else fs.writeFileSync(path.join(uploads, key), bytes);
}
const keyOf = (objects: Map<string, string>, bytes: Buffer) => [...objects].find(([, sha]) => sha === createHash('sha256').update(bytes).digest('hex'))?.[0];

test(`evidence and certificate files are kept in ${useS3 ? 'the S3 fake' : 'DATA_DIR/uploads'} and served from there`, async ({ browser }) => {
	test.setTimeout(90_000);
	expect(fs.existsSync(uploads), 'files kept in DATA_DIR/uploads').toBe(!useS3);

	// a seeded evidence photo, as its trainee sees it
	const sam = await newRequest.newContext({ baseURL });
	await signInRequest(sam, who.trainee);
	const overview = await (await sam.get('/api/v1/courses/point-repair-installer/practicals')).json();
	const file = overview.skills.flatMap((s: any) => s.history.flatMap((h: any) => h.files)).find((f: any) => f.mediaType === 'image/jpeg');
	expect(file, 'a seeded evidence photo').toBeTruthy();
	const photo = await sam.get(file.url);
	expect(photo.status()).toBe(200);
	expect(photo.headers()['content-type']).toBe('image/jpeg');
	expect(photo.headers()['x-content-type-options']).toBe('nosniff');
	expect(photo.headers()['content-disposition']).toMatch(/^inline; filename="/);
	expect(photo.headers()['content-security-policy']).toContain('sandbox');
	const photoBytes = await photo.body();
	expect(Number(photo.headers()['content-length'])).toBe(photoBytes.length);
	expect(photoBytes.length).toBe(file.sizeBytes);
	const objects = await storedObjects();
	const photoKey = keyOf(objects, photoBytes);
	expect(photoKey, 'the served photo is a stored object').toMatch(/^evidence\/[0-9a-f]{32}\.jpg$/);

	// a certificate PDF, downloaded by its holder, is stored on first download and served again
	const holder = await browser.newPage();
	await signInWithPassword(holder, 'kit@tarnside.test');
	const href = await holder.getByTestId('my-certificates').getByRole('link', { name: 'PDF A4' }).first().getAttribute('href');
	expect(href).toMatch(/^\/certificates\/[0-9A-Z-]+\/a4\.pdf$/);
	const first = await holder.request.get(href!);
	expect(first.status()).toBe(200);
	expect(first.headers()['content-type']).toBe('application/pdf');
	expect(first.headers()['content-disposition']).toMatch(/^attachment; filename="certificate-[0-9A-Z-]+-a4\.pdf"$/);
	expect(first.headers()['cache-control']).toContain('no-store');
	const pdf = await first.body();
	expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
	const again = await holder.request.get(href!);
	expect(Number(again.headers()['content-length'])).toBe(pdf.length);
	expect(Buffer.compare(await again.body(), pdf)).toBe(0);
	// names that are properties of every object are not formats
	for (const name of ['constructor', '__proto__', 'toString']) {
		expect((await holder.request.get(href!.replace('a4.pdf', name))).status(), name).toBe(404);
	}
	const pdfKey = keyOf(await storedObjects(), pdf);
	expect(pdfKey, 'the served PDF is a stored object').toMatch(/^certificates\/[0-9a-f-]+\/a4-[0-9a-f]{16}\.pdf$/);
	expect(Buffer.compare(Buffer.from(await readStored(pdfKey!)), pdf)).toBe(0);

	// an object gone from the store: 404 with a message, not a 500; back in place, served again
	await removeStored(photoKey!);
	try {
		const missing = await sam.get(file.url);
		expect(missing.status()).toBe(404);
		expect(await missing.text()).toContain('missing from storage');
	} finally {
		await restoreStored(photoKey!, photoBytes);
	}
	expect((await sam.get(file.url)).status()).toBe(200);

	await removeStored(pdfKey!);
	try {
		const missing = await holder.request.get(href!);
		expect(missing.status()).toBe(404);
		expect(await missing.text()).toContain('missing from storage');
	} finally {
		await restoreStored(pdfKey!, pdf);
	}
	expect(Buffer.compare(await (await holder.request.get(href!)).body(), pdf)).toBe(0);
	await sam.dispose();
	await holder.close();
});
