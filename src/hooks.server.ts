import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { apiGuard, busyAnswer, BUSY_MESSAGE, errorIds, isApiPath, logUnexpected, toResponse } from '$lib/server/api';
import { publishFastFront } from '$lib/server/fast-front';
import { pageCache } from '$lib/server/page-cache';
import { setSecurityHeaders } from '$lib/server/security-headers';
import { authHandle, authSecret } from '$lib/server/auth';
import { ConfigError, loadConfig } from '$lib/server/config';
import { getDb } from '$lib/server/db';
import { DataDirError } from '$lib/server/db/engine';
import { isDatabaseBusy } from '$lib/server/db/errors';
import { migrateToLatest } from '$lib/server/db/migrate';
import { seedDemo } from '$lib/server/demo-seed';
import { pageWithBody } from '$lib/server/lesson-html';
import { storeLessonPage } from '$lib/server/lesson-page-store';
import { seedDemoPracticals } from '$lib/server/demo-practicals';
import { issuerKey } from '$lib/server/issuer-key';
import { startSchedules } from '$lib/server/schedules';
import { checkFileStore, StorageUnavailableError } from '$lib/server/storage';
import { withRequestContext } from '$lib/server/request-context';
import { whoIsAsking } from '$lib/server/session-cookie';

export const init: ServerInit = async () => {
	// Prerendering during `vite build` runs this hook too; the build must not touch a database.
	if (building) return;
	try {
		const config = loadConfig();
		authSecret();
		await migrateToLatest(getDb());
		await checkFileStore();
		// the certificate signing key exists from the first start, before anything is issued
		await issuerKey();
		if (config.seedDemo && (await seedDemo())) {
			await seedDemoPracticals();
			console.log('Seeded the demo scenario.');
		}
		const jobs = startSchedules();
		publishFastFront();
		// adapter-node emits this once the HTTP server has closed (SIGTERM, SIGINT): the jobs'
		// timers and a PostgreSQL pool's idle connections would otherwise keep the process alive.
		process.once('sveltekit:shutdown', () => {
			for (const job of jobs) job.stop();
			getDb()
				.destroy()
				.catch((e) => console.error('Closing the database failed:', e));
		});
	} catch (e) {
		// A setting, the data folder or the file store is wrong: one line that says which, not a stack trace.
		if (e instanceof ConfigError || e instanceof DataDirError || e instanceof StorageUnavailableError || (e instanceof Error && e.message.startsWith('AUTH_SECRET'))) {
			console.error(`Patchwright cannot start. ${e.message}`);
			process.exit(1);
		}
		throw e;
	}
};

/**
 * Outermost: security headers on every answer (Auth.js's own included), no-store for the API and
 * for anything served to a signed-in person, and 503 with Retry-After when the database was busy.
 */
const responseRules: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	const isApi = isApiPath(event.url.pathname);
	if (event.locals.databaseBusy) {
		const busy = busyAnswer();
		response = isApi
			? toResponse(busy)
			: new Response(`<!doctype html><meta charset="utf-8"><title>Busy · Patchwright</title><p>${BUSY_MESSAGE}</p>`, {
					status: 503,
					headers: { 'Content-Type': 'text/html; charset=utf-8', ...busy.headers }
				});
	}
	try {
		setSecurityHeaders(response.headers, event.locals.user !== null || isApi || event.url.pathname.startsWith('/auth/'));
	} catch {
		// Some responses (Response.redirect) have immutable headers: copy them into one that can change.
		response = new Response(response.body, response);
		setSecurityHeaders(response.headers, true);
	}
	return response;
};

/**
 * Who is asking, cheaply: only a request with a session cookie costs anything, and then one
 * decode (remembered per cookie) and two prepared statements. Auth.js itself runs only for its
 * own paths (/auth/...); the context it needs (client address) is set for those and for writes.
 */
const identity: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.sessionId = null;
	event.locals.databaseBusy = false;
	if (building) return resolve(event);
	const asking = await whoIsAsking(event.cookies, authSecret);
	if (asking) {
		event.locals.user = asking.user;
		event.locals.sessionId = asking.sessionId;
	}
	const isAuthPath = event.url.pathname.startsWith('/auth/');
	if (!isAuthPath && event.request.method === 'GET') return resolve(event);
	return withRequestContext({ clientAddress: event.getClientAddress() }, () =>
		isAuthPath ? authHandle({ event, resolve }) : resolve(event)
	);
};

/**
 * A lesson page's body goes into the rendered page here, not through the page data, and after
 * SvelteKit has finished the page: SvelteKit hashes every whole page it renders for an ETag, and
 * on an 80 KB lesson that hash was a fifth of the request's time. The body is the same for
 * everyone and changes only with a build, and lesson pages are not stored by browsers
 * (no-store when signed in), so the page goes without an ETag. The finished page is kept for
 * readers in the same position (see lesson-page-store.ts).
 */
const lessonBody: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const body = event.locals.lessonBody;
	if (body === undefined || response.status !== 200) return response;
	const page = pageWithBody(await response.text(), body);
	const headers = new Headers(response.headers);
	headers.delete('etag');
	headers.set('content-length', String(page.byteLength));
	storeLessonPage(event.locals.lessonPageKey, response.status, headers, page);
	return new Response(page, { status: response.status, headers });
};

export const handle = sequence(responseRules, apiGuard, identity, pageCache, lessonBody);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (status === 404) return { message: 'Not found' };
	if (isDatabaseBusy(error)) {
		event.locals.databaseBusy = true;
		return { message: BUSY_MESSAGE };
	}
	const id = logUnexpected(event.request.method, event.url.pathname, error);
	errorIds.set(event.request, id);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, id };
};
