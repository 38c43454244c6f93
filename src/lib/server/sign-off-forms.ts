import { error, fail } from '@sveltejs/kit';
import { apiError, codeForStatus } from './api';
import { SignOffError } from './sign-offs';
import { StorageUnavailableError } from './storage';
import { UploadError } from './uploads';

/** Echoed back to a refused form: text fields only, never long ones. */
function safe(values: Record<string, string>): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(values)) if (typeof v === 'string' && k.length < 80) out[k] = v.slice(0, 2000);
	return out;
}

/**
 * Turns a refusal from the sign-off or upload modules into a form failure (unknown ids
 * become the 404 page; a file store out of reach is a 503 with nothing saved); anything else
 * is a real fault and is rethrown.
 */
export function failFrom(err: unknown, values: Record<string, string> = {}) {
	if (err instanceof UploadError) return fail(err.status, { message: err.message, errors: { photos: err.message }, values: safe(values) });
	if (err instanceof StorageUnavailableError) {
		console.error(err.message);
		return fail(503, { message: StorageUnavailableError.readerMessage, errors: { photos: StorageUnavailableError.readerMessage }, values: safe(values) });
	}
	if (err instanceof SignOffError) {
		if (err.status === 404) error(404, err.message);
		return fail(err.status, { message: err.message, errors: err.fields, values: safe({ ...values, ...err.values }) });
	}
	throw err;
}

/** A refusal from the sign-off or upload modules as an API error; anything else is rethrown. */
export function apiFailure(err: unknown): Response {
	if (err instanceof UploadError) return apiError(err.status, codeForStatus(err.status), err.message, { photos: err.message });
	if (err instanceof StorageUnavailableError) {
		console.error(err.message);
		return apiError(503, 'unavailable', StorageUnavailableError.readerMessage);
	}
	if (err instanceof SignOffError) return apiError(err.status, codeForStatus(err.status), err.message, err.fields);
	throw err;
}
