import { json } from '@sveltejs/kit';
import { checkNumbers } from '$lib/server/certificates';
import { apiCertificate, apiCrewRow, jwtBody, lookupLimitAnswer, looksLikePdf, MAX_UPLOAD_BYTES, numbersBody, verifyJwt, verifyPdf, type FileVerdict } from '$lib/server/verification';
import { toResponse } from '$lib/server/api';
import type { RequestHandler } from './$types';

const problem = (status: number, code: string, message: string, fields?: Record<string, string>) =>
	json({ error: { code, message, ...(fields ? { fields } : {}) } }, { status });

function fileAnswer(v: FileVerdict) {
	return {
		kind: v.kind,
		genuine: v.genuine,
		...(v.kind === 'jwt' ? { expired: v.expired, ...(v.message ? { message: v.message } : {}) } : {}),
		number: v.number,
		certificate: v.certificate ? apiCertificate(v.certificate) : null
	};
}

async function readBody(request: Request): Promise<Uint8Array | null> {
	const declared = Number(request.headers.get('content-length') ?? 0);
	if (declared > MAX_UPLOAD_BYTES) return null;
	const bytes = new Uint8Array(await request.arrayBuffer());
	return bytes.length > MAX_UPLOAD_BYTES ? null : bytes;
}

/**
 * Verifies a list of numbers (`{"numbers": [...]}`), a credential (`{"jwt": "..."}` or an
 * `application/jwt` body) or a certificate PDF (`application/pdf` body). Each number counts
 * against the address's look-up limit.
 */
export const POST: RequestHandler = async (event) => {
	const type = (event.request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	const bytes = await readBody(event.request);
	if (!bytes) return problem(413, 'payload_too_large', `The body is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`);

	if (type === 'application/pdf') {
		if (!looksLikePdf(bytes)) return problem(400, 'bad_request', 'The body is not a PDF file.');
		const refused = await lookupLimitAnswer(event.getClientAddress());
		if (refused) return toResponse(refused);
		return json(fileAnswer(await verifyPdf(bytes)));
	}
	const text = new TextDecoder().decode(bytes);
	if (type === 'application/jwt') {
		const refused = await lookupLimitAnswer(event.getClientAddress());
		if (refused) return toResponse(refused);
		return json(fileAnswer(await verifyJwt(text)));
	}
	if (type !== 'application/json') return problem(415, 'unsupported_type', 'Send application/json, application/jwt or application/pdf.');
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		return problem(400, 'bad_json', 'The body is not valid JSON.');
	}
	const asJwt = jwtBody.safeParse(body);
	if (asJwt.success) {
		const refused = await lookupLimitAnswer(event.getClientAddress());
		if (refused) return toResponse(refused);
		return json(fileAnswer(await verifyJwt(asJwt.data.jwt)));
	}
	const asNumbers = numbersBody.safeParse(body);
	if (!asNumbers.success) {
		const fields = Object.fromEntries(asNumbers.error.issues.map((i) => [i.path.join('.') || 'body', i.message]));
		return problem(400, 'bad_request', 'Send {"numbers": [...]} (up to 200) or {"jwt": "..."}.', fields);
	}
	const refused = await lookupLimitAnswer(event.getClientAddress(), asNumbers.data.numbers.length);
	if (refused) return toResponse(refused);
	return json({ results: (await checkNumbers(asNumbers.data.numbers)).map(apiCrewRow) });
};
