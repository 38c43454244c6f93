import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, HeadObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { config, type S3Settings } from './config';

/**
 * Where uploaded and generated files live (evidence photos and PDFs, issued certificate PDFs).
 *
 * Callers name objects by key ("evidence/ab12....jpg") and stream bytes in and out; they never
 * see a path or a bucket. Two stores keep the same contract (tests/unit/storage.test.ts runs one
 * suite against both): the filesystem under DATA_DIR/uploads/ (the default) and any
 * S3-compatible object store (chosen by the S3_* settings).
 *
 * Errors: a key that breaks the key rules throws InvalidStorageKeyError before anything is
 * touched; a missing object is `null` / `false`, never an error; a store that cannot be reached
 * or refuses (permissions, missing bucket, network) throws StorageUnavailableError; an error
 * raised by the caller's own body stream while putting is rethrown as it is.
 */
export interface FileStore {
	/** "filesystem" or "s3", for start-up messages and tests. */
	readonly kind: 'filesystem' | 's3';
	/**
	 * Stores `body` under `key`, replacing any object already there. Either the whole object is
	 * stored or nothing is (a failed stream leaves no partial object). Returns the stored size.
	 * The content type defaults to the one the key's extension names (see contentTypeOf).
	 */
	put(key: string, body: PutBody, info?: { contentType?: string }): Promise<{ sizeBytes: number }>;
	/** The object's bytes as a stream, with its size and type, or null when there is no such key. */
	get(key: string): Promise<StoredObject | null>;
	exists(key: string): Promise<boolean>;
	/** Removes the object; removing a missing key is not an error. */
	delete(key: string): Promise<void>;
}

export type PutBody = Readable | AsyncIterable<Uint8Array> | Uint8Array;

export interface StoredObject {
	body: Readable;
	sizeBytes: number;
	contentType: string;
}

export class InvalidStorageKeyError extends Error {}

/** The store could not be reached or refused the request; nothing about the object is known. */
export class StorageUnavailableError extends Error {
	/** What a reader is told (the error's own message names the key and the cause, for the log). */
	static readonly readerMessage = 'Stored files cannot be reached just now. Nothing was changed; try again in a moment.';
}

/** Keys are slash-separated lowercase words: no leading slash, no "..", no control characters. */
const keyPattern = /^[a-z0-9][a-z0-9_-]*(\/[a-z0-9][a-z0-9_.-]*)*$/;

export function assertValidKey(key: string): void {
	if (typeof key !== 'string' || !keyPattern.test(key) || key.includes('..') || key.length > 200) {
		throw new InvalidStorageKeyError(`Invalid storage key "${String(key).slice(0, 80)}"`);
	}
}

/** A random key under `prefix`, e.g. randomKey('evidence', 'jpg') -> "evidence/3f9c...e1.jpg". */
export function randomKey(prefix: string, extension: string): string {
	const key = `${prefix}/${randomBytes(16).toString('hex')}.${extension}`;
	assertValidKey(key);
	return key;
}

const typesByExtension: Record<string, string> = {
	jpg: 'image/jpeg',
	jpeg: 'image/jpeg',
	png: 'image/png',
	webp: 'image/webp',
	pdf: 'application/pdf',
	json: 'application/json',
	txt: 'text/plain; charset=utf-8'
};

/** The media type a key's extension names; application/octet-stream for any other. */
export function contentTypeOf(key: string): string {
	const ext = key.slice(key.lastIndexOf('.') + 1);
	return Object.hasOwn(typesByExtension, ext) ? typesByExtension[ext] : 'application/octet-stream';
}

/**
 * Passes the caller's body through, counting bytes and remembering an error that the body
 * itself raised, so `put` can tell the caller's failure from the store's.
 */
function measured(body: PutBody) {
	const state: { sizeBytes: number; sourceError: unknown } = { sizeBytes: 0, sourceError: undefined };
	async function* pass(source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>) {
		try {
			for await (const chunk of source) {
				state.sizeBytes += chunk.length;
				yield chunk;
			}
		} catch (err) {
			state.sourceError = err;
			throw err;
		}
	}
	const stream = Readable.from(pass(body instanceof Uint8Array ? [body] : body), { objectMode: false });
	return { stream, state };
}

export class FilesystemStore implements FileStore {
	readonly kind = 'filesystem';

	constructor(readonly root: string) {}

	private pathOf(key: string): string {
		assertValidKey(key);
		return path.join(this.root, ...key.split('/'));
	}

	async put(key: string, body: PutBody): Promise<{ sizeBytes: number }> {
		const target = this.pathOf(key);
		const temporary = `${target}.${randomBytes(6).toString('hex')}.part`;
		const { stream, state } = measured(body);
		try {
			await fs.promises.mkdir(path.dirname(target), { recursive: true });
			await pipeline(stream, fs.createWriteStream(temporary, { flags: 'wx', mode: 0o640 }));
			await fs.promises.rename(temporary, target);
		} catch (err) {
			await fs.promises.rm(temporary, { force: true }).catch(() => {});
			if (state.sourceError !== undefined) throw state.sourceError;
			throw unavailable('store', key, err);
		}
		return { sizeBytes: state.sizeBytes };
	}

	async get(key: string): Promise<StoredObject | null> {
		const file = this.pathOf(key);
		let handle: fs.promises.FileHandle;
		try {
			handle = await fs.promises.open(file, 'r');
		} catch (err) {
			if (isMissingFile(err)) return null;
			throw unavailable('read', key, err);
		}
		try {
			const { size } = await handle.stat();
			return { body: handle.createReadStream(), sizeBytes: size, contentType: contentTypeOf(key) };
		} catch (err) {
			await handle.close();
			throw unavailable('read', key, err);
		}
	}

	async exists(key: string): Promise<boolean> {
		try {
			return (await fs.promises.stat(this.pathOf(key))).isFile();
		} catch (err) {
			if (isMissingFile(err)) return false;
			throw unavailable('check', key, err);
		}
	}

	async delete(key: string): Promise<void> {
		try {
			await fs.promises.rm(this.pathOf(key), { force: true });
		} catch (err) {
			throw unavailable('delete', key, err);
		}
	}
}

function isMissingFile(err: unknown): boolean {
	const code = (err as NodeJS.ErrnoException).code;
	return code === 'ENOENT' || code === 'ENOTDIR';
}

function unavailable(verb: string, key: string, cause: unknown): StorageUnavailableError | InvalidStorageKeyError {
	if (cause instanceof InvalidStorageKeyError) return cause;
	const reason = cause instanceof S3ServiceException ? cause.name : ((cause as NodeJS.ErrnoException)?.code ?? (cause as Error)?.message ?? 'error');
	return new StorageUnavailableError(`Could not ${verb} stored file ${key} (${reason}).`, { cause });
}

/**
 * Any S3-compatible object store through the AWS SDK. Checksums are computed only where the
 * API requires them ("WHEN_REQUIRED"): some S3-compatible services do not
 * understand the SDK's default CRC32 trailers, and the app records its own SHA-256 of every
 * certificate and evidence file.
 */
export class S3Store implements FileStore {
	readonly kind = 's3';
	readonly client: S3Client;

	constructor(readonly settings: S3Settings) {
		this.client = new S3Client({
			region: settings.region,
			endpoint: settings.endpoint ?? undefined,
			forcePathStyle: settings.forcePathStyle,
			credentials: settings.credentials ?? undefined,
			requestChecksumCalculation: 'WHEN_REQUIRED',
			responseChecksumValidation: 'WHEN_REQUIRED',
			maxAttempts: 3
		});
	}

	private get bucket() {
		return this.settings.bucket;
	}

	async put(key: string, body: PutBody, info: { contentType?: string } = {}): Promise<{ sizeBytes: number }> {
		assertValidKey(key);
		const { stream, state } = measured(body);
		const upload = new Upload({
			client: this.client,
			params: { Bucket: this.bucket, Key: key, Body: body instanceof Uint8Array ? body : stream, ContentType: info.contentType ?? contentTypeOf(key) },
			queueSize: 2
		});
		try {
			await upload.done();
		} catch (err) {
			if (state.sourceError !== undefined) throw state.sourceError;
			throw unavailable('store', key, err);
		}
		return { sizeBytes: body instanceof Uint8Array ? body.byteLength : state.sizeBytes };
	}

	async get(key: string): Promise<StoredObject | null> {
		assertValidKey(key);
		try {
			const object = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
			if (!(object.Body instanceof Readable) || !Number.isSafeInteger(object.ContentLength)) {
				(object.Body as Readable | undefined)?.destroy?.();
				throw new Error('the service answered without a body stream and its length');
			}
			return { body: object.Body, sizeBytes: object.ContentLength!, contentType: object.ContentType || contentTypeOf(key) };
		} catch (err) {
			if (isMissingObject(err)) return null;
			throw unavailable('read', key, err);
		}
	}

	async exists(key: string): Promise<boolean> {
		assertValidKey(key);
		try {
			await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
			return true;
		} catch (err) {
			if (!isMissingObject(err)) throw unavailable('check', key, err);
		}
		// HEAD answers a bare 404 for a missing bucket too: ask about the bucket before saying "no such object"
		try {
			await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
		} catch (err) {
			throw unavailable('check', key, err);
		}
		return false;
	}

	async delete(key: string): Promise<void> {
		assertValidKey(key);
		try {
			await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
		} catch (err) {
			if (isMissingObject(err)) return;
			throw unavailable('delete', key, err);
		}
	}

	/** Throws StorageUnavailableError with one line when the bucket cannot be reached with these settings. */
	async checkReachable(): Promise<void> {
		try {
			await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
		} catch (err) {
			const reason = err instanceof S3ServiceException ? `${err.name}, HTTP ${err.$metadata.httpStatusCode ?? '?'}` : ((err as NodeJS.ErrnoException).code ?? (err as Error).message);
			throw new StorageUnavailableError(`The S3 bucket "${this.bucket}" cannot be reached at ${this.settings.endpoint ?? `region ${this.settings.region}`} (${reason}): check the S3_* settings.`, { cause: err });
		}
	}
}

/** GetObject answers NoSuchKey; HeadObject (no body) answers a bare 404 named NotFound. */
function isMissingObject(err: unknown): boolean {
	if (!(err instanceof S3ServiceException)) return false;
	return err.name === 'NoSuchKey' || err.name === 'NotFound' || (err.$metadata.httpStatusCode === 404 && err.name !== 'NoSuchBucket');
}

let instance: { id: string; store: FileStore } | undefined;

/** The app's file store: S3 when S3_BUCKET is set, else DATA_DIR/uploads/ (one instance per setting). */
export function fileStore(): FileStore {
	const s3 = config.s3;
	const id = s3 ? `s3:${JSON.stringify(s3)}` : `fs:${path.join(config.dataDir, 'uploads')}`;
	if (!instance || instance.id !== id) {
		instance = { id, store: s3 ? new S3Store(s3) : new FilesystemStore(path.join(config.dataDir, 'uploads')) };
	}
	return instance.store;
}

/** At start: an S3 bucket that cannot be reached stops the server with one line (the filesystem is checked with DATA_DIR). */
export async function checkFileStore(store: FileStore = fileStore()): Promise<void> {
	if (store instanceof S3Store) await store.checkReachable();
}

/** Reads a whole object into memory; for small objects only (thumbnails, PDFs under a few MB). */
export async function readObject(store: FileStore, key: string): Promise<Buffer | null> {
	const object = await store.get(key);
	if (!object) return null;
	const chunks: Buffer[] = [];
	for await (const chunk of object.body) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks);
}
