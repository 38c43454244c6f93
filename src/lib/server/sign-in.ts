import { isRedirect, redirect, type RequestEvent } from '@sveltejs/kit';
import { signIn } from './auth';
import { signInLimits } from './config';
import { clear, hit } from './rate-limit';

/** Counts a sign-in attempt for both the address and the IP; returns a message when over the limit. */
export function limitSignIn(event: RequestEvent, email: string): string | null {
	const byEmail = hit('sign-in-email', email, signInLimits.perEmail, signInLimits.windowMs);
	const byIp = hit('sign-in-ip', event.getClientAddress(), signInLimits.perIp, signInLimits.windowMs);
	if (byEmail.ok && byIp.ok) return null;
	const minutes = Math.max(1, Math.ceil(Math.max(byEmail.retryAfterSeconds, byIp.retryAfterSeconds) / 60));
	return `Too many sign-in attempts. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or reset your password.`;
}

export function forgetSignInAttempts(email: string) {
	clear('sign-in-email', email);
}

/** Only paths on this site are followed after sign-in. */
export function safeNext(next: string | null | undefined): string {
	return next && next.startsWith('/') && !next.startsWith('//') ? next : '/dashboard';
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
	try {
		await signIn({ ...event, request } as RequestEvent);
	} catch (e) {
		// Auth.js sends a link sign-in to its own /auth/verify-request, which only bounces to our
		// page: a form enhanced in the browser would first try (and fail) to route there itself.
		if (isRedirect(e) && new URL(e.location, event.url).pathname.endsWith('/verify-request')) redirect(303, '/sign-in/check-email');
		throw e;
	}
	throw new Error('Auth.js did not redirect after sign-in.');
}
