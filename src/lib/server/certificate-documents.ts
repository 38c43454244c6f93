import { createHash } from 'node:crypto';
import { Readable, Transform } from 'node:stream';
import { buffer } from 'node:stream/consumers';
import { PDFDocument } from 'pdf-lib';
import { parseNumber } from '$lib/certificates/number';
import { config } from './config';
import { verifyUrl } from './credential';
import { db as defaultDb, type DB } from './db';
import type { CertificateTable } from './db/schema';
import { renderCertificatePdf, type DocumentFormat } from './pdf/certificate';
import { fileStore, type FileStore } from './storage';

/**
 * The issued PDFs. Each format is rendered once, stored, and its SHA-256 recorded; later
 * downloads serve the stored bytes, so an uploaded file can be recognised by its hash.
 */

export function sha256Hex(bytes: Uint8Array): string {
	return createHash('sha256').update(bytes).digest('hex');
}

export function documentOf(row: CertificateTable, origin = config.origin) {
	return {
		number: row.number,
		holderName: row.holder_name,
		courseCode: row.course_code,
		courseTitle: row.course_title,
		scope: row.scope,
		diameterMinMm: row.diameter_min_mm,
		diameterMaxMm: row.diameter_max_mm,
		testOn: row.test_on,
		practicalOn: row.practical_on,
		issuedOn: row.issued_on,
		expiresOn: row.expires_on,
		trainers: (JSON.parse(row.trainers) as { name: string }[]).map((t) => t.name),
		issuerName: row.issuer_name,
		verifyUrl: verifyUrl(row.number, origin),
		checkUrl: `${origin.replace(/^https?:\/\//, '')}/verify`,
		credentialJwt: row.credential_jwt,
		issuedAt: row.issued_at
	};
}

/** The issued PDF of a certificate is recorded but its stored object is gone (a 404 for the reader, an alarm for the operator). */
export class IssuedFileMissingError extends Error {}

export interface IssuedDocumentStream {
	/** The stored bytes; the stream fails at its end if they do not hash to the recorded SHA-256. */
	body: Readable;
	sizeBytes: number;
	sha256: string;
}

/**
 * The issued file for one format, rendered and recorded on first request, as a stream. A stored
 * file whose size differs from the record is refused before any byte is sent; one whose bytes
 * hash differently fails at the end of the stream, so a download is never silently wrong.
 */
export async function openIssuedDocument(
	row: CertificateTable,
	format: DocumentFormat,
	{ db = defaultDb, store = fileStore() }: { db?: DB; store?: FileStore } = {}
): Promise<IssuedDocumentStream> {
	const recorded = await db
		.selectFrom('certificate_file')
		.select(['sha256', 'size_bytes', 'storage_key'])
		.where('certificate_id', '=', row.id)
		.where('format', '=', format)
		.executeTakeFirst();
	if (recorded) {
		const object = await store.get(recorded.storage_key);
		if (!object) throw new IssuedFileMissingError(`Stored certificate file ${recorded.storage_key} is missing`);
		if (object.sizeBytes !== recorded.size_bytes) {
			object.body.destroy();
			throw new Error(`Stored certificate file ${recorded.storage_key} has ${object.sizeBytes} bytes, ${recorded.size_bytes} were recorded`);
		}
		return { body: verifiedStream(object.body, recorded.sha256, recorded.storage_key), sizeBytes: recorded.size_bytes, sha256: recorded.sha256 };
	}
	const bytes = await renderCertificatePdf(documentOf(row), format);
	const sha256 = sha256Hex(bytes);
	const key = `certificates/${row.id}/${format}-${sha256.slice(0, 16)}.pdf`;
	await store.put(key, bytes, { contentType: 'application/pdf' });
	const inserted = await db
		.insertInto('certificate_file')
		.values({ certificate_id: row.id, format, sha256, size_bytes: bytes.length, storage_key: key, created_at: new Date().toISOString() })
		.onConflict((oc) => oc.columns(['certificate_id', 'format']).doNothing())
		.executeTakeFirst();
	if (Number(inserted.numInsertedOrUpdatedRows ?? 0) === 0) {
		// two first downloads at once: the other one's file is the issued one
		await store.delete(key);
		return openIssuedDocument(row, format, { db, store });
	}
	return { body: Readable.from([Buffer.from(bytes)]), sizeBytes: bytes.length, sha256 };
}

/** The issued file for one format as bytes (small files; downloads use openIssuedDocument). */
export async function issuedDocument(
	row: CertificateTable,
	format: DocumentFormat,
	options: { db?: DB; store?: FileStore } = {}
): Promise<{ bytes: Uint8Array; sha256: string }> {
	const { body, sha256 } = await openIssuedDocument(row, format, options);
	return { bytes: new Uint8Array(await buffer(body)), sha256 };
}

/**
 * Passes the stored bytes on, holding back the last chunk until the whole file hashed to the
 * recorded value: a file that does not match never reaches its full length at the reader.
 */
function verifiedStream(source: Readable, sha256: string, key: string): Readable {
	const hash = createHash('sha256');
	let held: Buffer | null = null;
	const check = new Transform({
		transform(chunk: Buffer, _encoding, done) {
			hash.update(chunk);
			const previous = held;
			held = chunk;
			done(null, previous ?? undefined);
		},
		flush(done) {
			if (hash.digest('hex') !== sha256) return done(new Error(`Stored certificate file ${key} does not match its recorded SHA-256`));
			done(null, held ?? undefined);
		}
	});
	source.on('error', (err) => check.destroy(err));
	return source.pipe(check);
}

export type UploadCheck =
	| { genuine: true; number: string; format: string }
	| { genuine: false; claimedNumber: string | null };

/**
 * Recognises an uploaded certificate PDF by its SHA-256. Any other file (one byte changed, a
 * name edited) is "not the one we issued"; the number it claims is read from its title or
 * text so the page can still show that number's real status.
 */
export async function checkUploadedPdf(bytes: Uint8Array, db: DB = defaultDb): Promise<UploadCheck> {
	const match = await db.selectFrom('certificate_file').innerJoin('certificate', 'certificate.id', 'certificate_file.certificate_id').select(['certificate.number', 'certificate_file.format']).where('certificate_file.sha256', '=', sha256Hex(bytes)).executeTakeFirst();
	if (match) return { genuine: true, number: match.number, format: match.format };
	return { genuine: false, claimedNumber: await claimedNumber(bytes) };
}

const numberPattern = /[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}/;

async function claimedNumber(bytes: Uint8Array): Promise<string | null> {
	const candidates: string[] = [];
	try {
		const doc = await PDFDocument.load(bytes, { updateMetadata: false, throwOnInvalidObject: false });
		candidates.push(doc.getTitle() ?? '', doc.getSubject() ?? '');
	} catch {
		// unreadable structure: fall back to the raw bytes
	}
	candidates.push(Buffer.from(bytes.subarray(0, 2_000_000)).toString('latin1'));
	for (const text of candidates) {
		const found = text.match(numberPattern)?.[0];
		if (found) {
			const parsed = parseNumber(found);
			if (parsed.ok) return parsed.formatted;
		}
	}
	return null;
}
