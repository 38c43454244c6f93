import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { building } from '$app/environment';
import { isApiPath } from './api';
import { readerLocale } from './locale';
import { SECURITY_HEADERS } from './security-headers';
import { hasSessionCookie } from './session-cookie';

/**
 * Pages that are the same for everyone who is not signed in (the catalogue, a course's outline)
 * are rendered once and served again for a while, as a shared cache in front of the app would.
 * A page opts in from its load function with `shareWhenAnonymous`; the hook stores only a 200
 * HTML answer to a full GET of the bare path, with no cookie set, and keys it by the reader's
 * locale as well (prices are formatted for it). Signed-in people, queries, data requests and
 * everything else always render afresh. Entries live `sharedForSeconds` at most and the newest
 * MAX_ENTRIES are kept; the content behind them only changes with a new build, which starts a
 * new process. Browsers are not told to cache these pages: someone who signs in must not see
 * the anonymous copy. In the built server `fastPage` serves a stored page before SvelteKit
 * builds a Request, to a GET of exactly that path that carries no session cookie.
 */

const MAX_ENTRIES = 500;
export const DEFAULT_SHARED_SECONDS = 300;

interface Entry {
	body: string;
	headers: [string, string][];
	etag: string | null;
	until: number;
}

const entries = new Map<string, Entry>();

/** Called by a load function: for a visitor who is not signed in, this page may be served to others. */
export function shareWhenAnonymous(event: Pick<RequestEvent, 'locals'>, seconds = DEFAULT_SHARED_SECONDS): void {
	if (!event.locals.user) event.locals.sharedForSeconds = seconds;
}

const LOCALES_REMEMBERED = 1_000;
const locales = new Map<string, string>();

/** The reader's locale for an Accept-Language header, remembered per header (browsers send a handful of distinct ones). */
export function localeOf(acceptLanguage: string | null | undefined): string {
	const header = acceptLanguage ?? '';
	let locale = locales.get(header);
	if (locale === undefined) {
		locale = readerLocale(acceptLanguage ?? null);
		if (locales.size >= LOCALES_REMEMBERED) locales.delete(locales.keys().next().value!);
		locales.set(header, locale);
	}
	return locale;
}

const keyOf = (pathname: string, acceptLanguage: string | null | undefined) => `${pathname}\n${localeOf(acceptLanguage)}`;

function eligible(event: RequestEvent): boolean {
	// prerendering (the build) must not read the query
	return !building && event.request.method === 'GET' && event.locals.user === null && !event.isDataRequest && event.url.search === '' && !isApiPath(event.url.pathname);
}

/** A stored page still fresh for this path and reader, as status, headers and body (304 when the reader has it). */
function storedAnswer(pathname: string, acceptLanguage: string | null | undefined, ifNoneMatch: string | null | undefined): Stored | null {
	const found = entries.get(keyOf(pathname, acceptLanguage));
	if (!found || found.until <= Date.now()) return null;
	return answerFrom(found, ifNoneMatch);
}

interface Stored {
	status: 200 | 304;
	headers: [string, string][];
	body: string | null;
}

const answerFrom = (entry: Entry, ifNoneMatch: string | null | undefined): Stored =>
	entry.etag !== null && ifNoneMatch === entry.etag
		? { status: 304, headers: [['etag', entry.etag]], body: null }
		: { status: 200, headers: entry.headers, body: entry.body };

const toWeb = ({ status, headers, body }: Stored) => new Response(body, { status, headers });

/** The handle hook; runs after the session is read (it needs `locals.user`). */
export const pageCache: Handle = async ({ event, resolve }) => {
	if (!eligible(event)) return resolve(event);
	const acceptLanguage = event.request.headers.get('accept-language');
	const stored = storedAnswer(event.url.pathname, acceptLanguage, event.request.headers.get('if-none-match'));
	if (stored) return toWeb(stored);
	const response = await resolve(event);
	const seconds = event.locals.sharedForSeconds;
	if (!seconds || response.status !== 200 || response.headers.has('set-cookie') || !response.headers.get('content-type')?.startsWith('text/html')) return response;
	const entry: Entry = { body: await response.text(), headers: [...response.headers], etag: response.headers.get('etag'), until: Date.now() + seconds * 1000 };
	const key = keyOf(event.url.pathname, acceptLanguage);
	entries.delete(key);
	if (entries.size >= MAX_ENTRIES) entries.delete(entries.keys().next().value!);
	entries.set(key, entry);
	return toWeb(answerFrom(entry, null));
};

/**
 * The built server's front door for stored pages (see `fast-front.ts`): a plain GET of a stored
 * path, without a query or a session cookie, is answered from the store with the headers the
 * hooks would have added; everything else goes on to SvelteKit.
 */
export function fastPage(req: IncomingMessage, res: ServerResponse, next: () => void): void {
	if (req.method !== 'GET' || entries.size === 0) return next();
	const url = req.url ?? '';
	if (url.includes('?') || hasSessionCookie(req.headers.cookie)) return next();
	const stored = storedAnswer(url, req.headers['accept-language'], req.headers['if-none-match']);
	if (!stored) return next();
	res.statusCode = stored.status;
	for (const [name, value] of [...stored.headers, ...SECURITY_HEADERS]) res.setHeader(name, value);
	res.end(stored.body ?? undefined);
}

/** Tests start from an empty cache. */
export function clearPageCache(): void {
	entries.clear();
}
