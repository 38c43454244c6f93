import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import type { RequestEvent } from '@sveltejs/kit';
import { apiError, apiGuard, errorIds, readJson, refuseCrossOrigin } from '$lib/server/api';
import { errorMessage } from '$lib/api-error';

const schema = z.strictObject({ done: z.boolean() });

function post(body: BodyInit | null, headers: Record<string, string> = { 'content-type': 'application/json' }) {
	return new Request('http://app.test/api/v1/x', { method: 'POST', headers, body, duplex: 'half' } as RequestInit);
}

/** A body that arrives in chunks without a declared length, as a chunked upload does. */
function streamOf(totalBytes: number, chunk = 64 * 1024) {
	let sent = 0;
	return new ReadableStream<Uint8Array>({
		pull(controller) {
			if (sent >= totalBytes) return controller.close();
			const n = Math.min(chunk, totalBytes - sent);
			controller.enqueue(new Uint8Array(n).fill(0x20));
			sent += n;
		}
	});
}

describe('apiError', () => {
	it('answers the one shape, leaving out empty fields', async () => {
		const response = apiError(409, 'conflict', 'Already submitted.', {}, { reason: 'already-submitted', extra: { summary: { id: 'a' } } });
		expect(response.status).toBe(409);
		expect(await response.json()).toEqual({ summary: { id: 'a' }, error: { code: 'conflict', message: 'Already submitted.', reason: 'already-submitted' } });
	});

	it('is read back by the clients, and anything else falls back', async () => {
		expect(errorMessage(await apiError(400, 'bad_request', 'Nope').json(), 'fallback')).toBe('Nope');
		expect(errorMessage({ error: 'old shape' }, 'fallback')).toBe('fallback');
		expect(errorMessage(null, 'fallback')).toBe('fallback');
	});
});

describe('readJson', () => {
	it('parses a body that fits the schema', async () => {
		expect(await readJson(post('{"done": true}'), schema)).toEqual({ ok: true, data: { done: true } });
	});

	it('answers 415 for another content type or none', async () => {
		for (const headers of [{ 'content-type': 'text/plain' }, { 'content-type': 'application/x-www-form-urlencoded' }, {}] as Record<string, string>[]) {
			const out = await readJson(post('{"done": true}', headers), schema);
			expect(out.ok).toBe(false);
			if (!out.ok) {
				expect(out.response.status).toBe(415);
				expect((await out.response.json()).error.code).toBe('unsupported_media_type');
			}
		}
		expect((await readJson(post('{"done": true}', { 'content-type': 'application/merge-patch+json; charset=utf-8' }), schema)).ok).toBe(true);
	});

	it('answers 413, not 400, for a 10 MB body, declared or streamed', async () => {
		const tenMb = 10 * 1024 * 1024;
		const declared = await readJson(post(`{"done": true, "pad": "${' '.repeat(tenMb)}"}`), schema);
		const streamed = await readJson(post(streamOf(tenMb)), schema);
		for (const out of [declared, streamed]) {
			expect(out.ok).toBe(false);
			if (!out.ok) {
				expect(out.response.status).toBe(413);
				expect((await out.response.json()).error.code).toBe('payload_too_large');
			}
		}
	});

	it('answers 413 when the server itself refused the body as too large', async () => {
		const failing = new ReadableStream({
			start(controller) {
				controller.error(Object.assign(new Error('Payload Too Large'), { status: 413 }));
			}
		});
		const out = await readJson(post(failing), schema);
		expect(!out.ok && out.response.status).toBe(413);
	});

	it('answers 400 for a body whose stream broke off, and for bytes that are not UTF-8', async () => {
		const broken = new ReadableStream({
			start(controller) {
				controller.error(new Error('connection reset'));
			}
		});
		const cut = await readJson(post(broken), schema);
		expect(!cut.ok && (await cut.response.json()).error.message).toBe('The request body could not be read.');
		const notUtf8 = await readJson(post(new Uint8Array([0x7b, 0xff, 0xfe, 0x7d])), schema);
		expect(!notUtf8.ok && (await notUtf8.response.json()).error.message).toMatch(/UTF-8/);
	});

	it('answers 400 with a message per field, prototype keys included, for bad bodies', async () => {
		const notJson = await readJson(post('{done:'), schema);
		expect(!notJson.ok && (await notJson.response.json()).error).toMatchObject({ code: 'bad_request', fields: { body: 'Not JSON' } });
		const extra = await readJson(post('{"done": "yes", "__proto__": {"x": 1}, "constructor": 1}'), schema);
		expect(extra.ok).toBe(false);
		if (!extra.ok) {
			const { error } = await extra.response.json();
			expect(error.code).toBe('bad_request');
			expect(Object.keys(error.fields).sort()).toEqual(['__proto__', 'constructor', 'done']);
		}
	});
});

function event(method: string, headers: Record<string, string>, routeId: string | null = '/api/v1/progress/[course]/[lesson]', path = '/api/v1/progress/c/l') {
	return {
		request: new Request(`http://app.test${path}`, { method, headers }),
		url: new URL(`http://app.test${path}`),
		route: { id: routeId }
	} as unknown as RequestEvent;
}

describe('the Origin check on state-changing calls', () => {
	it('refuses another origin and a missing one, as SvelteKit does for form actions', async () => {
		for (const headers of [{ origin: 'http://evil.test' }, {}, { origin: 'null' }] as Record<string, string>[]) {
			const refused = refuseCrossOrigin(event('PUT', headers));
			expect(refused?.status).toBe(403);
			expect((await refused!.json()).error.code).toBe('forbidden');
		}
	});

	it('lets this origin, reads and pure computations through', () => {
		expect(refuseCrossOrigin(event('PUT', { origin: 'http://app.test' }))).toBeNull();
		expect(refuseCrossOrigin(event('GET', { origin: 'http://evil.test' }))).toBeNull();
		expect(refuseCrossOrigin(event('POST', {}, '/api/v1/calculations/[id]'))).toBeNull();
	});
});

describe('apiGuard', () => {
	const guard = async (path: string, answer: Response, method = 'GET') =>
		apiGuard({ event: event(method, { origin: 'http://app.test' }, '/api/v1/x', path), resolve: async () => answer } as never);

	it('turns an HTML error page into the shape, keeping headers, and forbids caching', async () => {
		const response = await guard('/api/v1/x', new Response('<!doctype html><h1>500</h1>', { status: 500, headers: { 'content-type': 'text/html', 'x-frame-options': 'DENY' } }));
		expect(response.status).toBe(500);
		expect(response.headers.get('content-type')).toMatch(/application\/json/);
		expect(response.headers.get('x-frame-options')).toBe('DENY');
		expect(response.headers.get('cache-control')).toBe('no-store');
		expect((await response.json()).error).toEqual({ code: 'internal', message: 'Something went wrong on our side.' });
	});

	it("keeps the message of a thrown error() and the logged error's reference", async () => {
		const thrown = await guard('/api/v1/x', Response.json({ message: 'Sign in first.' }, { status: 401 }));
		expect((await thrown.json()).error).toEqual({ code: 'unauthorized', message: 'Sign in first.' });
		const ev = event('GET', {}, '/api/v1/x', '/api/v1/x');
		errorIds.set(ev.request, 'abcd1234');
		const crashed = await apiGuard({ event: ev, resolve: async () => new Response('boom', { status: 500 }) } as never);
		expect((await crashed.json()).error).toMatchObject({ code: 'internal', id: 'abcd1234' });
	});

	it('leaves answers already in the shape, and other paths, alone', async () => {
		const own = apiError(404, 'not_found', 'No such attempt.');
		expect(await (await guard('/api/v1/x', own)).json()).toEqual({ error: { code: 'not_found', message: 'No such attempt.' } });
		const page = await apiGuard({ event: event('GET', {}, '/x', '/courses/x'), resolve: async () => new Response('<h1>x</h1>', { status: 404 }) } as never);
		expect(await page.text()).toBe('<h1>x</h1>');
	});

	it('refuses a cross-origin state change before the route runs', async () => {
		let ran = false;
		const response = await apiGuard({
			event: event('PUT', { origin: 'http://evil.test' }),
			resolve: async () => {
				ran = true;
				return new Response('{}');
			}
		} as never);
		expect(response.status).toBe(403);
		expect(ran).toBe(false);
	});
});
