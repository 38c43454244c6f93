/**
 * The JSON API's one contract (documented on /api-docs):
 *
 * - Every 4xx/5xx answer is `{ "error": { "code", "message", "fields"?, "reason"?, "id"? } }`;
 *   `code` is one of `ApiErrorCode`, `fields` holds one message per dotted field path,
 *   `reason` a finer machine reason where a route has one, `id` the log reference of a 500.
 *   Routes may add data beside `error` (a closed attempt's summary, when to retry).
 * - Bodies are JSON (`application/json` or `+json`, otherwise 415), read with a byte cap
 *   (413 past it) and parsed with a zod schema (400 with `fields`).
 * - State-changing calls must come from this site's own pages (same `Origin`, as SvelteKit
 *   checks for form actions): 403 otherwise. Pure computations are exempt (`ORIGIN_FREE`).
 * - `apiGuard` (a handle hook) turns anything else an /api route answers with an error
 *   status (a thrown `error()`, an unknown route, a crash, the adapter's body limit) into
 *   the same shape, and marks every API answer `Cache-Control: no-store`.
 */
import { json, type Handle, type RequestEvent } from '@sveltejs/kit';
import type { z } from 'zod';
import { errorBody, isApiErrorBody, zodFields, type ApiErrorCode, type ApiErrorDetail } from '$lib/api-error';

export { errorBody, errorMessage, zodFields, type ApiErrorBody, type ApiErrorCode } from '$lib/api-error';

export interface ApiErrorOptions {
	/** A finer machine-readable reason than the code, such as "time-up". */
	reason?: string;
	/** Data sent beside `error`, such as a closed attempt's summary. */
	extra?: Record<string, unknown>;
	headers?: HeadersInit;
	/** The log reference of an unexpected error. */
	id?: string;
}

const codeByStatus = new Map<number, ApiErrorCode>([
	[400, 'bad_request'],
	[401, 'unauthorized'],
	[403, 'forbidden'],
	[404, 'not_found'],
	[405, 'method_not_allowed'],
	[409, 'conflict'],
	[413, 'payload_too_large'],
	[415, 'unsupported_media_type'],
	[429, 'rate_limited'],
	[503, 'unavailable']
]);

const defaultMessages = new Map<number, string>([
	[400, 'The request is not valid.'],
	[401, 'Sign in first.'],
	[403, 'You may not do this.'],
	[404, 'Not found.'],
	[405, 'This method is not allowed here.'],
	[409, 'This conflicts with the current state.'],
	[413, 'The request body is too large.'],
	[415, 'The request body must be JSON (Content-Type: application/json).'],
	[429, 'Too many requests. Try again later.'],
	[503, 'The service is busy. Try again shortly.']
]);

/** The code for an HTTP status: 4xx without its own code is bad_request, 5xx is internal. */
export function codeForStatus(status: number): ApiErrorCode {
	return codeByStatus.get(status) ?? (status >= 500 ? 'internal' : 'bad_request');
}

function defaultMessage(status: number): string {
	return defaultMessages.get(status) ?? (status >= 500 ? 'Something went wrong on our side.' : 'The request is not valid.');
}

/** An answer as plain data: what a route computes, before a transport writes it. */
export interface Answer {
	status: number;
	body: unknown;
	headers?: Record<string, string>;
}

/** An error answer in the API's one shape, as data. */
export function errorAnswer(
	status: number,
	code: ApiErrorCode,
	message: string,
	fields?: Record<string, string>,
	{ reason, extra, id }: Omit<ApiErrorOptions, 'headers'> = {}
): Answer {
	const error: ApiErrorDetail = errorBody(code, message, fields).error;
	if (reason) error.reason = reason;
	if (id) error.id = id;
	return { status, body: { ...extra, error } };
}

/** The Response for an answer. */
export const toResponse = ({ status, body, headers }: Answer): Response => json(body, { status, headers });

/** An error answer in the API's one shape. */
export function apiError(status: number, code: ApiErrorCode, message: string, fields?: Record<string, string>, options: ApiErrorOptions = {}): Response {
	return json(errorAnswer(status, code, message, fields, options).body, { status, headers: options.headers });
}

/** Writes an unexpected error to the log with a short reference, and returns the reference (shown to the person). */
export function logUnexpected(method: string, pathname: string, error: unknown): string {
	const id = crypto.randomUUID().slice(0, 8);
	console.error(`[error ${id}] ${method} ${pathname}`, error);
	return id;
}

/** 429 with Retry-After, in the API's shape. */
export const rateLimitedAnswer = (seconds: number, message: string): Answer => ({
	...errorAnswer(429, 'rate_limited', message),
	headers: { 'Retry-After': String(seconds) }
});

/** Seconds a client is asked to wait when the database was busy. */
const BUSY_RETRY_AFTER_SECONDS = 2;
export const BUSY_MESSAGE = 'The database is busy. Try again in a moment.';

/** 503 with Retry-After: another process held the database's write lock too long. */
export const busyAnswer = (): Answer => ({
	...errorAnswer(503, 'unavailable', BUSY_MESSAGE),
	headers: { 'Retry-After': String(BUSY_RETRY_AFTER_SECONDS) }
});

export const DEFAULT_MAX_BYTES = 64 * 1024;

export type ReadResult<T> = { ok: true; data: T } | { ok: false; response: Response };
export type TextRead = { ok: true; text: string } | { ok: false; answer: Answer };

export function isJsonType(contentType: string | null | undefined): boolean {
	if (!contentType) return false;
	const type = contentType.split(';')[0].trim().toLowerCase();
	return type === 'application/json' || (type.startsWith('application/') && type.endsWith('+json'));
}

const tooLarge = (maxBytes: number): TextRead => ({ ok: false, answer: errorAnswer(413, 'payload_too_large', `The request body is larger than ${maxBytes} bytes.`) });

/** 400 for a body whose stream broke off. */
export const unreadableBody = (): TextRead => ({ ok: false, answer: errorAnswer(400, 'bad_request', 'The request body could not be read.') });

const utf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * The API's rules for a request body, read chunk by chunk, shared by both readers (a web stream
 * here, Node's events in the front door): 413 before a byte is read when the declared length is
 * over the cap, 413 as soon as more than the cap arrives, 400 for bytes that are not UTF-8.
 */
export function cappedBody(contentLength: string | null | undefined, maxBytes = DEFAULT_MAX_BYTES) {
	const declared = Number(contentLength);
	const chunks: Uint8Array[] = [];
	let size = 0;
	return {
		/** The 413 when the declared length is already over the cap, else null. */
		refused: (): TextRead | null => (Number.isFinite(declared) && declared > maxBytes ? tooLarge(maxBytes) : null),
		/** Takes a chunk; the 413 once the body is past the cap, else null. */
		add(chunk: Uint8Array): TextRead | null {
			size += chunk.byteLength;
			if (size > maxBytes) return tooLarge(maxBytes);
			chunks.push(chunk);
			return null;
		},
		/** 413 for a stream that signalled its own limit (adapter-node's BODY_SIZE_LIMIT). */
		tooLarge: () => tooLarge(maxBytes),
		/** The whole body as text. */
		text(): TextRead {
			const bytes = chunks.length === 1 ? chunks[0] : new Uint8Array(size);
			if (chunks.length !== 1) {
				let at = 0;
				for (const chunk of chunks) {
					bytes.set(chunk, at);
					at += chunk.byteLength;
				}
			}
			try {
				return { ok: true, text: utf8.decode(bytes) };
			} catch {
				return { ok: false, answer: errorAnswer(400, 'bad_request', 'The request body is not valid UTF-8.') };
			}
		}
	};
}

/**
 * Reads at most `maxBytes` of a web request's body, stopping as soon as more arrive (the built
 * front door reads Node's requests by their events, `readDeclaredBody`). Throws nothing: see
 * `cappedBody` for the answers.
 */
export async function readCapped(
	contentLength: string | null | undefined,
	body: AsyncIterable<Uint8Array> | null,
	maxBytes = DEFAULT_MAX_BYTES
): Promise<TextRead> {
	const capped = cappedBody(contentLength, maxBytes);
	const refused = capped.refused();
	if (refused) return refused;
	if (!body) return { ok: true, text: '' };
	try {
		for await (const chunk of body) {
			// leaving the loop cancels the stream, so the rest is never read
			const over = capped.add(chunk);
			if (over) return over;
		}
	} catch (e) {
		return (e as { status?: number } | null)?.status === 413 ? capped.tooLarge() : unreadableBody();
	}
	return capped.text();
}

/**
 * `then` applied to a value now, or once a promise of it resolves (`fail` on rejection): the hot
 * routes give their answers without a promise wherever nothing has to wait (in the built server
 * each promise runs AsyncLocalStorage's hooks).
 */
export function whenReady<T, U>(value: T | Promise<T>, then: (value: T) => U, fail?: (error: unknown) => U): U | Promise<U> {
	return value instanceof Promise ? value.then(then, fail) : then(value);
}

/** 415 unless the content type is JSON; null when it is. */
export const refuseNonJson = (contentType: string | null | undefined): Answer | null =>
	isJsonType(contentType) ? null : errorAnswer(415, 'unsupported_media_type', defaultMessage(415));

const asResponse = (read: TextRead): { ok: true; text: string } | { ok: false; response: Response } =>
	read.ok ? read : { ok: false, response: toResponse(read.answer) };

/** The text of a request's body, read under `readCapped`'s rules. */
export async function readBodyText(request: Request, maxBytes = DEFAULT_MAX_BYTES): Promise<{ ok: true; text: string } | { ok: false; response: Response }> {
	return asResponse(await readCapped(request.headers.get('content-length'), request.body, maxBytes));
}

/** The body text of a JSON request as an answer: 415 for another content type, 413 past `maxBytes`. */
export async function readJsonAnswer(request: Request, maxBytes = DEFAULT_MAX_BYTES): Promise<TextRead> {
	const refused = refuseNonJson(request.headers.get('content-type'));
	if (refused) return { ok: false, answer: refused };
	return readCapped(request.headers.get('content-length'), request.body, maxBytes);
}

/** The body text of a JSON request: 415 for another content type, 413 past `maxBytes`. */
export async function readJsonText(request: Request, maxBytes = DEFAULT_MAX_BYTES): Promise<{ ok: true; text: string } | { ok: false; response: Response }> {
	return asResponse(await readJsonAnswer(request, maxBytes));
}

/**
 * Reads a JSON body and validates it with `schema`: 415 for another content type, 413 past
 * `maxBytes`, 400 with `fields` for text that is not JSON or does not fit the schema.
 * `hint` is added to the 400 message (for example the body's expected form).
 */
export async function readJson<S extends z.ZodType>(
	request: Request,
	schema: S,
	{ maxBytes = DEFAULT_MAX_BYTES, hint }: { maxBytes?: number; hint?: string } = {}
): Promise<ReadResult<z.output<S>>> {
	const read = await readJsonText(request, maxBytes);
	if (!read.ok) return read;
	let raw: unknown;
	try {
		raw = JSON.parse(read.text);
	} catch {
		return { ok: false, response: apiError(400, 'bad_request', `The request body is not JSON.${hint ? ` ${hint}` : ''}`, { body: 'Not JSON' }) };
	}
	const parsed = schema.safeParse(raw);
	if (!parsed.success) {
		return { ok: false, response: apiError(400, 'bad_request', `Some fields are missing or not valid.${hint ? ` ${hint}` : ''}`, zodFields(parsed.error)) };
	}
	return { ok: true, data: parsed.data };
}

/**
 * Routes other programs may POST to from anywhere: pure computations, certificate checks (they
 * change nothing), and the payment
 * service's webhook, which is authenticated by its signature over the body instead.
 */
export const ORIGIN_FREE = new Set(['/api/v1/calculations/[id]', '/api/v1/practice/[generator]/check', '/api/v1/payments/webhook', '/api/v1/certificates/verify']);

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** A 403 for a state-changing call from another origin (or none), as for form actions; null when allowed. */
export function refuseCrossOrigin(event: Pick<RequestEvent, 'request' | 'url' | 'route'>): Response | null {
	if (SAFE_METHODS.has(event.request.method)) return null;
	if (event.route.id && ORIGIN_FREE.has(event.route.id)) return null;
	if (event.request.headers.get('origin') === event.url.origin) return null;
	return apiError(403, 'forbidden', 'Cross-site requests are refused: send the Origin header of this site.');
}

export const isApiPath = (pathname: string) => pathname === '/api' || pathname.startsWith('/api/');

/** Rewrites an error answer not yet in the API's shape, keeping its message, fields and headers. */
async function normalise(response: Response, id: string | undefined): Promise<Response> {
	let body: unknown = null;
	if (isJsonType(response.headers.get('content-type'))) body = await response.clone().json().catch(() => null);
	if (isApiErrorBody(body)) return response;
	const old = (typeof body === 'object' && body !== null ? body : {}) as Record<string, unknown>;
	const status = response.status;
	const message =
		status >= 500 ? defaultMessage(status) : typeof old.message === 'string' ? old.message : typeof old.error === 'string' ? old.error : defaultMessage(status);
	const fields = typeof old.errors === 'object' && old.errors !== null ? (old.errors as Record<string, string>) : undefined;
	const headers = new Headers(response.headers);
	headers.delete('content-type');
	headers.delete('content-length');
	return apiError(status, codeForStatus(status), message, fields, { headers, id: id ?? (typeof old.id === 'string' ? old.id : undefined) });
}

/** Where `handleError` leaves the log reference of an unexpected error for `apiGuard`. */
export const errorIds = new WeakMap<Request, string>();

/**
 * The handle hook for /api paths: refuses cross-origin state changes before anything runs,
 * answers every error in the API's shape, and forbids caching.
 */
export const apiGuard: Handle = async ({ event, resolve }) => {
	if (!isApiPath(event.url.pathname)) return resolve(event);
	let response = refuseCrossOrigin(event) ?? (await resolve(event));
	if (response.status >= 400) response = await normalise(response, errorIds.get(event.request));
	try {
		response.headers.set('Cache-Control', 'no-store');
	} catch {
		response = new Response(response.body, response);
		response.headers.set('Cache-Control', 'no-store');
	}
	return response;
};
