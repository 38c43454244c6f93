import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { apiGuard, errorIds } from '$lib/server/api';
import { authHandle } from '$lib/server/auth';
import { config } from '$lib/server/config';
import { getDb } from '$lib/server/db';
import { migrateToLatest } from '$lib/server/db/migrate';
import { seedDemo } from '$lib/server/demo-seed';
import { loadIdentity } from '$lib/server/roles';

export const init: ServerInit = async () => {
	// Prerendering during `vite build` runs this hook too; the build must not touch a database.
	if (building) return;
	await migrateToLatest(getDb());
	if (config.seedDemo && (await seedDemo())) console.log('Seeded the demo scenario.');
};

const identity: Handle = async ({ event, resolve }) => {
	const session = await event.locals.auth();
	const userId = session?.user?.id;
	event.locals.user = userId ? await loadIdentity(userId) : null;
	return resolve(event);
};

/** Everything the pages need ships with the app; nothing loads from another origin. */
const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	response.headers.set('Referrer-Policy', 'same-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	return response;
};

export const handle = sequence(apiGuard, authHandle, identity, securityHeaders);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (status === 404) return { message: 'Not found' };
	const id = crypto.randomUUID().slice(0, 8);
	console.error(`[error ${id}] ${event.request.method} ${event.url.pathname}`, error);
	errorIds.set(event.request, id);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, id };
};
