import { z } from 'zod';
import { parseNumber } from '$lib/certificates/number';
import { checkNumbers, CREW_CHECK_LIMIT, findCertificate, type CrewRow, type PublicCertificate } from './certificates';
import { checkUploadedPdf } from './certificate-documents';
import { verifyCredentialJwt } from './credential';
import { db as defaultDb, getDb, type DB } from './db';
import { rateLimitedAnswer, type Answer } from './api';
import { config } from './config';
import { hitReserving, scaledLimit } from './rate-limit';

/**
 * Public verification: the same answers for the pages and the JSON API. Lookups are limited
 * per client address so numbers cannot be enumerated; a malformed and an unknown number get
 * the same answer after the same work (one indexed lookup each).
 */
const LOOKUP_BUCKET = 'certificate-lookup';

/** Charges `count` lookups to an address; returns seconds to wait when over the limit, else 0. */
export async function chargeLookups(address: string, count = 1): Promise<number> {
	const limit = scaledLimit(config.certificateLookupsPerMinute);
	let verdict = { ok: true, retryAfterSeconds: 0 };
	for (let i = 0; i < Math.max(1, count) && verdict.ok; i++) verdict = await hitReserving(LOOKUP_BUCKET, address, limit, 60_000);
	return verdict.ok ? 0 : verdict.retryAfterSeconds;
}

/** 429 with Retry-After once `count` more look-ups would pass the address's limit; null while they may go ahead. */
export async function lookupLimitAnswer(address: string, count = 1): Promise<Answer | null> {
	const wait = await chargeLookups(address, count);
	return wait ? rateLimitedAnswer(wait, `Too many look-ups from this address. Try again in ${wait} s.`) : null;
}

/** What the API answers for one number: `null` for not found (malformed or unknown alike). */
export async function lookUp(input: string, { db = getDb(), now = new Date() }: { db?: DB; now?: Date } = {}): Promise<PublicCertificate | null> {
	const parsed = parseNumber(input.slice(0, 64));
	// a malformed number still costs one lookup, so timing does not tell it from an unknown one
	return findCertificate(parsed.ok ? parsed.formatted : '0000-0000-0000-0000', { db, now });
}

export function apiCertificate(c: PublicCertificate) {
	return {
		number: c.number,
		status: c.status,
		holder: c.holder,
		course: c.course,
		scope: c.scope,
		diameterRangeMm: c.diameterRangeMm,
		issuedOn: c.issuedOn,
		expiresOn: c.expiresOn,
		...(c.revokedOn ? { revokedOn: c.revokedOn } : {}),
		...(c.replacedBy ? { replacedBy: c.replacedBy } : {})
	};
}

export function apiCrewRow(row: CrewRow) {
	return row.result ? { input: row.input, found: true, certificate: apiCertificate(row.result) } : { input: row.input, found: false, problem: row.problem };
}

export const numbersBody = z.strictObject({
	numbers: z.array(z.string().max(64, 'A number is at most 64 characters.')).min(1, 'Give at least one number.').max(CREW_CHECK_LIMIT, `At most ${CREW_CHECK_LIMIT} numbers at once.`)
});
export const jwtBody = z.strictObject({ jwt: z.string().min(1).max(20_000, 'A credential is at most 20,000 characters.') });

export type FileVerdict =
	| { kind: 'pdf'; genuine: boolean; number: string | null; certificate: PublicCertificate | null }
	| { kind: 'jwt'; genuine: boolean; expired: boolean; message: string | null; number: string | null; certificate: PublicCertificate | null };

/** An uploaded certificate PDF, checked by hash; the status of the number it claims either way. */
export async function verifyPdf(bytes: Uint8Array, db: DB = defaultDb): Promise<FileVerdict> {
	const check = await checkUploadedPdf(bytes, db);
	const number = check.genuine ? check.number : check.claimedNumber;
	return { kind: 'pdf', genuine: check.genuine, number, certificate: number ? await findCertificate(number, { db }) : null };
}

/** An uploaded credential JWT, checked against the published key, then the number's status. */
export async function verifyJwt(token: string, db: DB = defaultDb): Promise<FileVerdict> {
	const check = await verifyCredentialJwt(token);
	if (!check.ok) return { kind: 'jwt', genuine: false, expired: false, message: check.message, number: null, certificate: null };
	const number = String(check.credential.id ?? '').split('/').pop() ?? '';
	const certificate = await findCertificate(number, { db });
	return { kind: 'jwt', genuine: true, expired: check.expired, message: null, number: certificate?.number ?? null, certificate };
}

export function looksLikePdf(bytes: Uint8Array) {
	return bytes.length > 4 && bytes[0] === 0x25 && bytes[1] === 0x50 && bytes[2] === 0x44 && bytes[3] === 0x46;
}

export const MAX_UPLOAD_BYTES = 2 * 1024 * 1024;
