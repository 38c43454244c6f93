/**
 * The JSON API's error shape, shared by the server (which builds it) and the pages' own
 * clients (which read it). Every 4xx/5xx from /api is `{ error: ApiErrorDetail }`; see
 * `$lib/server/api` and the API docs page.
 */
import type { z } from 'zod';

export type ApiErrorCode =
	| 'bad_request'
	| 'unauthorized'
	| 'forbidden'
	| 'not_found'
	| 'method_not_allowed'
	| 'conflict'
	| 'payload_too_large'
	| 'unsupported_media_type'
	| 'rate_limited'
	| 'unavailable'
	| 'internal';

export interface ApiErrorDetail {
	code: ApiErrorCode;
	message: string;
	/** One message per dotted field path; "body" for the body as a whole. */
	fields?: Record<string, string>;
	/** A finer machine-readable reason than the code, such as "time-up". */
	reason?: string;
	/** The log reference of an unexpected error. */
	id?: string;
}

export interface ApiErrorBody {
	error: ApiErrorDetail;
}

/** The error body; empty `fields` are left out. */
export function errorBody(code: ApiErrorCode, message: string, fields?: Record<string, string>): ApiErrorBody {
	return { error: { code, message, ...(fields && Object.keys(fields).length > 0 ? { fields } : {}) } };
}

export function isApiErrorBody(body: unknown): body is ApiErrorBody {
	if (typeof body !== 'object' || body === null || !Object.hasOwn(body, 'error')) return false;
	const error = (body as { error: unknown }).error;
	return typeof error === 'object' && error !== null && typeof (error as { code?: unknown }).code === 'string' && typeof (error as { message?: unknown }).message === 'string';
}

/** The message of an API error body, or `fallback` for anything else (a proxy's HTML page, nothing). */
export function errorMessage(body: unknown, fallback: string): string {
	return isApiErrorBody(body) ? body.error.message : fallback;
}

/**
 * One message per dotted field path ("body" for the whole body); unknown keys are named.
 * Keys come from the client, so they are collected without a prototype ("__proto__" is a key).
 */
export function zodFields(error: z.ZodError): Record<string, string> {
	const fields: Record<string, string> = Object.create(null);
	for (const issue of error.issues) {
		if (issue.code === 'unrecognized_keys') {
			for (const key of issue.keys) fields[[...issue.path, key].join('.')] ??= 'Unknown field';
			continue;
		}
		fields[issue.path.map(String).join('.') || 'body'] ??= issue.message;
	}
	return { ...fields };
}
