import { decode } from '@auth/core/jwt';
import type { Cookies } from '@sveltejs/kit';
import type { Identity } from '$lib/roles';
import { identityForSession } from './sessions';

/**
 * Reads Auth.js's session cookie without running Auth.js: the cookie is a JWE that Auth.js's
 * own `decode` opens with a key derived from the secret and the cookie's name (its salt).
 * Decoded cookies are remembered (bounded), since the same cookie arrives with every request
 * of a session; whether the session is still open is asked of the database every time.
 */

const COOKIE_NAMES = ['__Secure-authjs.session-token', 'authjs.session-token'] as const;

/** Whether a Cookie header may carry a session (by name only: whether it is valid is not asked). */
export const hasSessionCookie = (header: string | undefined): boolean => !!header && COOKIE_NAMES.some((name) => header.includes(name));
const MAX_REMEMBERED = 10_000;

interface Claims {
	sessionId: string;
	/** Seconds since the epoch. */
	expiresAt: number;
}

const remembered = new Map<string, Claims | null>();

function remember(cookie: string, claims: Claims | null) {
	if (remembered.size >= MAX_REMEMBERED) remembered.delete(remembered.keys().next().value!);
	remembered.set(cookie, claims);
}

/** The server-side session id the cookie names, or null (no cookie, not ours, expired, or from before sessions had ids). */
export async function sessionIdFromCookie(cookies: Pick<Cookies, 'get'>, secret: () => string): Promise<string | null> {
	for (const name of COOKIE_NAMES) {
		const value = cookies.get(name);
		if (!value) continue;
		const key = `${name}=${value}`;
		let claims = remembered.get(key);
		if (claims === undefined) {
			claims = null;
			try {
				const payload = await decode({ token: value, secret: secret(), salt: name });
				if (payload && typeof payload.sid === 'string' && typeof payload.exp === 'number') {
					claims = { sessionId: payload.sid, expiresAt: payload.exp };
				}
			} catch {
				// A cookie we cannot open (another secret, tampered with) signs nobody in.
			}
			remember(key, claims);
		}
		if (claims && claims.expiresAt * 1000 > Date.now()) return claims.sessionId;
		return null;
	}
	return null;
}

/**
 * Who is asking: the open session the cookie names and its person, or null. The one rule for
 * every way in (the hooks, and the built server's front door for the hot JSON routes).
 */
export async function whoIsAsking(cookies: Pick<Cookies, 'get'>, secret: () => string): Promise<{ sessionId: string; user: Identity } | null> {
	const sessionId = await sessionIdFromCookie(cookies, secret);
	if (!sessionId) return null;
	const user = await identityForSession(sessionId);
	return user ? { sessionId, user } : null;
}
