import { json, type RequestEvent } from '@sveltejs/kit';
import { PRACTICE_API_LIMIT } from '$lib/practice/api';
import { hit } from '$lib/server/rate-limit';

/** A 429 response with Retry-After when this client address has used up its window, else null. */
export function refuseIfLimited(event: RequestEvent): Response | null {
	const { bucket, limit, windowMs } = PRACTICE_API_LIMIT;
	const verdict = hit(bucket, event.getClientAddress(), limit, windowMs);
	if (verdict.ok) return null;
	return json(
		{ error: `Too many requests from this address. Try again in ${verdict.retryAfterSeconds} s.` },
		{ status: 429, headers: { 'Retry-After': String(verdict.retryAfterSeconds) } }
	);
}
