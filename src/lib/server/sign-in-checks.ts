import { config } from './config';
import { db as defaultDb, type DB } from './db';
import type { RequestContext } from './request-context';
import { clear, hit, type RateLimitResult } from './rate-limit';
import { checkPassword } from './users';

/**
 * The one place a password is checked for signing in, limited per address and per client
 * address. Both the sign-in form and Auth.js's credentials endpoint come through here; when
 * the form already checked the password in this request, Auth.js's second look neither counts
 * nor hashes again.
 */

type SignInUser = { id: string; email: string; name: string | null };
export type SignInVerdict =
	| { outcome: 'ok'; user: SignInUser }
	| { outcome: 'wrong' }
	| { outcome: 'unconfirmed' }
	| { outcome: 'limited'; retryAfterSeconds: number };

const verified = new WeakMap<RequestContext, SignInUser>();

export async function verifySignIn(email: string, password: string, context: RequestContext, db: DB = defaultDb): Promise<SignInVerdict> {
	const already = verified.get(context);
	if (already && already.email === email) return { outcome: 'ok', user: already };

	const { perEmail, perIp, windowMs } = config.signInLimits;
	const byEmail = await hit('sign-in-email', email, perEmail, windowMs);
	const byIp = await hit('sign-in-ip', context.clientAddress, perIp, windowMs);
	if (!byEmail.ok || !byIp.ok) {
		return { outcome: 'limited', retryAfterSeconds: Math.max(byEmail.retryAfterSeconds, byIp.retryAfterSeconds) };
	}
	const checked = await checkPassword(email, password, db);
	if (checked.outcome !== 'ok') return checked;
	await clear('sign-in-email', email);
	verified.set(context, checked.user);
	return checked;
}

const LINKS_PER_ADDRESS = 5;
const LINK_WINDOW_MS = 60 * 60 * 1000;
const counted = new WeakMap<RequestContext, string>();

/**
 * Counts one e-mail with a link (sign-in, address confirmation) to `email` from this client.
 * A form action that counted already (to show its own message) is not counted twice.
 */
export async function countLinkMail(email: string, context: RequestContext): Promise<RateLimitResult> {
	if (counted.get(context) === email) return { ok: true, retryAfterSeconds: 0 };
	const byEmail = await hit('link-email', email, LINKS_PER_ADDRESS, LINK_WINDOW_MS);
	const byIp = await hit('link-ip', context.clientAddress, config.signInLimits.perIp, LINK_WINDOW_MS);
	const ok = byEmail.ok && byIp.ok;
	if (ok) counted.set(context, email);
	return { ok, retryAfterSeconds: Math.max(byEmail.retryAfterSeconds, byIp.retryAfterSeconds) };
}

/** "Wait 3 minutes" from a number of seconds. */
export function waitMinutes(seconds: number): string {
	const minutes = Math.max(1, Math.ceil(seconds / 60));
	return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}
