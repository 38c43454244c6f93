import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { createLocalJWKSet, decodeJwt, exportJWK, generateKeyPair, jwtVerify, SignJWT, UnsecuredJWT } from 'jose';
import jsQR from 'jsqr';
import sharp from 'sharp';
import { extractText, getDocumentProxy } from 'unpdf';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { issueIfEarned, type CertificateRow } from '$lib/server/certificates';
import { checkUploadedPdf, IssuedFileMissingError, issuedDocument, openIssuedDocument } from '$lib/server/certificate-documents';
import { FilesystemStore, readObject, S3Store, type FileStore } from '$lib/server/storage';
import { parseConfig, reloadConfig } from '$lib/server/config';
import { startS3Fake } from '../../fakes/s3';
import { issuerId, publishedJwks, verifyCredentialJwt } from '$lib/server/credential';
import { recordPassedTest, recordSignOffs } from '$lib/server/demo-certificates';
import { createTestDb } from '../helpers/db';
import { makeTraineeAndTrainer, useTemporaryDataDir } from '../helpers/certificates';

const day = (iso: string) => new Date(`${iso}T10:00:00Z`);

describe('certificate documents and the credential', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let dataDir: string;
	let cert: CertificateRow;
	let a4: Uint8Array;

	beforeAll(async () => {
		process.env.ORIGIN = 'http://verify.example.test';
		dataDir = useTemporaryDataDir();
		db = await createTestDb();
		const { trainee, trainer } = await makeTraineeAndTrainer(db, 'point-repair-installer', 'Zoë Łukasiewicz');
		await recordPassedTest(trainee.id, 'point-repair-installer', day('2026-09-01'), db);
		await recordSignOffs(trainee.id, 'point-repair-installer', trainer, day('2026-09-03'), db);
		const outcome = await issueIfEarned(trainee.id, 'point-repair-installer', { db, now: new Date() });
		if (!outcome.issued) throw new Error('not issued');
		cert = outcome.certificate;
		a4 = (await issuedDocument(cert, 'a4', { db })).bytes;
	});
	afterAll(async () => {
		delete process.env.ORIGIN;
		reloadConfig();
		await db.destroy();
	});

	const write = (name: string, bytes: Uint8Array) => {
		const file = path.join(dataDir, name);
		fs.writeFileSync(file, bytes);
		return file;
	};

	it('has extractable text with number, holder, course and expiry in every format, under 60 KB', async () => {
		for (const format of ['a4', 'letter', 'card'] as const) {
			const { bytes } = await issuedDocument(cert, format, { db });
			expect(bytes.length).toBeLessThan(60 * 1024);
			// unpdf (pdf.js) reads the text back
			const { text } = await extractText(await getDocumentProxy(new Uint8Array(bytes)), { mergePages: true });
			const flat = text.replace(/\s+/g, ' ');
			expect(flat).toContain(cert.number);
			expect(flat).toContain('Zoë Łukasiewicz');
			expect(flat).toContain(cert.course_title);
			const [y, m, d] = cert.expires_on.split('-').map(Number);
			const months = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
			expect(flat).toContain(`${d} ${months[m - 1]} ${y}`);
		}
		// poppler agrees, and sees A4 as 595 x 842 pt (ISO 216: 210 x 297 mm)
		const file = write('a4.pdf', a4);
		expect(execFileSync('pdftotext', [file, '-']).toString()).toContain(cert.number);
		expect(execFileSync('pdfinfo', [file]).toString()).toMatch(/Page size:\s+595\.\d+ x 841\.\d+ pts \(A4\)/);
	});

	it('serves the same stored bytes again and records their SHA-256', async () => {
		const again = await issuedDocument(cert, 'a4', { db });
		expect(Buffer.compare(Buffer.from(again.bytes), Buffer.from(a4))).toBe(0);
		const row = await db.selectFrom('certificate_file').select('sha256').where('certificate_id', '=', cert.id).where('format', '=', 'a4').executeTakeFirstOrThrow();
		expect(row.sha256).toBe(execFileSync('sha256sum', [write('hash.pdf', a4)]).toString().split(' ')[0]);
	});

	it('carries a QR code that decodes to the verification URL (pdftoppm render, jsQR decode)', async () => {
		for (const format of ['a4', 'card'] as const) {
			const { bytes } = await issuedDocument(cert, format, { db });
			const file = write(`${format}.pdf`, bytes);
			execFileSync('pdftoppm', ['-r', format === 'card' ? '300' : '110', '-png', '-singlefile', file, path.join(dataDir, `${format}-page`)]);
			const { data, info } = await sharp(path.join(dataDir, `${format}-page.png`)).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
			const code = jsQR(new Uint8ClampedArray(data.buffer, data.byteOffset, data.length), info.width, info.height);
			expect(code?.data).toBe(`http://verify.example.test/verify/${cert.number}`);
		}
	});

	it('embeds the credential, which verifies with jose against the published JWKS and has the OB 3.0 required fields', async () => {
		const out = path.join(dataDir, 'detached');
		fs.mkdirSync(out, { recursive: true });
		execFileSync('pdfdetach', ['-saveall', '-o', out, write('attach.pdf', a4)]);
		const jwt = fs.readFileSync(path.join(out, `certificate-${cert.number}.jwt`), 'utf8');
		expect(jwt).toBe(cert.credential_jwt);
		const jwks = await publishedJwks();
		expect(jwks.keys[0]).toMatchObject({ kty: 'OKP', crv: 'Ed25519', alg: 'EdDSA' });
		expect(jwks.keys[0]).not.toHaveProperty('d');
		const { payload, protectedHeader } = await jwtVerify(jwt, createLocalJWKSet(jwks), { algorithms: ['EdDSA'] });
		// OB 3.0 §8.2.4.1 JOSE header: alg, typ "JWT", kid dereferencing to the issuer's JWK
		expect(protectedHeader).toMatchObject({ alg: 'EdDSA', typ: 'JWT' });
		expect(jwks.keys.map((k) => k.kid)).toContain(protectedHeader.kid);
		// OB 3.0 §8.2.4.2 JWT payload: the credential itself plus iss, jti, nbf, exp
		expect(payload.iss).toBe(issuerId());
		expect(payload.jti).toBe(payload.id);
		expect(payload.nbf).toBe(Math.floor(Date.parse(payload.validFrom as string) / 1000));
		expect(payload.exp).toBe(Math.floor(Date.parse(payload.validUntil as string) / 1000));
		// OB 3.0 Appendix B.1.1 OpenBadgeCredential: @context (VC 2.0 first, then OB v3p0), id,
		// type incl. VerifiableCredential + OpenBadgeCredential, issuer (Profile with id, type),
		// validFrom, name, credentialSubject (AchievementSubject with achievement: id, type,
		// name, description, criteria)
		const c = payload as any;
		expect(c['@context'][0]).toBe('https://www.w3.org/ns/credentials/v2');
		expect(c['@context'][1]).toMatch(/^https:\/\/purl\.imsglobal\.org\/spec\/ob\/v3p0\/context-3\.0\.\d\.json$/);
		expect(c.id).toBe(`http://verify.example.test/verify/${cert.number}`);
		expect(c.type).toEqual(expect.arrayContaining(['VerifiableCredential', 'OpenBadgeCredential']));
		expect(c.issuer).toMatchObject({ id: issuerId(), type: ['Profile'], name: cert.issuer_name });
		expect(typeof c.validFrom).toBe('string');
		expect(typeof c.name).toBe('string');
		expect(c.credentialSubject.type).toContain('AchievementSubject');
		expect(c.credentialSubject.identifier[0]).toMatchObject({ type: 'IdentityObject', identityType: 'name', hashed: false, identityHash: 'Zoë Łukasiewicz' });
		expect(c.credentialSubject.achievement).toMatchObject({ type: ['Achievement'], name: cert.course_title });
		for (const field of ['id', 'description', 'criteria']) expect(c.credentialSubject.achievement).toHaveProperty(field);
	});

	describe.each(['filesystem', 's3'] as const)('the stored PDF streams and is checked on the way out (%s store)', (kind) => {
		let store: FileStore;
		let stop = async () => {};
		beforeAll(async () => {
			if (kind === 'filesystem') {
				store = new FilesystemStore(path.join(dataDir, 'stream-check'));
			} else {
				const fake = await startS3Fake({ port: 0, dir: path.join(dataDir, 's3-fake'), bucket: 'certificate-files' });
				store = new S3Store(parseConfig(fake.env).s3!);
				stop = () => fake.close();
			}
		});
		afterAll(() => stop());
		beforeEach(async () => {
			await db.deleteFrom('certificate_file').where('certificate_id', '=', cert.id).where('format', '=', 'card').execute();
		});

		const storedKey = async () =>
			(await db.selectFrom('certificate_file').select('storage_key').where('certificate_id', '=', cert.id).where('format', '=', 'card').executeTakeFirstOrThrow()).storage_key;
		/** Reads a stream to its end or its error, keeping what arrived. */
		const drain = async (body: NodeJS.ReadableStream) => {
			const chunks: Buffer[] = [];
			try {
				for await (const chunk of body) chunks.push(chunk as Buffer);
				return { bytes: Buffer.concat(chunks), error: null };
			} catch (err) {
				return { bytes: Buffer.concat(chunks), error: err as Error };
			}
		};

		it('renders and stores once, then streams the same bytes with the recorded size', async () => {
			const first = await openIssuedDocument(cert, 'card', { db, store });
			const firstBytes = (await drain(first.body)).bytes;
			expect(first.sizeBytes).toBe(firstBytes.length);
			const again = await openIssuedDocument(cert, 'card', { db, store });
			const read = await drain(again.body);
			expect(read.error).toBeNull();
			expect(Buffer.compare(read.bytes, firstBytes)).toBe(0);
			expect(again.sha256).toBe(first.sha256);
			expect(Buffer.compare((await readObject(store, await storedKey()))!, firstBytes)).toBe(0);
		});

		it('a stored file changed in place (same size) fails at the end and never arrives whole', async () => {
			const { bytes } = await issuedDocument(cert, 'card', { db, store });
			const changed = Buffer.from(bytes);
			changed[changed.length - 10] ^= 0x01;
			await store.put(await storedKey(), changed);
			const opened = await openIssuedDocument(cert, 'card', { db, store });
			expect(opened.sizeBytes).toBe(bytes.length);
			const read = await drain(opened.body);
			expect(read.error?.message).toMatch(/does not match its recorded SHA-256/);
			expect(read.bytes.length).toBeLessThan(bytes.length);
		});

		it('a stored file of another size is refused before any byte is sent', async () => {
			await issuedDocument(cert, 'card', { db, store });
			await store.put(await storedKey(), Buffer.from('%PDF-1.7 truncated'));
			await expect(openIssuedDocument(cert, 'card', { db, store })).rejects.toThrow(/bytes, \d+ were recorded/);
		});

		it('a recorded file missing from the store is IssuedFileMissingError (the route answers 404)', async () => {
			await issuedDocument(cert, 'card', { db, store });
			await store.delete(await storedKey());
			await expect(openIssuedDocument(cert, 'card', { db, store })).rejects.toThrow(IssuedFileMissingError);
		});
	});

	describe('tampering is detected', () => {
		it('one changed byte of the PDF, and an edited name, are not the issued file; they still name the number', async () => {
			expect(await checkUploadedPdf(a4, db)).toEqual({ genuine: true, number: cert.number, format: 'a4' });
			const flipped = new Uint8Array(a4);
			flipped[Math.floor(flipped.length / 2)] ^= 0x01;
			expect(await checkUploadedPdf(flipped, db)).toEqual({ genuine: false, claimedNumber: cert.number });
			// an edited copy: same layout, another holder name (what an editing tool would produce)
			const { renderCertificatePdf } = await import('$lib/server/pdf/certificate');
			const { documentOf } = await import('$lib/server/certificate-documents');
			const edited = await renderCertificatePdf({ ...documentOf(cert), holderName: 'Someone Else' }, 'a4');
			expect(await checkUploadedPdf(edited, db)).toEqual({ genuine: false, claimedNumber: cert.number });
		});

		it('the genuine JWT verifies; altered payload, another key, alg none and expired are refused or flagged', async () => {
			expect(await verifyCredentialJwt(cert.credential_jwt)).toMatchObject({ ok: true, expired: false });
			const [h, p, s] = cert.credential_jwt.split('.');
			const payload = decodeJwt(cert.credential_jwt);
			const altered = Buffer.from(JSON.stringify({ ...payload, name: 'Something grander' })).toString('base64url');
			expect(await verifyCredentialJwt(`${h}.${altered}.${s}`)).toMatchObject({ ok: false, reason: 'signature' });

			const other = await generateKeyPair('EdDSA', { crv: 'Ed25519' });
			const header = JSON.parse(Buffer.from(h, 'base64url').toString());
			const forged = await new SignJWT(payload).setProtectedHeader(header).sign(other.privateKey);
			expect(await verifyCredentialJwt(forged)).toMatchObject({ ok: false, reason: 'signature' });
			// another key that names itself with an embedded jwk header is not trusted either
			const withJwk = await new SignJWT(payload).setProtectedHeader({ alg: 'EdDSA', typ: 'JWT', jwk: await exportJWK(other.publicKey) }).sign(other.privateKey);
			expect((await verifyCredentialJwt(withJwk)).ok).toBe(false);

			const none = new UnsecuredJWT(payload).encode();
			expect(await verifyCredentialJwt(none)).toMatchObject({ ok: false });
			const noneWithOldSignature = `${Buffer.from(JSON.stringify({ alg: 'none', typ: 'JWT' })).toString('base64url')}.${p}.${s}`;
			expect(await verifyCredentialJwt(noneWithOldSignature)).toMatchObject({ ok: false });
			expect(await verifyCredentialJwt('not a jwt')).toMatchObject({ ok: false, reason: 'malformed' });
		});

		it('a genuine but expired credential is reported as expired', async () => {
			const { signCredential } = await import('$lib/server/credential');
			const old = await signCredential({
				number: cert.number,
				holderName: cert.holder_name,
				courseSlug: cert.course_slug,
				courseCode: cert.course_code,
				courseTitle: cert.course_title,
				scope: cert.scope,
				diameterMinMm: 100,
				diameterMaxMm: 300,
				issuedAt: '2019-01-01T00:00:00Z',
				expiresOn: '2022-01-01',
				issuerName: cert.issuer_name
			});
			expect(await verifyCredentialJwt(old)).toMatchObject({ ok: true, expired: true });
		});
	});
});
