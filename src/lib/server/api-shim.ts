import { json } from '@sveltejs/kit';
import type { z } from 'zod';

/**
 * JSON API answers in the shared error shape `{ error: { code, message, fields? } }`.
 * Stand-in until the API contract module ($lib/server/api) lands; same shape, same names.
 */
export function apiError(status: number, code: string, message: string, fields?: Record<string, string>, extra: Record<string, unknown> = {}) {
	return json({ error: { code, message, ...(fields ? { fields } : {}) }, ...extra }, { status });
}

/** Reads a JSON body of at most `maxBytes` and parses it with `schema`; a 400/413 answer otherwise. */
export async function readJsonBody<S extends z.ZodType>(request: Request, schema: S, maxBytes = 16 * 1024): Promise<{ ok: true; data: z.output<S> } | { ok: false; response: Response }> {
	const text = await readText(request, maxBytes);
	if (text === null) return { ok: false, response: apiError(413, 'body_too_large', `The body is larger than ${maxBytes} bytes.`) };
	let raw: unknown;
	try {
		raw = JSON.parse(text);
	} catch {
		return { ok: false, response: apiError(400, 'invalid_json', 'The request body must be JSON.') };
	}
	const parsed = schema.safeParse(raw);
	if (!parsed.success) {
		const fields: Record<string, string> = {};
		for (const issue of parsed.error.issues) fields[issue.path.join('.') || 'body'] ??= issue.message;
		return { ok: false, response: apiError(400, 'invalid_body', 'Some fields are not valid.', fields) };
	}
	return { ok: true, data: parsed.data };
}

/** The body as text, or null when it is larger than `maxBytes` (checked while reading). */
export async function readText(request: Request, maxBytes: number): Promise<string | null> {
	if (Number(request.headers.get('content-length') ?? 0) > maxBytes) return null;
	if (!request.body) return '';
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > maxBytes) {
			await reader.cancel();
			return null;
		}
		chunks.push(value);
	}
	return new TextDecoder().decode(Buffer.concat(chunks));
}
