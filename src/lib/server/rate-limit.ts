/**
 * Fixed-window rate limiter held in process memory.
 *
 * One Node process serves the app (adapter-node), so an in-memory map is enough;
 * limits reset when the server restarts, which errs on the side of letting people in.
 * Windows are kept per bucket ("sign-in-ip", "calc-api", ...) and key (an address or IP).
 */
import { apiLimitOverrides } from './config';

interface Window {
	startedAt: number;
	count: number;
}

const windows = new Map<string, Window>();
const MAX_TRACKED = 50_000;

export interface RateLimitResult {
	ok: boolean;
	retryAfterSeconds: number;
}

/** Counts one attempt; `ok` is false once `limit` attempts were made within `windowMs`. */
export function hit(
	bucket: string,
	key: string,
	limit: number,
	windowMs: number,
	now = Date.now()
): RateLimitResult {
	const id = `${bucket}\u0000${key}`;
	let window = windows.get(id);
	if (!window || now - window.startedAt >= windowMs) {
		if (windows.size >= MAX_TRACKED) sweep(now, windowMs);
		window = { startedAt: now, count: 0 };
		windows.set(id, window);
	}
	window.count += 1;
	const ok = window.count <= limit;
	const retryAfterSeconds = ok ? 0 : Math.ceil((window.startedAt + windowMs - now) / 1000);
	return { ok, retryAfterSeconds };
}

/** Forgets one key's attempts, for example after a successful sign-in. */
export function clear(bucket: string, key: string): void {
	windows.delete(`${bucket}\u0000${key}`);
}

/** Tests start from a clean slate. */
export function resetAll(): void {
	windows.clear();
}

function sweep(now: number, windowMs: number) {
	for (const [id, window] of windows) {
		if (now - window.startedAt >= windowMs) windows.delete(id);
	}
}

export interface ApiLimit {
	bucket: string;
	limit: number;
	windowMs: number;
}

/**
 * For public JSON APIs: counts a request from the client's address and answers 429 with
 * Retry-After once the window is used up; null while the request may go ahead.
 */
export function refuseIfLimited(event: { getClientAddress(): string }, { bucket, limit, windowMs }: ApiLimit): Response | null {
	const verdict = hit(bucket, event.getClientAddress(), apiLimitOverrides[bucket] ?? limit, windowMs);
	if (verdict.ok) return null;
	return Response.json(
		{ error: `Too many requests from this address. Try again in ${verdict.retryAfterSeconds} s.` },
		{ status: 429, headers: { 'Retry-After': String(verdict.retryAfterSeconds) } }
	);
}
