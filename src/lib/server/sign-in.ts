import type { RequestEvent } from '@sveltejs/kit';
import { signIn } from './auth';

const DEFAULT_NEXT = '/dashboard';

/**
 * Where to go after signing in: only a page of this site. `next` is resolved the way a browser
 * resolves a link (so `/\evil.example`, `/\t/evil.example`, `//evil.example` and
 * `https:evil.example` all land on another origin and are refused); the result keeps only
 * path, query and fragment.
 */
export function safeNext(next: string | null | undefined, origin: string): string {
	if (!next) return DEFAULT_NEXT;
	let url: URL;
	try {
		url = new URL(next, origin);
	} catch {
		return DEFAULT_NEXT;
	}
	if (url.origin !== new URL(origin).origin) return DEFAULT_NEXT;
	const path = url.pathname + url.search + url.hash;
	return path.startsWith('/') && !path.startsWith('//') ? path : DEFAULT_NEXT;
}

/**
 * Hands an already validated sign-in to Auth.js. Auth.js reads its fields from the request
 * body, which the action has consumed, so a fresh request carries them. Throws the redirect.
 */
export async function startSignIn(event: RequestEvent, fields: Record<string, string>): Promise<never> {
	const body = new URLSearchParams(fields);
	const headers = new Headers(event.request.headers);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	headers.delete('content-length');
	const request = new Request(event.request.url, { method: 'POST', headers, body });
	await signIn({ ...event, request } as RequestEvent);
	throw new Error('Auth.js did not redirect after sign-in.');
}
