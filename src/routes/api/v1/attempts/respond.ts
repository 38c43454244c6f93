import { json } from '@sveltejs/kit';
import type { Refusal } from '$lib/server/attempts';

/** A refused test action as JSON: the message, a machine reason, and field messages when any. */
export function refusal(r: Refusal): Response {
	const { status, message, reason, errors, summary, availableAt } = r;
	return json({ error: message, reason, ...(errors ? { errors } : {}), ...(summary ? { summary } : {}), ...(availableAt ? { availableAt } : {}) }, { status });
}

/** The request body as JSON, or a 400 response. */
export async function readJson(request: Request): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
	try {
		return { ok: true, body: JSON.parse(await request.text()) };
	} catch {
		return { ok: false, response: json({ error: 'The request body must be JSON.', errors: { body: 'Not JSON' } }, { status: 400 }) };
	}
}

export const resultUrl = (courseSlug: string, attemptId: string) => `/courses/${courseSlug}/test/${attemptId}`;
