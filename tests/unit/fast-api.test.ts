import fs from 'node:fs';
import http from 'node:http';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { clientAddress, fastApi, matchRoute } from '$lib/server/fast-api';
import { FAST_FRONT_KEY } from '$lib/server/fast-front';
import { getDb } from '$lib/server/db';
import { migrateToLatest } from '$lib/server/db/migrate';
import { useLimitStore } from '$lib/server/rate-limit';
import { addFastFront, FRONT, FRONT_FIRST, SERVER_LINE } from '../../scripts/adapter-fast-front.js';
import { useTemporaryDataDir } from '../helpers/certificates';
import { FELL_THROUGH, serveMiddleware } from '../helpers/front-door';
import { POST as verifyPost } from '../../src/routes/api/v1/certificates/verify/+server';
import type { RequestEvent } from '@sveltejs/kit';

/**
 * The built server's fast path for the hot JSON routes, over a real node:http server: what it
 * answers must be what the SvelteKit routes answer (the access-table and end-to-end tests run
 * against the built app, so they go through it too), and what it does not fully recognise
 * must reach SvelteKit untouched (here: the stand-in answers FELL_THROUGH).
 */

let front: Awaited<ReturnType<typeof serveMiddleware>>;
let base: string;

beforeAll(async () => {
	useTemporaryDataDir();
	process.env.AUTH_SECRET ??= 'a test secret that is long enough to derive keys from';
	await migrateToLatest(getDb());
	front = await serveMiddleware(fastApi);
	base = front.base;
});
afterAll(() => front.close());
beforeEach(() => useLimitStore(new Database(':memory:')));

/** A raw request, so a test decides exactly which headers go (fetch adds its own). */
function send(method: string, path: string, headers: Record<string, string> = {}, body?: Buffer | string): Promise<{ status: number; headers: http.IncomingHttpHeaders; text: string }> {
	return new Promise((resolve, reject) => {
		const req = http.request(`${base}${path}`, { method, headers }, (res) => {
			const chunks: Buffer[] = [];
			res.on('data', (c) => chunks.push(c));
			res.on('end', () => resolve({ status: res.statusCode!, headers: res.headers, text: Buffer.concat(chunks).toString('utf8') }));
		});
		req.on('error', reject);
		req.end(body);
	});
}

const json = (body: unknown) => {
	const text = JSON.stringify(body);
	return { headers: { 'Content-Type': 'application/json', 'Content-Length': String(Buffer.byteLength(text)) }, text };
};

describe('the fast JSON path', () => {
	it('answers health with the headers every API answer carries', async () => {
		const res = await send('GET', '/api/v1/health');
		expect(res.status).toBe(200);
		expect(JSON.parse(res.text)).toEqual({ ok: true });
		expect(res.headers['content-type']).toBe('application/json');
		expect(res.headers['cache-control']).toBe('no-store');
		expect(res.headers['x-content-type-options']).toBe('nosniff');
		expect(res.headers['x-frame-options']).toBe('DENY');
		expect(res.headers['referrer-policy']).toBe('same-origin');
	});

	it('runs a calculation, and refuses bodies under the API contract (415, 413, 400) in its error shape', async () => {
		const body = json({ inputs: { diameterMm: 225, lengthMm: 600, thicknessMm: 6 } });
		const ok = await send('POST', '/api/v1/calculations/laminate-volume', body.headers, body.text);
		expect(ok.status).toBe(200);
		expect(JSON.parse(ok.text)).toHaveProperty('result');

		const wrongType = await send('POST', '/api/v1/calculations/laminate-volume', { 'Content-Type': 'text/plain', 'Content-Length': String(body.text.length) }, body.text);
		expect(wrongType.status).toBe(415);
		expect(JSON.parse(wrongType.text).error.code).toBe('unsupported_media_type');

		const big = Buffer.alloc(70 * 1024, 0x20);
		const tooLarge = await send('POST', '/api/v1/calculations/laminate-volume', { 'Content-Type': 'application/json', 'Content-Length': String(big.length) }, big);
		expect(tooLarge.status).toBe(413);
		expect(JSON.parse(tooLarge.text).error.code).toBe('payload_too_large');

		const notUtf8 = Buffer.from([0x7b, 0xff, 0xfe, 0x7d]);
		const bad = await send('POST', '/api/v1/calculations/laminate-volume', { 'Content-Type': 'application/json', 'Content-Length': '4' }, notUtf8);
		expect(bad.status).toBe(400);
		expect(JSON.parse(bad.text).error.message).toMatch(/UTF-8/);

		const proto = json({ inputs: { __proto__: 1, constructor: 2 } });
		const hostile = await send('POST', '/api/v1/calculations/laminate-volume', proto.headers, proto.text);
		expect(hostile.status).toBe(400);
		expect(JSON.parse(hostile.text).error.code).toBe('bad_request');

		const unknown = await send('POST', '/api/v1/calculations/__proto__', body.headers, body.text);
		expect(unknown.status).toBe(404);
		expect(JSON.parse(unknown.text).error.code).toBe('not_found');
	});

	it('reads a body that arrives in pieces, with a character split between them', async () => {
		// "π" is two bytes in UTF-8 (0xCF 0x80); the field is unknown, so the answer names it back.
		const bytes = Buffer.from(JSON.stringify({ inputs: { diameterMm: 225, lengthMm: 600, thicknessMm: 6, 'π': 1 } }));
		const cut = bytes.indexOf(0xcf) + 1;
		const answer = await new Promise<{ status: number; text: string }>((resolve, reject) => {
			const req = http.request(`${base}/api/v1/calculations/laminate-volume`, {
				method: 'POST',
				headers: { 'Content-Type': 'application/json', 'Content-Length': String(bytes.length) }
			});
			req.on('response', (res) => {
				const chunks: Buffer[] = [];
				res.on('data', (c) => chunks.push(c));
				res.on('end', () => resolve({ status: res.statusCode!, text: Buffer.concat(chunks).toString('utf8') }));
			});
			req.on('error', reject);
			req.flushHeaders();
			req.write(bytes.subarray(0, cut));
			setTimeout(() => req.end(bytes.subarray(cut)), 30);
		});
		expect(answer.status).toBe(400);
		expect(JSON.parse(answer.text).error.fields).toEqual({ 'π': expect.stringContaining('Unknown input') });
	});

	it('lets go of a body the client gives up on halfway, and goes on answering', async () => {
		await new Promise<void>((resolve) => {
			const req = http.request(`${base}/api/v1/calculations/laminate-volume`, {
				method: 'POST',
				headers: { 'Content-Type': 'application/json', 'Content-Length': '100' }
			});
			req.on('error', () => resolve());
			req.flushHeaders();
			req.write('{"inputs":');
			setTimeout(() => req.destroy(), 30);
		});
		const health = await send('GET', '/api/v1/health');
		expect(health.status).toBe(200);
	});

	it('counts every call against the same per-address limit as the routes, answering 429 with Retry-After', async () => {
		let last = await send('GET', '/api/v1/practice/mix-ratio?seed=7');
		expect(last.status).toBe(200);
		expect(JSON.parse(last.text)).not.toHaveProperty('answer');
		for (let i = 0; i < 300 && last.status === 200; i++) last = await send('GET', '/api/v1/practice/mix-ratio?seed=7');
		expect(last.status).toBe(429);
		expect(Number(last.headers['retry-after'])).toBeGreaterThan(0);
		expect(JSON.parse(last.text).error.code).toBe('rate_limited');
	});

	it('answers an unknown and a malformed certificate number alike, and "who am I" with 401 for nobody', async () => {
		const unknown = await send('GET', '/api/v1/certificates/7ZZZ-ZZZZ-ZZZZ-ZZZZ');
		const malformed = await send('GET', '/api/v1/certificates/not-a-number');
		expect(unknown.status).toBe(404);
		expect(unknown.text).toBe(malformed.text);
		expect(JSON.parse(unknown.text)).toEqual({ error: { code: 'not_found', message: 'No certificate has this number.' } });

		for (const cookie of [undefined, 'authjs.session-token=forged', '__proto__=x; constructor=y']) {
			const res = await send('GET', '/api/v1/me', cookie ? { Cookie: cookie } : {});
			expect(res.status).toBe(401);
			expect(JSON.parse(res.text)).toEqual({ error: { code: 'unauthorized', message: 'Sign in first.' } });
		}
	});

	it('counts look-ups by number and by list against one per-address limit, each refusal a 429 with Retry-After', async () => {
		let last = await send('GET', '/api/v1/certificates/7ZZZ-ZZZZ-ZZZZ-ZZZZ');
		for (let i = 0; i < 200 && last.status !== 429; i++) last = await send('GET', '/api/v1/certificates/7ZZZ-ZZZZ-ZZZZ-ZZZZ');
		expect(last.status).toBe(429);
		expect(Number(last.headers['retry-after'])).toBeGreaterThan(0);
		expect(JSON.parse(last.text).error).toEqual({ code: 'rate_limited', message: expect.stringMatching(/^Too many look-ups/) });
		// the list check (a SvelteKit route) is refused for the same address, in the same shape
		const listed = await verifyPost({
			request: new Request('http://localhost/api/v1/certificates/verify', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ numbers: ['7ZZZ-ZZZZ-ZZZZ-ZZZZ'] }) }),
			getClientAddress: () => '127.0.0.1'
		} as unknown as Parameters<typeof verifyPost>[0] & RequestEvent);
		expect(listed.status).toBe(429);
		expect(Number(listed.headers.get('retry-after'))).toBeGreaterThan(0);
		expect((await listed.json()).error.code).toBe('rate_limited');
	});

	it('leaves SvelteKit everything it does not fully recognise', async () => {
		for (const [method, path] of [
			['HEAD', '/api/v1/health'],
			['OPTIONS', '/api/v1/health'],
			['POST', '/api/v1/health'],
			['GET', '/api/v1/health/'],
			['GET', '/api/v1//health'],
			['GET', '/api/v1/%68ealth'],
			['GET', '/api/v1/certificates/7ZZZ%2DZZZZ'],
			['GET', '/api/v1/certificates/..'],
			['POST', '/api/v1/calculations/.'],
			['GET', '/api/v1/attempts/1'],
			['GET', '/courses']
		]) {
			expect((await send(method, path)).status, `${method} ${path}`).toBe(FELL_THROUGH);
		}
		// a body without a declared length (chunked) is read by SvelteKit, under its own body limit
		const chunked = await send('POST', '/api/v1/calculations/laminate-volume', { 'Content-Type': 'application/json', 'Transfer-Encoding': 'chunked' }, '{}');
		expect(chunked.status).toBe(FELL_THROUGH);
	});

	it('matches only its own routes, exactly, with the parameters named as in the route files', () => {
		expect(matchRoute('GET', '/api/v1/certificates/ABCD-EFGH')).toMatchObject({ params: { number: 'ABCD-EFGH' } });
		expect(matchRoute('POST', '/api/v1/calculations/mix-ratio')).toMatchObject({ params: { id: 'mix-ratio' } });
		expect(matchRoute('GET', '/api/v1/calculations/mix-ratio')).toBeNull();
		expect(matchRoute('GET', '/api/v1/practice/mix-ratio/check')).toBeNull();
		// relative, empty or encoded segments, and near misses, are SvelteKit's to normalise or refuse
		for (const path of ['/api/v1/calculations/..', '/api/v1/calculations/.', '/api/v1/calculations/', '/api/v1/calculations/a%2Fb', '/api/v1/health/', '/api/v1/healthz', '/api/v1/me/', '/API/v1/me']) {
			expect(matchRoute(path.includes('calculations') ? 'POST' : 'GET', path), path).toBeNull();
		}
		expect(matchRoute('POST', '/api/v1/calculations/..x')).toMatchObject({ params: { id: '..x' } });
		expect(matchRoute('GET', '/api/v1/me')).toMatchObject({ params: {} });
		for (const route of ['/api/v1/health', '/api/v1/calculations/[id]', '/api/v1/practice/[generator]', '/api/v1/certificates/[number]', '/api/v1/me']) {
			// each route the fast path serves is also a SvelteKit route file, used by `vite dev` and as the fallback
			expect(fs.existsSync(`src/routes${route}/+server.ts`), route).toBe(true);
		}
	});

	it('works out the client address as adapter-node does (ADDRESS_HEADER, XFF_DEPTH), or leaves the request to it', () => {
		const req = (headers: http.IncomingHttpHeaders) => ({ headers, socket: { remoteAddress: '10.0.0.9' } }) as unknown as http.IncomingMessage;
		expect(clientAddress(req({}), {})).toBe('10.0.0.9');
		const xff = { ADDRESS_HEADER: 'X-Forwarded-For', XFF_DEPTH: '1' };
		expect(clientAddress(req({ 'x-forwarded-for': '203.0.113.5, 198.51.100.7' }), xff)).toBe('198.51.100.7');
		expect(clientAddress(req({ 'x-forwarded-for': '203.0.113.5, 198.51.100.7' }), { ...xff, XFF_DEPTH: '2' })).toBe('203.0.113.5');
		expect(clientAddress(req({ 'x-forwarded-for': '203.0.113.5' }), { ...xff, XFF_DEPTH: '3' })).toBeNull();
		expect(clientAddress(req({}), xff)).toBeNull();
		expect(clientAddress(req({ 'x-real-ip': '192.0.2.4' }), { ADDRESS_HEADER: 'X-Real-IP' })).toBe('192.0.2.4');
	});
});

describe("the fast front in adapter-node's entry point", () => {
	it("is added to the entry point adapter-node ships, before adapter-node's own handler", () => {
		const shipped = fs.readFileSync('node_modules/@sveltejs/adapter-node/files/index.js', 'utf8');
		expect(shipped).toContain(SERVER_LINE);
		const patched = addFastFront(shipped);
		// polka's own request listener is wrapped before it listens: the front door comes first
		expect(patched).toContain('server.attach = (req, res) => {');
		expect(patched).toContain('fast_front(req, res, next);');
		expect(patched.indexOf('const fast_front')).toBeLessThan(patched.indexOf('server.attach ='));
		expect(patched.indexOf('server.attach =')).toBeLessThan(patched.indexOf('server.listen('));
		// the entry point looks for the front door under the key the app publishes it with
		expect(patched).toContain(`globalThis[Symbol.for('${FAST_FRONT_KEY.description}')]`);
		expect(addFastFront(patched)).toBe(patched);
	});

	it('passes on what the front door leaves, once, and survives a fault in it', () => {
		const published = (globalThis as Record<symbol, unknown>)[FAST_FRONT_KEY];
		const errors = console.error;
		try {
			const polka: string[] = [];
			type Res = { headersSent: boolean; writableEnded: boolean; destroyed: boolean; destroy(): void };
			const server = { attach: (req: { id: string }, _res: Res) => void polka.push(req.id) };
			new Function('server', `${FRONT}${FRONT_FIRST}`)(server);
			const res = (): Res => ({ headersSent: false, writableEnded: false, destroyed: false, destroy() { this.destroyed = true; } });
			const front = (behaviour: (next: () => void) => void) => {
				(globalThis as Record<symbol, unknown>)[FAST_FRONT_KEY] = (_req: unknown, _res: unknown, next: () => void) => behaviour(next);
			};
			console.error = () => {};

			front((next) => next());
			server.attach({ id: 'stepped aside' }, res());
			front(() => {});
			server.attach({ id: 'answered' }, res());
			front(() => {
				throw new Error('fault before answering');
			});
			server.attach({ id: 'fault' }, res());
			front((next) => {
				next();
				throw new Error('fault after passing on');
			});
			server.attach({ id: 'fault after next' }, res());
			expect(polka).toEqual(['stepped aside', 'fault', 'fault after next']);

			const begun = { ...res(), headersSent: true };
			front(() => {
				throw new Error('fault mid-answer');
			});
			server.attach({ id: 'mid-answer' }, begun);
			expect(begun.destroyed).toBe(true);
			expect(polka).not.toContain('mid-answer');
		} finally {
			(globalThis as Record<symbol, unknown>)[FAST_FRONT_KEY] = published;
			console.error = errors;
		}
	});

	it('stops the build when adapter-node writes its entry point another way', () => {
		expect(() => addFastFront('const server = http.createServer(handler);')).toThrow(/not found/);
	});
});
