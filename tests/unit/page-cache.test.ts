import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { clearPageCache, fastPage, pageCache, shareWhenAnonymous } from '$lib/server/page-cache';
import type { Identity } from '$lib/roles';
import { FELL_THROUGH, serveMiddleware } from '../helpers/front-door';

/**
 * Pages shared by every visitor who is not signed in: stored once a load function opts in,
 * served again by the hook (and by the built server's front door), never to a signed-in person.
 */

const signedIn = { id: 'u1', email: 'a@example.test', name: 'Ada', roles: ['trainee'], companies: [] } as Identity;

function eventFor(path: string, { user = null as Identity | null, headers = {} as Record<string, string>, isDataRequest = false } = {}): RequestEvent {
	const url = new URL(path, 'http://localhost');
	return { url, request: new Request(url, { headers }), locals: { user, sessionId: null, databaseBusy: false }, isDataRequest } as unknown as RequestEvent;
}

let renders = 0;
/** Stands in for SvelteKit's render: the page opts in (as the catalogue's load does) and answers HTML. */
function resolverFor({ share = true, setCookie = false, status = 200 } = {}) {
	return async (event: RequestEvent) => {
		renders++;
		if (share) shareWhenAnonymous(event, 60);
		const headers = new Headers({ 'content-type': 'text/html', etag: '"abc"', 'content-security-policy': "script-src 'self' 'sha256-x'" });
		if (setCookie) headers.set('set-cookie', 'a=b');
		return new Response(`<p>render ${renders} for ${event.locals.user?.name ?? 'a visitor'}</p>`, { status, headers });
	};
}

beforeEach(() => {
	clearPageCache();
	renders = 0;
});

describe('the shared page store (hook)', () => {
	it('renders an opted-in page once for visitors, and answers If-None-Match with 304', async () => {
		const first = await pageCache({ event: eventFor('/courses'), resolve: resolverFor() });
		const second = await pageCache({ event: eventFor('/courses'), resolve: resolverFor() });
		expect(await first.text()).toBe('<p>render 1 for a visitor</p>');
		expect(await second.text()).toBe('<p>render 1 for a visitor</p>');
		expect(second.headers.get('content-security-policy')).toBe("script-src 'self' 'sha256-x'");
		expect(renders).toBe(1);
		const revalidated = await pageCache({ event: eventFor('/courses', { headers: { 'if-none-match': '"abc"' } }), resolve: resolverFor() });
		expect(revalidated.status).toBe(304);
	});

	it('never serves the stored page to a signed-in person, nor stores theirs', async () => {
		await pageCache({ event: eventFor('/courses'), resolve: resolverFor() });
		const mine = await pageCache({ event: eventFor('/courses', { user: signedIn }), resolve: resolverFor() });
		expect(await mine.text()).toBe('<p>render 2 for Ada</p>');
		clearPageCache();
		await pageCache({ event: eventFor('/courses', { user: signedIn }), resolve: resolverFor() });
		const visitor = await pageCache({ event: eventFor('/courses'), resolve: resolverFor() });
		expect(await visitor.text()).toBe('<p>render 4 for a visitor</p>');
	});

	it('stores nothing that did not opt in, set a cookie, failed, had a query or was a data request', async () => {
		const cases: [string, Parameters<typeof resolverFor>[0], Parameters<typeof eventFor>[1]?][] = [
			['/about', { share: false }],
			['/courses', { setCookie: true }],
			['/courses/nope', { status: 404 }],
			['/courses?sort=price', {}],
			['/courses/__data.json', {}, { isDataRequest: true }]
		];
		for (const [path, resolver, event] of cases) {
			await pageCache({ event: eventFor(path, event), resolve: resolverFor(resolver) });
			const before = renders;
			await pageCache({ event: eventFor(path, event), resolve: resolverFor(resolver) });
			expect(renders, path).toBe(before + 1);
		}
	});

	it("keeps one copy per reader's locale (prices are formatted for it)", async () => {
		await pageCache({ event: eventFor('/courses', { headers: { 'accept-language': 'de-DE,de;q=0.9' } }), resolve: resolverFor() });
		await pageCache({ event: eventFor('/courses', { headers: { 'accept-language': 'en-US' } }), resolve: resolverFor() });
		expect(renders).toBe(2);
		await pageCache({ event: eventFor('/courses', { headers: { 'accept-language': 'de-DE' } }), resolve: resolverFor() });
		expect(renders).toBe(2);
	});
});

describe("the shared page store (the built server's front door)", () => {
	let front: Awaited<ReturnType<typeof serveMiddleware>>;
	let base: string;
	beforeAll(async () => {
		front = await serveMiddleware(fastPage);
		base = front.base;
	});
	afterAll(() => front.close());

	it('serves a stored page with the security headers, and leaves the rest to SvelteKit', async () => {
		expect((await fetch(`${base}/courses`)).status).toBe(FELL_THROUGH);
		await pageCache({ event: eventFor('/courses'), resolve: resolverFor() });
		const stored = await fetch(`${base}/courses`);
		expect(stored.status).toBe(200);
		expect(await stored.text()).toBe('<p>render 1 for a visitor</p>');
		expect(stored.headers.get('x-frame-options')).toBe('DENY');
		expect(stored.headers.get('x-content-type-options')).toBe('nosniff');
		expect(stored.headers.get('cache-control')).toBeNull();
		expect((await fetch(`${base}/courses`, { headers: { 'if-none-match': '"abc"' } })).status).toBe(304);
		expect((await fetch(`${base}/courses`, { headers: { cookie: 'authjs.session-token=x' } })).status).toBe(FELL_THROUGH);
		expect((await fetch(`${base}/courses?x=1`)).status).toBe(FELL_THROUGH);
		expect((await fetch(`${base}/courses`, { method: 'HEAD' })).status).toBe(FELL_THROUGH);
		expect((await fetch(`${base}/courses`, { headers: { 'accept-language': 'fr-FR' } })).status).toBe(FELL_THROUGH);
		expect(renders).toBe(1);
	});
});
