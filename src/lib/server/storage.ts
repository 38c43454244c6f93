import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { config } from './config';

/**
 * Where uploaded and generated files live (evidence photos, certificate PDFs).
 *
 * Callers name objects by key ("evidence/ab12....jpg") and stream bytes in and out; they
 * never see a path. The filesystem store below keeps them under DATA_DIR/uploads/; an
 * S3-compatible store can implement the same interface (put = PutObject/Upload, get =
 * GetObject's body stream, delete = DeleteObject) with no change to callers.
 */
export interface FileStore {
	/**
	 * Stores `body` under `key`, replacing any object already there. Either the whole object is
	 * stored or nothing is (a failed stream leaves no partial file). Returns the stored size.
	 */
	put(key: string, body: Readable | AsyncIterable<Uint8Array> | Uint8Array, info?: { contentType?: string }): Promise<{ sizeBytes: number }>;
	/** The object's bytes as a stream, or null when there is no such key. */
	get(key: string): Promise<{ body: Readable; sizeBytes: number } | null>;
	/** Removes the object; removing a missing key is not an error. */
	delete(key: string): Promise<void>;
}

/** Keys are slash-separated lowercase words: no leading slash, no "..", no control characters. */
const keyPattern = /^[a-z0-9][a-z0-9_-]*(\/[a-z0-9][a-z0-9_.-]*)*$/;

export function assertValidKey(key: string): void {
	if (!keyPattern.test(key) || key.includes('..') || key.length > 200) throw new Error(`Invalid storage key "${key}"`);
}

/** A random key under `prefix`, e.g. randomKey('evidence', 'jpg') -> "evidence/3f9c...e1.jpg". */
export function randomKey(prefix: string, extension: string): string {
	const key = `${prefix}/${randomBytes(16).toString('hex')}.${extension}`;
	assertValidKey(key);
	return key;
}

export class FilesystemStore implements FileStore {
	constructor(readonly root: string) {}

	private pathOf(key: string): string {
		assertValidKey(key);
		return path.join(this.root, ...key.split('/'));
	}

	async put(key: string, body: Readable | AsyncIterable<Uint8Array> | Uint8Array): Promise<{ sizeBytes: number }> {
		const target = this.pathOf(key);
		await fs.promises.mkdir(path.dirname(target), { recursive: true });
		const temporary = `${target}.${randomBytes(6).toString('hex')}.part`;
		try {
			const source = body instanceof Uint8Array ? Readable.from([body]) : Readable.from(body);
			await pipeline(source, fs.createWriteStream(temporary, { flags: 'wx', mode: 0o640 }));
			await fs.promises.rename(temporary, target);
		} catch (err) {
			await fs.promises.rm(temporary, { force: true });
			throw err;
		}
		return { sizeBytes: (await fs.promises.stat(target)).size };
	}

	async get(key: string): Promise<{ body: Readable; sizeBytes: number } | null> {
		const file = this.pathOf(key);
		try {
			const handle = await fs.promises.open(file, 'r');
			const { size } = await handle.stat();
			return { body: handle.createReadStream(), sizeBytes: size };
		} catch (err) {
			if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
			throw err;
		}
	}

	async delete(key: string): Promise<void> {
		await fs.promises.rm(this.pathOf(key), { force: true });
	}
}

let instance: { root: string; store: FileStore } | undefined;

/** The app's file store: DATA_DIR/uploads/ (one instance per data folder). */
export function fileStore(): FileStore {
	const root = path.join(config.dataDir, 'uploads');
	if (!instance || instance.root !== root) instance = { root, store: new FilesystemStore(root) };
	return instance.store;
}

/** Reads a whole object into memory; for small objects only (thumbnails, PDFs under a few MB). */
export async function readObject(store: FileStore, key: string): Promise<Buffer | null> {
	const object = await store.get(key);
	if (!object) return null;
	const chunks: Buffer[] = [];
	for await (const chunk of object.body) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks);
}
