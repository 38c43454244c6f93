import type { IncomingMessage, ServerResponse } from 'node:http';
import { parse as parseCookies } from 'cookie';
import type { RequestEvent } from '@sveltejs/kit';
import type { Identity } from '$lib/roles';
import { authSecret } from './auth';
import { acceptsGzip, gzipOnce } from './compression';
import { lessonView, type LessonPageData } from './lesson-view';
import { localeOf } from './page-cache';
import { SECURITY_HEADERS, NO_STORE } from './security-headers';
import { hasSessionCookie, whoIsAsking } from './session-cookie';
import { viewerOf } from './viewer';

/**
 * Finished lesson pages, kept by what they show rather than by who asked. A lesson page is
 * rendered from its path, the reader's locale, the frame's data (signed in or not, the menu of
 * their roles: `viewerOf`) and the lesson's data (`lessonView`: the outline, enrolled or not,
 * the lessons done); none of it names the person. Two readers in the same position (a crew of
 * new starters opening the day's first lesson) get byte for byte the same page, so it is
 * rendered once: the key is all of those inputs, and a stored page is never stale for its key.
 *
 * The load function names the key (`rememberLessonPage`), the `lessonBody` hook stores the
 * finished page under it, and in the built server `fastLesson` answers a later GET of the same
 * page before SvelteKit builds a Request: it runs the same checks (`whoIsAsking`, `lessonView`)
 * and steps aside whenever SvelteKit has something to do (no stored page, a seat to count as
 * used, a refusal, a session that is not open). Entries live KEEP_MS at most and the newest
 * MAX_ENTRIES are kept (a page is about 80 KB, and a fifth of that again gzipped, which is what
 * a browser gets from the front door).
 */

const MAX_ENTRIES = 200;
const KEEP_MS = 5 * 60_000;

export interface StoredPage {
	bytes: Uint8Array;
	/** The same page gzipped once, for readers whose browser takes it (all of them do). */
	gzipped: Uint8Array;
	headers: [string, string][];
	until: number;
}

const entries = new Map<string, StoredPage>();

/** The key of a lesson page: everything it is rendered from (see above). */
export function lessonPageKey(pathname: string, acceptLanguage: string | null | undefined, user: Identity | null, data: LessonPageData): string {
	return `${pathname}\n${localeOf(acceptLanguage)}\n${JSON.stringify(viewerOf(user))}\n${JSON.stringify(data)}`;
}

/** Called by the lesson page's load function for a full page load. */
export function rememberLessonPage(event: Pick<RequestEvent, 'locals' | 'request' | 'url'>, data: LessonPageData): void {
	if (event.request.method !== 'GET' || event.url.search !== '') return;
	event.locals.lessonPageKey = lessonPageKey(event.url.pathname, event.request.headers.get('accept-language'), event.locals.user, data);
}

/**
 * Called by the `lessonBody` hook with the finished page; stores a plain 200 that sets no cookie.
 * A page still kept under its key is the same page, so it is neither replaced nor gzipped again
 * (the case for every render under `vite dev`, where there is no front door).
 */
export function storeLessonPage(key: string | undefined, status: number, headers: Headers, bytes: Uint8Array): void {
	if (!key || status !== 200 || headers.has('set-cookie') || storedPage(key)) return;
	entries.delete(key);
	if (entries.size >= MAX_ENTRIES) entries.delete(entries.keys().next().value!);
	entries.set(key, { bytes, gzipped: gzipOnce(bytes), headers: [...headers].filter(([name]) => name !== 'content-length'), until: Date.now() + KEEP_MS });
}

function storedPage(key: string): StoredPage | null {
	const found = entries.get(key);
	return found && found.until > Date.now() ? found : null;
}

const LESSON_PATH = /^\/courses\/([a-z0-9-]+)\/([a-z0-9-]+)$/;

/**
 * The built server's front door for stored lesson pages (see fast-front.ts). Anything it is not
 * sure of goes on to SvelteKit, which renders and stores.
 */
export function fastLesson(req: IncomingMessage, res: ServerResponse, next: () => void): void {
	if (req.method !== 'GET' || entries.size === 0) return next();
	const match = LESSON_PATH.exec(req.url ?? '');
	if (!match) return next();
	answerStored(req, res, match[1], match[2]).then(
		(answered) => answered || next(),
		() => next()
	);
}

async function answerStored(req: IncomingMessage, res: ServerResponse, courseSlug: string, lessonSlug: string): Promise<boolean> {
	const header = req.headers.cookie;
	let user: Identity | null = null;
	if (hasSessionCookie(header)) {
		const cookies = parseCookies(header!);
		const asking = await whoIsAsking({ get: (name) => cookies[name] }, authSecret);
		if (!asking) return false;
		user = asking.user;
	}
	const view = await lessonView(user, courseSlug, lessonSlug);
	if (view.kind !== 'page' || view.markSeat) return false;
	const stored = storedPage(lessonPageKey(req.url!, req.headers['accept-language'], user, view.data));
	if (!stored) return false;
	const gzip = acceptsGzip(req.headers['accept-encoding']);
	const body = gzip ? stored.gzipped : stored.bytes;
	res.statusCode = 200;
	for (const [name, value] of [...stored.headers, ...SECURITY_HEADERS]) res.setHeader(name, value);
	if (user) res.setHeader(...NO_STORE);
	if (gzip) res.setHeader('Content-Encoding', 'gzip');
	res.setHeader('Vary', 'Accept-Encoding');
	res.setHeader('Content-Length', body.byteLength);
	res.end(body);
	return true;
}

/** Tests start from an empty store. */
export function clearLessonPages(): void {
	entries.clear();
}
