import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { reloadConfig } from '$lib/server/config';
import { seedDemo } from '$lib/server/demo-seed';
import { receiveEvidence } from '$lib/server/evidence-upload';
import { FilesystemStore, readObject, StorageUnavailableError, type FileStore } from '$lib/server/storage';
import { apiFailure, failFrom } from '$lib/server/sign-off-forms';
import { UploadError } from '$lib/server/uploads';
import { findUserByEmail } from '$lib/server/users';
import { createTestDb } from '../helpers/db';
import { hasGpsPointer, phoneJpegWithGps, plainPng, tinyPdf } from '../helpers/photos';

let dataDir: string;
let store: FilesystemStore;
let db: Awaited<ReturnType<typeof createTestDb>>;
let traineeId: string;
const previousDataDir = process.env.DATA_DIR;

beforeAll(() => {
	dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-uploads-'));
	process.env.DATA_DIR = dataDir;
	reloadConfig();
});
afterAll(() => {
	process.env.DATA_DIR = previousDataDir;
	reloadConfig();
	fs.rmSync(dataDir, { recursive: true, force: true });
});
beforeEach(async () => {
	fs.rmSync(path.join(dataDir, 'uploads'), { recursive: true, force: true });
	store = new FilesystemStore(path.join(dataDir, 'uploads'));
	db = await createTestDb();
	await seedDemo(db);
	traineeId = (await findUserByEmail('sam@brindlewick.test', db))!.id;
	// the demo seeds evidence rows of its own (its certificates rest on sign-offs); count from here
	seeded = await counts();
});
afterEach(async () => db.destroy());

function upload(files: { name: string; bytes: Buffer; type?: string }[], fields: Record<string, string> = { note: 'Wet-out on the rig.' }) {
	const form = new FormData();
	for (const [k, v] of Object.entries(fields)) form.append(k, v);
	for (const f of files) form.append('photos', new File([new Uint8Array(f.bytes)], f.name, { type: f.type ?? 'image/jpeg' }));
	return new Request('http://localhost/upload', { method: 'POST', body: form });
}

const send = (request: Request) => receiveEvidence(request, { traineeId, courseSlug: 'point-repair-installer', skillId: 'wet-out' }, store, db);

let seeded = { rows: 0, submissions: 0 };

async function counts() {
	const rows = await db.selectFrom('evidence_file').select('id').execute();
	const submissions = await db.selectFrom('practical_submission').select('id').execute();
	return { rows: rows.length, submissions: submissions.length };
}

/** Every file in the upload store and the temporary folder, and every evidence row added since the seed. */
async function leftovers() {
	const walk = (dir: string): string[] => (fs.existsSync(dir) ? fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).map((e) => e.name) : []);
	const now = await counts();
	return { stored: walk(path.join(dataDir, 'uploads')), temporary: walk(path.join(dataDir, 'tmp')), rows: now.rows - seeded.rows, submissions: now.submissions - seeded.submissions };
}

async function refused(request: Request, status: number, message: RegExp) {
	const err = await send(request).then(() => null, (e) => e);
	expect(err, 'the upload should be refused').toBeInstanceOf(UploadError);
	expect((err as UploadError).status).toBe(status);
	expect((err as UploadError).message).toMatch(message);
	expect(await leftovers()).toEqual({ stored: [], temporary: [], rows: 0, submissions: 0 });
}

describe('evidence uploads', () => {
	it('stores a phone JPEG re-encoded: upright, no EXIF or GPS left, thumbnail, SHA-256 of the stored bytes', async () => {
		const photo = await phoneJpegWithGps(400, 300);
		const before = await sharp(photo).metadata();
		expect(before.orientation).toBe(6);
		expect(hasGpsPointer(before.exif)).toBe(true);

		const { submissionId } = await send(upload([{ name: 'IMG_0042.jpg', bytes: photo }, { name: 'log.pdf', bytes: tinyPdf, type: 'application/pdf' }, { name: 'gauge.png', bytes: await plainPng() }]));
		const files = await db.selectFrom('evidence_file').selectAll().where('submission_id', '=', submissionId).orderBy('position').execute();
		expect(files.map((f) => [f.original_name, f.media_type])).toEqual([
			['IMG_0042.jpg', 'image/jpeg'],
			['log.pdf', 'application/pdf'],
			['gauge.png', 'image/png']
		]);
		const stored = (await readObject(store, files[0].storage_key))!;
		expect(createHash('sha256').update(stored).digest('hex')).toBe(files[0].sha256);
		expect(stored.length).toBe(files[0].size_bytes);
		const after = await sharp(stored).metadata();
		expect(after.exif).toBeUndefined();
		expect(after.xmp).toBeUndefined();
		expect(after.orientation).toBeUndefined();
		// Orientation 6 means the camera was turned: the stored photo is upright, 300 × 400.
		expect([after.width, after.height]).toEqual([300, 400]);
		expect(stored.includes(Buffer.from('InventedPhone'))).toBe(false);
		const thumb = await sharp((await readObject(store, files[0].thumbnail_key!))!).metadata();
		expect(Math.max(thumb.width!, thumb.height!)).toBeLessThanOrEqual(320);
		expect(thumb.exif).toBeUndefined();
		const pdf = (await readObject(store, files[1].storage_key))!;
		expect(pdf.equals(tinyPdf)).toBe(true);
		expect(files[1].sha256).toBe(createHash('sha256').update(tinyPdf).digest('hex'));
		expect(files[0].storage_key).not.toContain('IMG_0042');
		expect((await leftovers()).temporary).toEqual([]);
	});

	it('caps the long side at 2,560 px', async () => {
		const big = await sharp({ create: { width: 3000, height: 1000, channels: 3, background: '#888' } }).jpeg().toBuffer();
		const { submissionId } = await send(upload([{ name: 'wide.jpg', bytes: big }]));
		const row = await db.selectFrom('evidence_file').select(['width_px', 'height_px']).where('submission_id', '=', submissionId).executeTakeFirstOrThrow();
		expect([row.width_px, row.height_px]).toEqual([2560, 853]);
	});

	it('refuses an HTML file named .jpg', async () => {
		await refused(upload([{ name: 'photo.jpg', bytes: Buffer.from('<!doctype html><html><script>alert(1)</script></html>') }]), 415, /photo\.jpg is not a JPEG, PNG, WebP or PDF/);
	});

	it('refuses an SVG', async () => {
		await refused(upload([{ name: 'rig.svg', bytes: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="9" height="9"/></svg>'), type: 'image/svg+xml' }]), 415, /rig\.svg is not/);
	});

	it('refuses a zero-byte file', async () => {
		await refused(upload([{ name: 'empty.jpg', bytes: Buffer.alloc(0) }]), 400, /empty\.jpg is empty/);
	});

	it('refuses a 13 MB file, naming it and the limit', async () => {
		const photo = await phoneJpegWithGps();
		const huge = Buffer.concat([photo, Buffer.alloc(13 * 1024 * 1024 - photo.length, 0x20)]);
		await refused(upload([{ name: 'huge.jpg', bytes: huge }]), 413, /huge\.jpg is larger than 12 MB/);
	});

	it('refuses a truncated JPEG', async () => {
		const photo = await phoneJpegWithGps();
		await refused(upload([{ name: 'cut.jpg', bytes: photo.subarray(0, Math.floor(photo.length * 0.6)) }]), 400, /cut\.jpg could not be read as a whole image/);
	});

	it('refuses a polyglot: a JPEG header followed by script', async () => {
		const header = Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00]);
		await refused(upload([{ name: 'poly.jpg', bytes: Buffer.concat([header, Buffer.from('<script>fetch("/api/v1/me")</script>')]) }]), 400, /poly\.jpg could not be read/);
	});

	it('refuses a file name with ../ and control characters', async () => {
		const photo = await phoneJpegWithGps();
		await refused(upload([{ name: '../../etc/x\u0007.jpg', bytes: photo }]), 400, /control characters|folder path/);
		await refused(upload([{ name: '..\\..\\boot.jpg', bytes: photo }]), 400, /folder path/);
		await refused(upload([{ name: '../../etc/passwd.jpg', bytes: photo }]), 400, /folder path/);
	});

	it('refuses nine files at once, and one bad file among good ones refuses them all', async () => {
		const photo = await phoneJpegWithGps(40, 30);
		const nine = Array.from({ length: 9 }, (_, i) => ({ name: `p${i + 1}.jpg`, bytes: photo }));
		await refused(upload(nine), 413, /p9\.jpg: at most 8 files per submission/);
		await refused(upload([{ name: 'good.jpg', bytes: photo }, { name: 'bad.jpg', bytes: Buffer.from('not an image at all') }]), 415, /bad\.jpg/);
	});

	it('refuses a body that is not multipart', async () => {
		await refused(new Request('http://localhost/upload', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' }), 415, /multipart/);
	});

	it('a file store out of reach half-way is a 503 with nothing recorded and nothing left stored', async () => {
		const photo = await phoneJpegWithGps(40, 30);
		// the second object (the thumbnail) cannot be stored: the photo stored before it is removed again
		let puts = 0;
		const flaky: FileStore = {
			kind: 'filesystem',
			put: (key, body, info) => (++puts === 2 ? Promise.reject(new StorageUnavailableError(`Could not store stored file ${key} (ECONNRESET).`)) : (store as FileStore).put(key, body, info)),
			get: (key) => store.get(key),
			exists: (key) => store.exists(key),
			delete: (key) => store.delete(key)
		};
		const err = await receiveEvidence(upload([{ name: 'rig.jpg', bytes: photo }]), { traineeId, courseSlug: 'point-repair-installer', skillId: 'wet-out' }, flaky, db).then(() => null, (e) => e);
		expect(err).toBeInstanceOf(StorageUnavailableError);
		expect(await leftovers()).toEqual({ stored: [], temporary: [], rows: 0, submissions: 0 });
		const answer = apiFailure(err);
		expect(answer.status).toBe(503);
		expect(await answer.json()).toEqual({ error: { code: 'unavailable', message: StorageUnavailableError.readerMessage } });
		const form = failFrom(err, { note: 'Wet-out on the rig.' });
		expect(form).toMatchObject({ status: 503, data: { message: StorageUnavailableError.readerMessage, values: { note: 'Wet-out on the rig.' } } });
	});
});
