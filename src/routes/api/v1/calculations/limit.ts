import { json, type RequestEvent } from '@sveltejs/kit';
import { CALCULATION_API_LIMIT, tooManyRequests } from '$lib/calc/api';
import { hit } from '$lib/server/rate-limit';

/** A 429 response with Retry-After when this client address has used up its window, else null. */
export function refuseIfLimited(event: RequestEvent): Response | null {
	const { bucket, limit, windowMs } = CALCULATION_API_LIMIT;
	const verdict = hit(bucket, event.getClientAddress(), limit, windowMs);
	if (verdict.ok) return null;
	const { status, body } = tooManyRequests(verdict.retryAfterSeconds);
	return json(body, { status, headers: { 'Retry-After': String(verdict.retryAfterSeconds) } });
}
