import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { FilesystemStore, randomKey, readObject } from '$lib/server/storage';

let root: string;
let store: FilesystemStore;
beforeEach(() => {
	root = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-store-'));
	store = new FilesystemStore(root);
});
afterEach(() => fs.rmSync(root, { recursive: true, force: true }));

describe('filesystem file store', () => {
	it('puts, gets and deletes by key, streaming in and out', async () => {
		const key = randomKey('evidence', 'jpg');
		const { sizeBytes } = await store.put(key, Readable.from([Buffer.from('abc'), Buffer.from('def')]));
		expect(sizeBytes).toBe(6);
		expect((await readObject(store, key))?.toString()).toBe('abcdef');
		await store.delete(key);
		expect(await store.get(key)).toBeNull();
		await store.delete(key);
	});

	it('leaves no file behind when the stream fails', async () => {
		async function* failing() {
			yield Buffer.from('partial');
			throw new Error('connection reset');
		}
		await expect(store.put('evidence/broken.jpg', failing())).rejects.toThrow('connection reset');
		expect(fs.readdirSync(path.join(root, 'evidence'))).toEqual([]);
	});

	it('refuses keys that could leave its folder', async () => {
		for (const key of ['../x', '/etc/passwd', 'a/../../b', 'A/b', 'a\u0000b', 'a//b', '']) {
			await expect(store.put(key, Buffer.from('x'))).rejects.toThrow('Invalid storage key');
		}
	});
});
