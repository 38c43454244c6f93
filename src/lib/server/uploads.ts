import busboy from 'busboy';
import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { fileTypeFromFile } from 'file-type';
import sharp, { type OutputInfo } from 'sharp';
import { config } from './config';
import { randomKey, type FileStore } from './storage';

/**
 * Evidence uploads: a multipart body is streamed to temporary files with the size caps enforced
 * while reading, each file's type is sniffed from its bytes (file-type), images are decoded and
 * re-encoded by sharp (auto-rotated, every metadata block dropped, long side capped, plus a
 * thumbnail), and only then written to the file store under random keys.
 */
export const uploadLimits = {
	maxFileBytes: 12 * 1024 * 1024,
	maxFiles: 8,
	maxLongSidePx: 2560,
	thumbnailPx: 320,
	/** Whole body: every file at its cap plus room for the text fields. */
	get maxBodyBytes() {
		return this.maxFiles * this.maxFileBytes + 1024 * 1024;
	}
};

const accepted = {
	'image/jpeg': { ext: 'jpg', image: true },
	'image/png': { ext: 'png', image: true },
	'image/webp': { ext: 'webp', image: true },
	'application/pdf': { ext: 'pdf', image: false }
} as const;
export type AcceptedType = keyof typeof accepted;
export const acceptedTypesText = 'JPEG, PNG, WebP or PDF';

export class UploadError extends Error {
	constructor(
		readonly status: 400 | 413 | 415,
		message: string
	) {
		super(message);
	}
}

export interface StagedFile {
	originalName: string;
	tempPath: string;
	sizeBytes: number;
	tooLarge: boolean;
}

export interface MultipartBody {
	fields: Record<string, string>;
	files: StagedFile[];
	/** Removes the temporary files; call in `finally`. */
	discard(): Promise<void>;
}

function tempDir(): string {
	const dir = path.join(config.dataDir, 'tmp');
	fs.mkdirSync(dir, { recursive: true });
	return dir;
}

/** Why a file name is refused, or null. Browsers send a bare name; anything else is tampering. */
export function badFileName(name: string): string | null {
	// eslint-disable-next-line no-control-regex
	if (/[\u0000-\u001f\u007f-\u009f]/.test(name)) return 'its name contains control characters';
	if (/[\\/]/.test(name) || name === '.' || name === '..') return 'its name contains a folder path';
	if (name.length > 200) return 'its name is longer than 200 characters';
	return null;
}

/**
 * Streams a multipart/form-data body: text fields into memory (small caps), files to
 * temporary files, stopping each file at the size cap (the rest of it is read and thrown
 * away, so the browser still gets an answer). Only the first value of each field is kept.
 */
export async function readMultipart(request: Request, fileField: string): Promise<MultipartBody> {
	const contentType = request.headers.get('content-type') ?? '';
	if (!contentType.toLowerCase().startsWith('multipart/form-data')) {
		throw new UploadError(415, 'Send the evidence as multipart/form-data.');
	}
	if (!request.body) throw new UploadError(400, 'The form arrived empty.');
	const declared = Number(request.headers.get('content-length') ?? 0);
	if (declared > uploadLimits.maxBodyBytes) {
		throw new UploadError(413, `The upload is too large: at most ${uploadLimits.maxFiles} files of ${mb(uploadLimits.maxFileBytes)} each.`);
	}

	const files: StagedFile[] = [];
	const fields: Record<string, string> = Object.create(null);
	const discard = async () => {
		await Promise.all(files.map((f) => fs.promises.rm(f.tempPath, { force: true })));
	};
	const dir = tempDir();
	let parser: busboy.Busboy;
	try {
		parser = busboy({
			headers: { 'content-type': contentType },
			defParamCharset: 'utf8',
			// Keep the name as sent, so a name with a folder path is refused rather than trimmed.
			preservePath: true,
			limits: { fileSize: uploadLimits.maxFileBytes, files: uploadLimits.maxFiles + 1, fields: 100, fieldSize: 8 * 1024, parts: 120 }
		});
	} catch {
		throw new UploadError(400, 'The form could not be read.');
	}

	const writes: Promise<void>[] = [];
	let tooManyFiles = false;
	let malformed = false;
	const done = new Promise<void>((resolve, reject) => {
		parser.on('field', (name, value) => {
			if (!(name in fields)) fields[name] = value;
		});
		parser.on('file', (name, stream, info) => {
			if (name !== fileField) {
				stream.resume();
				return;
			}
			const staged: StagedFile = {
				originalName: info.filename ?? '',
				tempPath: path.join(dir, `${randomBytes(12).toString('hex')}.upload`),
				sizeBytes: 0,
				tooLarge: false
			};
			files.push(staged);
			stream.on('data', (chunk: Buffer) => (staged.sizeBytes += chunk.length));
			stream.on('limit', () => (staged.tooLarge = true));
			writes.push(pipeline(stream, fs.createWriteStream(staged.tempPath, { mode: 0o600 })));
		});
		parser.on('filesLimit', () => (tooManyFiles = true));
		parser.on('close', resolve);
		parser.on('error', (err) => {
			malformed = true;
			reject(err);
		});
	});

	try {
		let received = 0;
		const source = Readable.fromWeb(request.body as import('node:stream/web').ReadableStream<Uint8Array>);
		source.on('data', (chunk: Buffer) => {
			received += chunk.length;
			if (received > uploadLimits.maxBodyBytes) source.destroy(new UploadError(413, `The upload is too large: at most ${uploadLimits.maxFiles} files of ${mb(uploadLimits.maxFileBytes)} each.`));
		});
		await Promise.all([pipeline(source, parser), done]);
		await Promise.all(writes);
	} catch (err) {
		await Promise.allSettled(writes);
		await discard();
		if (err instanceof UploadError) throw err;
		if (malformed) throw new UploadError(400, 'The form could not be read: a part of it is malformed, for example a file name with control characters. Rename the file and try again.');
		throw new UploadError(400, 'The upload was cut off or could not be read. Please try again.');
	}

	// Empty file inputs (nothing chosen) arrive as a part with no name and no bytes.
	const chosen = files.filter((f) => f.originalName !== '' || f.sizeBytes > 0);
	for (const f of files.filter((f) => !chosen.includes(f))) await fs.promises.rm(f.tempPath, { force: true });
	files.splice(0, files.length, ...chosen);
	if (tooManyFiles || files.length > uploadLimits.maxFiles) {
		const extra = files[uploadLimits.maxFiles]?.originalName;
		await discard();
		throw new UploadError(413, `${extra ? `${extra}: ` : ''}at most ${uploadLimits.maxFiles} files per submission. Send the rest with another submission.`);
	}
	return { fields, files, discard };
}

const mb = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

export interface ProcessedFile {
	originalName: string;
	mediaType: AcceptedType;
	storageKey: string;
	thumbnailKey: string | null;
	sizeBytes: number;
	sha256: string;
	widthPx: number | null;
	heightPx: number | null;
}

/** Checks every staged file before any is stored, so one bad file refuses the whole submission. */
export async function checkStagedFiles(files: StagedFile[]): Promise<Map<StagedFile, AcceptedType>> {
	const types = new Map<StagedFile, AcceptedType>();
	for (const file of files) {
		const label = file.originalName || 'A file';
		const nameProblem = badFileName(file.originalName);
		if (nameProblem) throw new UploadError(400, `The file was refused: ${nameProblem}. Rename it and try again.`);
		if (file.tooLarge) throw new UploadError(413, `${label} is larger than ${mb(uploadLimits.maxFileBytes)}, the limit for one file.`);
		if (file.sizeBytes === 0) throw new UploadError(400, `${label} is empty (0 bytes).`);
		const sniffed = await fileTypeFromFile(file.tempPath);
		if (!sniffed || !Object.hasOwn(accepted, sniffed.mime)) {
			throw new UploadError(415, `${label} is not a ${acceptedTypesText} file. Only photos and PDF documents are accepted.`);
		}
		types.set(file, sniffed.mime as AcceptedType);
	}
	return types;
}

/**
 * Re-encodes (images) or copies (PDF) each checked file into the store. Images are decoded in
 * full, so a truncated or disguised file fails here. On any failure every object already
 * written is removed again and an UploadError names the file.
 */
export async function storeCheckedFiles(types: Map<StagedFile, AcceptedType>, store: FileStore): Promise<ProcessedFile[]> {
	const stored: ProcessedFile[] = [];
	try {
		for (const [file, mediaType] of types) {
			stored.push(accepted[mediaType].image ? await storeImage(file, mediaType, store) : await storePdf(file, store));
		}
	} catch (err) {
		await removeStored(stored, store);
		throw err;
	}
	return stored;
}

export async function removeStored(files: ProcessedFile[], store: FileStore): Promise<void> {
	await removeKeys(files.flatMap((f) => (f.thumbnailKey ? [f.storageKey, f.thumbnailKey] : [f.storageKey])), store);
}

/** Best effort: a store that cannot delete now leaves orphans (logged), not a second error over the first. */
async function removeKeys(keys: string[], store: FileStore): Promise<void> {
	for (const key of keys) {
		await store.delete(key).catch((err) => console.error(`Could not remove stored file ${key} after a refused upload:`, err instanceof Error ? err.message : err));
	}
}

async function storeImage(file: StagedFile, mediaType: AcceptedType, store: FileStore): Promise<ProcessedFile> {
	const ext = accepted[mediaType].ext;
	let main: { data: Buffer; info: OutputInfo };
	let thumb: Buffer;
	try {
		// failOn 'warning' (the default, stated for the record): a truncated or damaged image is refused.
		const source = sharp(file.tempPath, { failOn: 'warning', limitInputPixels: 100_000_000, autoOrient: true });
		const resized = source.clone().resize({ width: uploadLimits.maxLongSidePx, height: uploadLimits.maxLongSidePx, fit: 'inside', withoutEnlargement: true });
		const encoded = mediaType === 'image/png' ? resized.png() : mediaType === 'image/webp' ? resized.webp({ quality: 85 }) : resized.jpeg({ quality: 85, mozjpeg: true });
		main = await encoded.toBuffer({ resolveWithObject: true });
		thumb = await source
			.clone()
			.resize({ width: uploadLimits.thumbnailPx, height: uploadLimits.thumbnailPx, fit: 'inside', withoutEnlargement: true })
			.jpeg({ quality: 75 })
			.toBuffer();
	} catch {
		throw new UploadError(400, `${file.originalName || 'A photo'} could not be read as a whole image (damaged, cut short or not really a ${ext.toUpperCase()}).`);
	}
	const storageKey = randomKey('evidence', ext);
	const thumbnailKey = randomKey('evidence', 'thumb.jpg');
	await store.put(storageKey, main.data, { contentType: mediaType });
	try {
		await store.put(thumbnailKey, thumb, { contentType: 'image/jpeg' });
	} catch (err) {
		await removeKeys([storageKey], store);
		throw err;
	}
	return {
		originalName: file.originalName,
		mediaType,
		storageKey,
		thumbnailKey,
		sizeBytes: main.data.length,
		sha256: createHash('sha256').update(main.data).digest('hex'),
		widthPx: main.info.width,
		heightPx: main.info.height
	};
}

async function storePdf(file: StagedFile, store: FileStore): Promise<ProcessedFile> {
	const hash = createHash('sha256');
	await pipeline(fs.createReadStream(file.tempPath), hash);
	const storageKey = randomKey('evidence', 'pdf');
	const { sizeBytes } = await store.put(storageKey, fs.createReadStream(file.tempPath), { contentType: 'application/pdf' });
	return { originalName: file.originalName, mediaType: 'application/pdf', storageKey, thumbnailKey: null, sizeBytes, sha256: hash.digest('hex'), widthPx: null, heightPx: null };
}
