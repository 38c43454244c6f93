import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { parseConfig } from '$lib/server/config';
import {
	FilesystemStore,
	InvalidStorageKeyError,
	randomKey,
	readObject,
	S3Store,
	StorageUnavailableError,
	checkFileStore,
	type FileStore
} from '$lib/server/storage';
import { startS3Fake, S3_FAKE_KEY } from '../../fakes/s3';

/**
 * One contract, two stores: the filesystem under a temporary folder, and the S3 store through
 * the real AWS SDK against s3rver (a local S3 REST server from the npm registry, started here
 * on port 0). Whatever a caller can observe must be the same on both.
 */

const scratch = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-store-'));
let fake: Awaited<ReturnType<typeof startS3Fake>>;

beforeAll(async () => {
	fake = await startS3Fake({ port: 0, dir: path.join(scratch, 's3'), bucket: 'patchwright-test' });
});
afterAll(async () => {
	await fake.close();
	fs.rmSync(scratch, { recursive: true, force: true });
});

function s3Store(overrides: Partial<Record<string, string>> = {}): S3Store {
	const settings = parseConfig({ ...fake.env, ...overrides }).s3;
	if (!settings) throw new Error('S3 settings did not parse');
	return new S3Store(settings);
}

/** Everything stored, whatever the store: files under the root, or objects in the bucket. */
async function everythingStored(store: FileStore): Promise<string[]> {
	if (store instanceof FilesystemStore) {
		if (!fs.existsSync(store.root)) return [];
		return (fs.readdirSync(store.root, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(store.root, f)).isFile()).sort();
	}
	const s3 = store as S3Store;
	const listed = await s3.client.send(new ListObjectsV2Command({ Bucket: s3.settings.bucket }));
	return (listed.Contents ?? []).map((o) => o.Key!).sort();
}

const stores: { name: string; make: () => FileStore }[] = [
	{ name: 'filesystem', make: () => new FilesystemStore(path.join(scratch, `fs-${randomBytes(4).toString('hex')}`)) },
	{ name: 'S3 (s3rver through @aws-sdk/client-s3)', make: () => s3Store() }
];

describe.each(stores)('file store contract: $name', ({ make }) => {
	let store: FileStore;
	beforeEach(() => {
		store = make();
	});
	afterEach(async () => {
		for (const key of await everythingStored(store)) if (!(store instanceof FilesystemStore)) await store.delete(key);
	});

	it('puts, gets, checks and deletes by key, streaming in and out', async () => {
		const key = randomKey('evidence', 'jpg');
		const { sizeBytes } = await store.put(key, Readable.from([Buffer.from('abc'), Buffer.from('def')]));
		expect(sizeBytes).toBe(6);
		expect(await store.exists(key)).toBe(true);
		const object = (await store.get(key))!;
		expect(object.sizeBytes).toBe(6);
		expect(object.contentType).toBe('image/jpeg');
		expect(object.body).toBeInstanceOf(Readable);
		object.body.destroy();
		expect((await readObject(store, key))?.toString()).toBe('abcdef');
		await store.delete(key);
		expect(await store.get(key)).toBeNull();
		expect(await store.exists(key)).toBe(false);
		await store.delete(key);
	});

	it('answers null and false for a key never stored', async () => {
		expect(await store.get('evidence/never-stored.pdf')).toBeNull();
		expect(await store.exists('evidence/never-stored.pdf')).toBe(false);
		expect(await readObject(store, 'evidence/never-stored.pdf')).toBeNull();
	});

	it('keeps bytes, sizes and types exactly, for buffers and for streams', async () => {
		const pdf = randomKey('certificates', 'pdf');
		const bytes = randomBytes(70_000);
		expect((await store.put(pdf, bytes, { contentType: 'application/pdf' })).sizeBytes).toBe(70_000);
		expect(Buffer.compare((await readObject(store, pdf))!, bytes)).toBe(0);
		expect((await store.get(pdf))!.contentType).toBe('application/pdf');

		const png = randomKey('evidence', 'png');
		expect((await store.put(png, Readable.from([bytes.subarray(0, 10), bytes.subarray(10)]))).sizeBytes).toBe(70_000);
		const read = (await store.get(png))!;
		expect(read.contentType).toBe('image/png');
		expect(read.sizeBytes).toBe(70_000);
		const hash = createHash('sha256');
		for await (const chunk of read.body) hash.update(chunk as Buffer);
		expect(hash.digest('hex')).toBe(createHash('sha256').update(bytes).digest('hex'));
	});

	it('streams an object larger than one multipart part (6 MB) whole', async () => {
		const key = randomKey('evidence', 'pdf');
		const big = randomBytes(6 * 1024 * 1024 + 123);
		async function* chunks() {
			for (let at = 0; at < big.length; at += 256 * 1024) yield big.subarray(at, at + 256 * 1024);
		}
		expect((await store.put(key, chunks())).sizeBytes).toBe(big.length);
		const object = (await store.get(key))!;
		expect(object.sizeBytes).toBe(big.length);
		let chunksRead = 0;
		const hash = createHash('sha256');
		for await (const chunk of object.body) {
			chunksRead += 1;
			hash.update(chunk as Buffer);
		}
		expect(chunksRead).toBeGreaterThan(1);
		expect(hash.digest('hex')).toBe(createHash('sha256').update(big).digest('hex'));
	}, 30_000);

	it('replaces an object put again under the same key', async () => {
		const key = randomKey('evidence', 'jpg');
		await store.put(key, Buffer.from('first version'));
		await store.put(key, Buffer.from('second'));
		expect((await readObject(store, key))!.toString()).toBe('second');
		expect((await store.get(key))!.sizeBytes).toBe(6);
	});

	it('leaves nothing behind when the body stream fails, and rethrows the body error', async () => {
		const before = await everythingStored(store);
		async function* failing() {
			yield Buffer.from('partial');
			throw new Error('connection reset');
		}
		await expect(store.put('evidence/broken.jpg', failing())).rejects.toThrow('connection reset');
		expect(await store.exists('evidence/broken.jpg')).toBe(false);
		expect(await everythingStored(store)).toEqual(before);
	});

	it('refuses keys that could leave its folder or bucket, before touching anything', async () => {
		const attempts = ['../x', '/etc/passwd', 'a/../../b', 'A/b', 'a\u0000b', 'a//b', '', 'evidence/..', '..%2f..%2fx', 'a\\b', 'a/b?versionId=1', '../other-bucket/key'];
		for (const key of attempts) {
			await expect(store.put(key, Buffer.from('x'))).rejects.toThrow(InvalidStorageKeyError);
			await expect(store.get(key)).rejects.toThrow(InvalidStorageKeyError);
			await expect(store.exists(key)).rejects.toThrow(InvalidStorageKeyError);
			await expect(store.delete(key)).rejects.toThrow(InvalidStorageKeyError);
		}
		expect(await everythingStored(store)).toEqual([]);
	});
});

describe('S3 store errors', () => {
	it('turns an unknown access key into StorageUnavailableError, not a missing object', async () => {
		// s3rver checks the access key id (it does not recompute SigV4 signatures)
		const store = s3Store({ S3_ACCESS_KEY_ID: 'UNKNOWNKEY' });
		await expect(store.get('evidence/any.jpg')).rejects.toThrow(StorageUnavailableError);
		await expect(store.put('evidence/any.jpg', Buffer.from('x'))).rejects.toThrow(StorageUnavailableError);
		await expect(checkFileStore(store)).rejects.toThrow(/S3 bucket "patchwright-test" cannot be reached/);
	});

	it('turns a missing bucket into StorageUnavailableError on read and write', async () => {
		const store = s3Store({ S3_BUCKET: 'no-such-bucket' });
		await expect(store.get('evidence/any.jpg')).rejects.toThrow(StorageUnavailableError);
		await expect(store.exists('evidence/any.jpg')).rejects.toThrow(StorageUnavailableError);
		await expect(store.put('evidence/any.jpg', Buffer.from('x'))).rejects.toThrow(StorageUnavailableError);
		await expect(checkFileStore(store)).rejects.toThrow(/no-such-bucket/);
	});

	it('turns an endpoint nobody answers into StorageUnavailableError', async () => {
		const store = s3Store({ S3_ENDPOINT: 'http://127.0.0.1:9' });
		await expect(store.get('evidence/any.jpg')).rejects.toThrow(StorageUnavailableError);
	}, 20_000);

	it('reaches the bucket with the right settings', async () => {
		await expect(checkFileStore(s3Store())).resolves.toBeUndefined();
	});
});

describe('filesystem store errors', () => {
	it('turns an unwritable folder into StorageUnavailableError', async () => {
		const root = path.join(scratch, 'read-only');
		fs.mkdirSync(root);
		fs.writeFileSync(path.join(root, 'evidence'), 'a file where a folder should be');
		const store = new FilesystemStore(root);
		await expect(store.put('evidence/x.jpg', Buffer.from('x'))).rejects.toThrow(StorageUnavailableError);
		expect(await store.get('evidence/x.jpg')).toBeNull();
	});
});

describe('S3 settings', () => {
	const base = { S3_BUCKET: 'patchwright-files' };
	const S3_FAKE_KEY_ENV = { S3_ACCESS_KEY_ID: S3_FAKE_KEY.accessKeyId, S3_SECRET_ACCESS_KEY: S3_FAKE_KEY.secretAccessKey };

	it('keep files on disk when no S3 setting is given', () => {
		expect(parseConfig({}).s3).toBeNull();
	});

	it('use path-style addressing by default with an endpoint, and host-style without one', () => {
		expect(parseConfig({ ...base, S3_ENDPOINT: 'http://127.0.0.1:9000/' }).s3).toEqual({
			bucket: 'patchwright-files',
			endpoint: 'http://127.0.0.1:9000',
			region: 'us-east-1',
			forcePathStyle: true,
			credentials: null
		});
		expect(parseConfig({ ...base, S3_REGION: 'eu-west-1' }).s3).toMatchObject({ endpoint: null, region: 'eu-west-1', forcePathStyle: false });
		expect(parseConfig({ ...base, S3_ENDPOINT: 'https://objects.example.test', S3_FORCE_PATH_STYLE: '0' }).s3?.forcePathStyle).toBe(false);
	});

	it('carry the key pair only when both halves are given', () => {
		expect(parseConfig({ ...base, ...S3_FAKE_KEY_ENV }).s3?.credentials).toEqual(S3_FAKE_KEY);
		expect(() => parseConfig({ ...base, S3_ACCESS_KEY_ID: 'AKIDEXAMPLE' })).toThrow('Setting S3_SECRET_ACCESS_KEY=(hidden) must be set together with the other S3 key.');
		expect(() => parseConfig({ ...base, S3_SECRET_ACCESS_KEY: 'secret-value' })).toThrow(/^Setting S3_ACCESS_KEY_ID="" must be set/);
	});

	it('stop the start with one line naming a bad setting', () => {
		expect(() => parseConfig({ S3_ENDPOINT: 'http://127.0.0.1:9000' })).toThrow('Setting S3_BUCKET="" must be set when other S3_ settings are.');
		expect(() => parseConfig({ S3_BUCKET: 'Uppercase_Bucket' })).toThrow(/^Setting S3_BUCKET="Uppercase_Bucket" must be a bucket name/);
		expect(() => parseConfig({ S3_BUCKET: 'ab' })).toThrow(/must be a bucket name/);
		expect(() => parseConfig({ ...base, S3_ENDPOINT: 'ftp://host' })).toThrow(/^Setting S3_ENDPOINT="ftp:\/\/host" must be an http/);
		expect(() => parseConfig({ ...base, S3_ENDPOINT: 'http://host/?x=1' })).toThrow(/S3_ENDPOINT/);
		expect(() => parseConfig({ ...base, S3_FORCE_PATH_STYLE: 'yes' })).toThrow(/^Setting S3_FORCE_PATH_STYLE="yes" must be 0 or 1/);
	});
});
