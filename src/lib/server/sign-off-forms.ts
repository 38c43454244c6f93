import { error, fail, json } from '@sveltejs/kit';
import { SignOffError } from './sign-offs';
import { UploadError } from './uploads';

/** Echoed back to a refused form: text fields only, never long ones. */
function safe(values: Record<string, string>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(values)) if (typeof v === 'string' && k.length < 80) out[k] = v.slice(0, 2000);
	return out;
}

/**
 * Turns a refusal from the sign-off or upload modules into a form failure (unknown ids
 * become the 404 page); anything else is a real fault and is rethrown.
 */
export function failFrom(err: unknown, values: Record<string, string> = {}) {
	if (err instanceof UploadError) return fail(err.status, { message: err.message, errors: { photos: err.message }, values: safe(values) });
	if (err instanceof SignOffError) {
		if (err.status === 404) error(404, err.message);
		return fail(err.status, { message: err.message, errors: err.fields, values: safe({ ...values, ...err.values }) });
	}
	throw err;
}

const codes: Record<number, string> = { 400: 'invalid', 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found', 409: 'conflict', 413: 'too_large', 415: 'unsupported_type' };

/** The JSON API's error body: `{ error: { code, message, fields? } }`. */
export function apiError(status: number, message: string, fields?: Record<string, string>): Response {
	return json({ error: { code: codes[status] ?? 'error', message, ...(fields && Object.keys(fields).length ? { fields } : {}) } }, { status });
}

/** A refusal from the sign-off or upload modules as an API error; anything else is rethrown. */
export function apiFailure(err: unknown): Response {
	if (err instanceof UploadError) return apiError(err.status, err.message, { photos: err.message });
	if (err instanceof SignOffError) return apiError(err.status, err.message, err.fields);
	throw err;
}

/** A JSON body of at most `maxBytes`, or an API error response. */
export async function readJsonBody(request: Request, maxBytes = 64 * 1024): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
	if (!(request.headers.get('content-type') ?? '').includes('application/json')) return { ok: false, response: apiError(415, 'Send the body as application/json.') };
	const text = await request.text();
	if (text.length > maxBytes) return { ok: false, response: apiError(413, `The body is larger than ${maxBytes / 1024} KB.`) };
	try {
		return { ok: true, body: JSON.parse(text) };
	} catch {
		return { ok: false, response: apiError(400, 'The body is not valid JSON.') };
	}
}
