import type { IncomingMessage, ServerResponse } from 'node:http';
import { parse as parseCookies } from 'cookie';
import { busyAnswer, cappedBody, errorAnswer, logUnexpected, refuseNonJson, unreadableBody, whenReady, type Answer, type TextRead } from './api';
import { hotRoutes, isJsonBodyRoute, type ApiCall, type ApiRoute, type JsonBodyRoute } from './api-routes';
import { authSecret } from './auth';
import { isDatabaseBusy } from './db/errors';
import { NO_STORE, SECURITY_HEADERS } from './security-headers';
import { whoIsAsking } from './session-cookie';
import type { Identity } from '$lib/roles';

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
	/** The path up to its parameter, or the whole path of a route without one. */
	prefix: string;
	/** The parameter's name when the route ends in one (a hot route has at most one, as its last segment). */
	param: string | null;
}

const compiled: Compiled[] = hotRoutes.map((route) => {
	const open = route.id.indexOf('[');
	if (open === -1) return { route, prefix: route.id, param: null };
	const param = route.id.slice(open + 1, -1);
	if (route.id[open - 1] !== '/' || !route.id.endsWith(']') || /[[\]/]/.test(param)) {
		throw new Error(`fast-api: ${route.id}: a hot route may have one parameter, as its last segment`);
	}
	return { route, prefix: route.id.slice(0, open), param };
});

/**
 * A parameter as SvelteKit would give it, untouched: not empty, "." or "..", and holding no "/"
 * or "%" (anything encoded or relative is left to SvelteKit, which decodes and normalises paths
 * its own way).
 */
const isPlainSegment = (segment: string): boolean =>
	segment !== '' && segment !== '.' && segment !== '..' && !segment.includes('/') && !segment.includes('%');

const NO_PARAMS: Record<string, string> = Object.freeze({});

/**
 * The route and its parameters, or null when the path is not one of ours exactly. String tests
 * rather than a regular expression per route: this runs for every API request.
 */
export function matchRoute(method: string, pathname: string): { route: ApiRoute; params: Record<string, string> } | null {
	for (const { route, prefix, param } of compiled) {
		if (route.method !== method) continue;
		if (param === null) {
			if (pathname === prefix) return { route, params: NO_PARAMS };
			continue;
		}
		if (!pathname.startsWith(prefix)) continue;
		const value = pathname.slice(prefix.length);
		if (!isPlainSegment(value)) continue;
		// a plain object: its one key is a name from our own route ids, never a visitor's
		return { route, params: { [param]: value } };
	}
	return null;
}

/** How adapter-node finds the client's address: a header (ADDRESS_HEADER) and, for X-Forwarded-For, a depth (XFF_DEPTH). */
interface AddressRule {
	header: string | undefined;
	depth: number;
}

const addressRule = (env: NodeJS.ProcessEnv): AddressRule => ({
	header: env.ADDRESS_HEADER?.toLowerCase() || undefined,
	depth: Number.parseInt(env.XFF_DEPTH ?? '1', 10)
});

/** Read once, as adapter-node reads these settings once at start (reading the environment costs on every request). */
let processRule: AddressRule | undefined;

/** The client's address as adapter-node works it out (ADDRESS_HEADER, XFF_DEPTH); null to leave the request to it. */
export function clientAddress(req: IncomingMessage, env?: NodeJS.ProcessEnv): string | null {
	const { header, depth } = env ? addressRule(env) : (processRule ??= addressRule(process.env));
	if (!header) return req.socket.remoteAddress ?? null;
	const value = req.headers[header];
	if (typeof value !== 'string') return null;
	if (header !== 'x-forwarded-for') return value;
	const addresses = value.split(',');
	if (!(depth >= 1) || depth > addresses.length) return null;
	return addresses[addresses.length - depth].trim();
}

/** The headers every answer here carries, flat as `writeHead` takes them (one call instead of one per header). */
const COMMON_HEADERS: readonly string[] = [...SECURITY_HEADERS.flat(), ...NO_STORE];

/** Every answer's headers with a place for its length (index 3), copied per answer. */
const ANSWER_HEADERS: readonly string[] = ['Content-Type', 'application/json', 'Content-Length', '', ...COMMON_HEADERS];

function write(res: ServerResponse, { status, body, headers }: Answer): void {
	const text = JSON.stringify(body);
	const flat = ANSWER_HEADERS.slice();
	flat[3] = String(Buffer.byteLength(text));
	if (headers) for (const [name, value] of Object.entries(headers)) flat.push(name, value);
	res.writeHead(status, flat);
	res.end(text);
}

/**
 * The body of a request whose length is declared, read from Node's events and handed to `done`
 * under the API's rules (`cappedBody`), with no promise.
 */
function readDeclaredBody(req: IncomingMessage, done: (read: TextRead) => void): void {
	const capped = cappedBody(req.headers['content-length']);
	const refused = capped.refused();
	if (refused) return done(refused);
	const finish = (read: TextRead) => {
		req.off('data', onData).off('end', onEnd).off('error', onError);
		done(read);
	};
	// Node's parser never delivers more than the declared length; the cap is checked all the same
	const onData = (chunk: Buffer) => {
		const over = capped.add(chunk);
		if (over) finish(over);
	};
	const onEnd = () => finish(capped.text());
	const onError = () => finish(unreadableBody());
	req.on('data', onData).on('end', onEnd).on('error', onError);
}

/**
 * One call as the routes see it. A class rather than an object literal with a getter: an
 * accessor in a literal is defined at run time on every request, a class's lives on its prototype.
 */
class NodeCall implements ApiCall {
	constructor(
		private readonly req: IncomingMessage,
		readonly params: Record<string, string>,
		private readonly rawQuery: string,
		readonly clientAddress: string
	) {}

	/** Parsed only by the routes that read it. */
	get query(): URLSearchParams {
		return new URLSearchParams(this.rawQuery);
	}

	jsonText(): Promise<TextRead> {
		const refused = refuseNonJson(this.req.headers['content-type']);
		// the length is declared (chunked bodies go on to SvelteKit)
		return refused ? Promise.resolve({ ok: false, answer: refused }) : new Promise((resolve) => readDeclaredBody(this.req, resolve));
	}

	async identity(): Promise<Identity | null> {
		const header = this.req.headers.cookie;
		if (!header) return null;
		const cookies = parseCookies(header);
		return (await whoIsAsking({ get: (name) => cookies[name] }, authSecret))?.user ?? null;
	}
}

/**
 * A JSON-body route's two steps from Node's events, without a promise while the limit can be
 * told at once: the same answers, in the same order, as its `answer` (429, then 415, 413 or 400
 * for the body, then the route's answer).
 */
function answerJsonBody(req: IncomingMessage, res: ServerResponse, route: JsonBodyRoute, call: ApiCall, fail: (e: unknown) => void): void {
	const withBody = (read: TextRead) => {
		if (!read.ok) return write(res, read.answer);
		let answer: Answer;
		try {
			answer = route.withBody(call, read.text);
		} catch (e) {
			return fail(e);
		}
		write(res, answer);
	};
	const go = (refused: Answer | null) => {
		if (refused) return write(res, refused);
		const notJson = refuseNonJson(req.headers['content-type']);
		if (notJson) return write(res, notJson);
		readDeclaredBody(req, withBody);
	};
	let stop: Answer | null | Promise<Answer | null>;
	try {
		stop = route.before(call);
	} catch (e) {
		return fail(e);
	}
	whenReady(stop, go, fail);
}

/** The answer to a route that threw: 503 when the database was busy, otherwise 500 with a reference in the log. */
function failureAnswer(method: string, pathname: string, e: unknown): Answer {
	if (isDatabaseBusy(e)) return busyAnswer();
	return errorAnswer(500, 'internal', 'Something went wrong on our side.', undefined, { id: logUnexpected(method, pathname, e) });
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
	const call = new NodeCall(req, found.params, q === -1 ? '' : url.slice(q + 1), address);
	const fail = (e: unknown) => write(res, failureAnswer(method, pathname, e));
	if (isJsonBodyRoute(found.route)) return answerJsonBody(req, res, found.route, call, fail);
	let answer: Answer | Promise<Answer>;
	try {
		answer = found.route.answer(call);
	} catch (e) {
		return fail(e);
	}
	whenReady(answer, (done) => write(res, done), fail);
};
