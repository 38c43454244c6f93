import http from 'node:http';
import { gunzipSync } from 'node:zlib';
import { encode } from '@auth/core/jwt';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { getDb } from '$lib/server/db';
import { migrateToLatest } from '$lib/server/db/migrate';
import { enrol } from '$lib/server/enrolments';
import { acceptsGzip } from '$lib/server/compression';
import { clearLessonPages, fastLesson, lessonPageKey, storeLessonPage } from '$lib/server/lesson-page-store';
import { lessonView, type LessonPageData } from '$lib/server/lesson-view';
import { setLessonDone } from '$lib/server/progress';
import { grantRole, loadIdentity } from '$lib/server/roles';
import { markSeatInUse } from '$lib/server/seats';
import { endSession, startSession } from '$lib/server/sessions';
import { createUser } from '$lib/server/users';
import type { Identity } from '$lib/roles';
import { useTemporaryDataDir } from '../helpers/certificates';
import { FELL_THROUGH, serveMiddleware } from '../helpers/front-door';

/**
 * The lesson page store and the built server's front door for it, over a real node:http server
 * and a real SQLite file: a stored page goes to everyone whose page would be the same, and
 * to no one else; anything the front door is not sure of reaches SvelteKit (FELL_THROUGH).
 */

const COURSE = 'point-repair-installer';
const CLOSED = `/courses/${COURSE}/resin-quantity`;
const PREVIEW = `/courses/${COURSE}/the-job-and-defects`;
const SECRET = 'a test secret that is long enough to derive keys from';

let front: Awaited<ReturnType<typeof serveMiddleware>>;

beforeAll(async () => {
	useTemporaryDataDir();
	process.env.AUTH_SECRET ??= SECRET;
	await migrateToLatest(getDb());
	front = await serveMiddleware(fastLesson);
});
afterAll(() => front.close());
beforeEach(() => clearLessonPages());

/** A person with an open session, and the Cookie header a browser would send for it. */
async function signedIn(name: string, { enrolled = true } = {}): Promise<{ user: Identity; cookie: string; sessionId: string }> {
	const { id } = await createUser({ email: `${crypto.randomUUID().slice(0, 8)}@crew.test`, name }, getDb());
	if (enrolled) await enrol(null, id, COURSE, 'registrar', getDb());
	const sessionId = await startSession(id, getDb());
	const token = await encode({ token: { sid: sessionId }, secret: process.env.AUTH_SECRET!, salt: 'authjs.session-token' });
	return { user: (await loadIdentity(id, getDb()))!, cookie: `authjs.session-token=${token}`, sessionId };
}

/** Renders nothing: stores a marked stand-in page under the key SvelteKit's render would use. */
async function store(path: string, user: Identity | null, text: string, acceptLanguage: string | null = null): Promise<LessonPageData> {
	const [, , courseSlug, lessonSlug] = path.split('/');
	const view = await lessonView(user, courseSlug, lessonSlug);
	if (view.kind !== 'page') throw new Error(`no page for ${path}: ${view.kind}`);
	const bytes = new TextEncoder().encode(text);
	storeLessonPage(lessonPageKey(path, acceptLanguage, user, view.data), 200, new Headers({ 'content-type': 'text/html', 'content-length': String(bytes.byteLength) }), bytes);
	return view.data;
}

function get(path: string, headers: Record<string, string> = {}, method = 'GET'): Promise<{ status: number; headers: http.IncomingHttpHeaders; text: string; bytes: Buffer }> {
	return new Promise((resolve, reject) => {
		const req = http.request(`${front.base}${path}`, { method, headers }, (res) => {
			const chunks: Buffer[] = [];
			res.on('data', (c) => chunks.push(c));
			res.on('end', () => {
				const bytes = Buffer.concat(chunks);
				resolve({ status: res.statusCode!, headers: res.headers, text: bytes.toString('utf8'), bytes });
			});
		});
		req.on('error', reject);
		req.end();
	});
}

describe('the lesson page store', () => {
	it('serves a stored page to everyone in the same position, private to signed-in readers', async () => {
		const ana = await signedIn('Ana');
		const ben = await signedIn('Ben');
		await store(CLOSED, ana.user, 'page for a new starter');
		// a page still kept under its key is not replaced (nor gzipped again) by a later render
		await store(CLOSED, ben.user, 'a second render of the same page');
		for (const reader of [ana, ben]) {
			const res = await get(CLOSED, { cookie: reader.cookie });
			expect(res.status).toBe(200);
			expect(res.text).toBe('page for a new starter');
			expect(res.headers['cache-control']).toBe('no-store');
			expect(res.headers['x-content-type-options']).toBe('nosniff');
			expect(res.headers['x-frame-options']).toBe('DENY');
		}
	});

	it('goes on to SvelteKit once what the page shows has changed: a lesson done, another role', async () => {
		const cy = await signedIn('Cy');
		await store(CLOSED, cy.user, 'before');
		expect((await get(CLOSED, { cookie: cy.cookie })).text).toBe('before');
		await setLessonDone(cy.user.id, COURSE, 'wet-out', true, getDb());
		expect((await get(CLOSED, { cookie: cy.cookie })).status).toBe(FELL_THROUGH);
		await setLessonDone(cy.user.id, COURSE, 'wet-out', false, getDb());
		expect((await get(CLOSED, { cookie: cy.cookie })).text).toBe('before');
		await grantRole(null, cy.user.id, 'inspector', getDb());
		expect((await get(CLOSED, { cookie: cy.cookie })).status).toBe(FELL_THROUGH);
	});

	it('never serves a page to someone who may not read it, nor past the end of a session', async () => {
		const dee = await signedIn('Dee');
		const outsider = await signedIn('Outsider', { enrolled: false });
		await store(CLOSED, dee.user, 'enrolled page');
		// not enrolled, a visitor, a forged cookie: SvelteKit answers (403, sign in)
		for (const headers of [{ cookie: outsider.cookie }, {}, { cookie: 'authjs.session-token=forged' }] as Record<string, string>[]) {
			expect((await get(CLOSED, headers)).status).toBe(FELL_THROUGH);
		}
		await endSession(dee.sessionId, 'sign-out', getDb());
		expect((await get(CLOSED, { cookie: dee.cookie })).status).toBe(FELL_THROUGH);
	});

	it('leaves a seat not yet counted as in use to SvelteKit, which counts it', async () => {
		const eve = await signedIn('Eve');
		await store(CLOSED, eve.user, 'page');
		const now = new Date().toISOString();
		const db = getDb();
		const orderId = crypto.randomUUID();
		await db
			.insertInto('course_order')
			.values({ id: orderId, number: `PW-T-${orderId.slice(0, 6)}`, buyer_id: eve.user.id, company_id: null, course_slug: COURSE, product: 'course', quantity: 1, unit_amount: 39000, total_amount: 39000, currency: 'EUR', state: 'paid', checkout_session_id: null, checkout_url: null, payment_intent_id: null, refunded_quantity: 0, refunded_amount: 0, created_at: now, paid_at: now, updated_at: now })
			.execute();
		await db.insertInto('seat').values({ id: crypto.randomUUID(), order_id: orderId, company_id: null, course_slug: COURSE, product: 'course', holder_id: eve.user.id, assigned_at: now, used_at: null, refunded_at: null, created_at: now }).execute();
		expect((await get(CLOSED, { cookie: eve.cookie })).status).toBe(FELL_THROUGH);
		expect(await markSeatInUse(eve.user.id, COURSE, db)).toBe(true);
		expect((await get(CLOSED, { cookie: eve.cookie })).text).toBe('page');
	});

	it('serves a preview lesson to visitors by their locale, and steps aside for anything but a plain GET of the bare path', async () => {
		await store(PREVIEW, null, 'visitor page', 'de-DE,de;q=0.9');
		expect((await get(PREVIEW, { 'accept-language': 'de-DE,de;q=0.9' })).text).toBe('visitor page');
		expect((await get(PREVIEW, { 'accept-language': 'en-GB' })).status).toBe(FELL_THROUGH);
		for (const path of [`${PREVIEW}?x=1`, `${PREVIEW}/`, `${PREVIEW}/__data.json`, PREVIEW.replace('the-job', 'the%2Djob'), `/courses/${COURSE}/__proto__`, `/courses/constructor/x`]) {
			expect((await get(path, { 'accept-language': 'de-DE,de;q=0.9' })).status, path).toBe(FELL_THROUGH);
		}
		expect((await get(PREVIEW, { 'accept-language': 'de-DE,de;q=0.9' }, 'HEAD')).status).toBe(FELL_THROUGH);
		expect((await get(PREVIEW, { 'accept-language': 'de-DE,de;q=0.9' }, 'POST')).status).toBe(FELL_THROUGH);
	});

	it('sends the page gzipped to a browser that takes gzip, as it is to one that does not', async () => {
		const ivy = await signedIn('Ivy');
		const page = 'a lesson page '.repeat(500);
		await store(CLOSED, ivy.user, page);
		const zipped = await get(CLOSED, { cookie: ivy.cookie, 'accept-encoding': 'gzip, deflate, br, zstd' });
		expect(zipped.headers['content-encoding']).toBe('gzip');
		expect(zipped.headers.vary).toBe('Accept-Encoding');
		expect(Number(zipped.headers['content-length'])).toBe(zipped.bytes.byteLength);
		expect(zipped.bytes.byteLength).toBeLessThan(page.length / 10);
		expect(gunzipSync(zipped.bytes).toString('utf8')).toBe(page); // node:zlib as the browser's decoder
		for (const acceptEncoding of ['gzip;q=0, br', 'identity']) {
			const plain = await get(CLOSED, { cookie: ivy.cookie, 'accept-encoding': acceptEncoding });
			expect(plain.headers['content-encoding']).toBeUndefined();
			expect(plain.text).toBe(page);
			expect(Number(plain.headers['content-length'])).toBe(page.length);
		}
	});

	it('reads Accept-Encoding as RFC 9110 says: q=0 refuses, * accepts', () => {
		expect(acceptsGzip('gzip, deflate, br')).toBe(true);
		expect(acceptsGzip('br;q=1, gzip;q=0.5')).toBe(true);
		expect(acceptsGzip('*')).toBe(true);
		expect(acceptsGzip('gzip;q=0')).toBe(false);
		expect(acceptsGzip('*;q=0')).toBe(false);
		expect(acceptsGzip('br')).toBe(false);
		expect(acceptsGzip('')).toBe(false);
		expect(acceptsGzip(undefined)).toBe(false);
	});

	it('keeps only a plain 200 that sets no cookie', async () => {
		const fay = await signedIn('Fay');
		const view = await lessonView(fay.user, COURSE, 'resin-quantity');
		if (view.kind !== 'page') throw new Error('no page');
		const key = lessonPageKey(CLOSED, null, fay.user, view.data);
		const bytes = new TextEncoder().encode('x');
		storeLessonPage(key, 200, new Headers({ 'set-cookie': 'a=b' }), bytes);
		storeLessonPage(key, 404, new Headers(), bytes);
		storeLessonPage(undefined, 200, new Headers(), bytes);
		expect((await get(CLOSED, { cookie: fay.cookie })).status).toBe(FELL_THROUGH);
	});
});

describe('lessonView', () => {
	it('decides who reads a lesson: visitors the previews, enrolled trainees all, staff all without progress', async () => {
		const db = getDb();
		expect((await lessonView(null, COURSE, 'the-job-and-defects')).kind).toBe('page');
		expect((await lessonView(null, COURSE, 'resin-quantity')).kind).toBe('sign-in');
		expect((await lessonView(null, COURSE, 'no-such-lesson')).kind).toBe('not-found');
		const outsider = await signedIn('Gil', { enrolled: false });
		expect(await lessonView(outsider.user, COURSE, 'resin-quantity')).toEqual({ kind: 'not-enrolled', courseTitle: expect.any(String) });
		await grantRole(null, outsider.user.id, 'trainer', db);
		const asTrainer = await lessonView((await loadIdentity(outsider.user.id, db))!, COURSE, 'resin-quantity');
		expect(asTrainer).toMatchObject({ kind: 'page', markSeat: false, data: { enrolled: false, doneLessons: [] } });

		const reader = await signedIn('Hal');
		await setLessonDone(reader.user.id, COURSE, 'wet-out', true, db);
		const view = await lessonView(reader.user, COURSE, 'resin-quantity');
		expect(view).toMatchObject({ kind: 'page', markSeat: false, data: { enrolled: true, doneLessons: ['wet-out'], lesson: { slug: 'resin-quantity' } } });
		// nothing in a page's data names the person, so people in the same position share it
		expect(JSON.stringify(view)).not.toContain(reader.user.id);
	});
});
