import type { IncomingMessage, ServerResponse } from 'node:http';
import { parse as parseCookies } from 'cookie';
import { busyAnswer, errorAnswer, logUnexpected, readCapped, refuseNonJson, type Answer } from './api';
import { hotRoutes, type ApiCall, type ApiRoute } from './api-routes';
import { authSecret } from './auth';
import { isDatabaseBusy } from './db/errors';
import { NO_STORE, SECURITY_HEADERS } from './security-headers';
import { whoIsAsking } from './session-cookie';

/**
 * The built server's front door for the hot JSON routes (`api-routes.ts`): it answers them from
 * Node's own request and response objects, before adapter-node turns the request into a web
 * `Request` and SvelteKit runs its hooks, which is most of the cost of a small JSON answer.
 * Everything else, and anything here it does not fully recognise (another method, a path that
 * needs decoding or normalising, a body without a declared length), goes on to SvelteKit
 * untouched, so the answers are the same either way: same headers, same error shape, same limits.
 * It is one part of the built server's front door (`fast-front.ts`).
 */

export type Middleware = (req: IncomingMessage, res: ServerResponse, next: () => void) => void;

interface Compiled {
	route: ApiRoute;
	/** Each path segment: a literal, or the name of a parameter. */
	segments: { literal?: string; param?: string }[];
}

const compiled: Compiled[] = hotRoutes.map((route) => ({
	route,
	segments: route.id
		.split('/')
		.slice(1)
		.map((part) => (part.startsWith('[') && part.endsWith(']') ? { param: part.slice(1, -1) } : { literal: part }))
}));

/** The route and its decoded parameters, or null when the path is not one of ours exactly. */
export function matchRoute(method: string, pathname: string): { route: ApiRoute; params: Record<string, string> } | null {
	const parts = pathname.split('/').slice(1);
	for (const { route, segments } of compiled) {
		if (route.method !== method || segments.length !== parts.length) continue;
		const params: Record<string, string> = Object.create(null);
		let ok = true;
		for (let i = 0; i < segments.length && ok; i++) {
			const segment = segments[i];
			const part = parts[i];
			if (segment.literal !== undefined) ok = part === segment.literal;
			// anything encoded or relative is left to SvelteKit, which decodes and normalises paths its own way
			else ok = part !== '' && part !== '.' && part !== '..' && !part.includes('%');
			if (ok && segment.param) params[segment.param] = part;
		}
		if (ok) return { route, params };
	}
	return null;
}

/** The client's address as adapter-node works it out (ADDRESS_HEADER, XFF_DEPTH); null to leave the request to it. */
export function clientAddress(req: IncomingMessage, env: NodeJS.ProcessEnv = process.env): string | null {
	const header = env.ADDRESS_HEADER?.toLowerCase();
	if (!header) return req.socket.remoteAddress ?? null;
	const value = req.headers[header];
	if (typeof value !== 'string') return null;
	if (header !== 'x-forwarded-for') return value;
	const depth = Number.parseInt(env.XFF_DEPTH ?? '1', 10);
	const addresses = value.split(',');
	if (!(depth >= 1) || depth > addresses.length) return null;
	return addresses[addresses.length - depth].trim();
}

/** The headers every answer here carries, flat as `writeHead` takes them (one call instead of one per header). */
const COMMON_HEADERS: readonly string[] = [...SECURITY_HEADERS.flat(), ...NO_STORE];

function write(res: ServerResponse, { status, body, headers }: Answer): void {
	const text = JSON.stringify(body);
	const flat = ['Content-Type', 'application/json', 'Content-Length', String(Buffer.byteLength(text)), ...COMMON_HEADERS];
	if (headers) for (const [name, value] of Object.entries(headers)) flat.push(name, value);
	res.writeHead(status, flat);
	res.end(text);
}

function callOf(req: IncomingMessage, params: Record<string, string>, query: string, address: string): ApiCall {
	return {
		params,
		query: new URLSearchParams(query),
		clientAddress: address,
		async jsonText() {
			const refused = refuseNonJson(req.headers['content-type']);
			if (refused) return { ok: false, answer: refused };
			// the length is declared (chunked bodies go on to SvelteKit): past the cap it is 413
			// before a byte is read, and Node's parser never delivers more than it
			return readCapped(req.headers['content-length'], req);
		},
		async identity() {
			const header = req.headers.cookie;
			if (!header) return null;
			const cookies = parseCookies(header);
			return (await whoIsAsking({ get: (name) => cookies[name] }, authSecret))?.user ?? null;
		}
	};
}

async function answerSafely(method: string, pathname: string, route: ApiRoute, call: ApiCall): Promise<Answer> {
	try {
		return await route.answer(call);
	} catch (e) {
		if (isDatabaseBusy(e)) return busyAnswer();
		return errorAnswer(500, 'internal', 'Something went wrong on our side.', undefined, { id: logUnexpected(method, pathname, e) });
	}
}

export const fastApi: Middleware = (req, res, next) => {
	const url = req.url ?? '';
	const method = req.method ?? '';
	if (!url.startsWith('/api/v1/') || (method !== 'GET' && method !== 'POST')) return next();
	const q = url.indexOf('?');
	const pathname = q === -1 ? url : url.slice(0, q);
	const found = matchRoute(method, pathname);
	if (!found) return next();
	// a chunked body is SvelteKit's to read (its own body limit applies while streaming)
	if (method === 'POST' && req.headers['content-length'] === undefined) return next();
	const address = clientAddress(req);
	if (address === null) return next();
	const call = callOf(req, found.params, q === -1 ? '' : url.slice(q + 1), address);
	answerSafely(method, pathname, found.route, call).then(
		(answer) => write(res, answer),
		() => res.destroy()
	);
};
