import { sql } from 'kysely';
import { answerCalculation, CALCULATION_API_LIMIT } from '$lib/calc/api';
import { answerProblem, PRACTICE_API_LIMIT } from '$lib/practice/api';
import type { Identity } from '$lib/roles';
import type { RequestEvent } from '@sveltejs/kit';
import { errorAnswer, readJsonAnswer, toResponse, whenReady, type Answer, type TextRead } from './api';
import { getDb } from './db';
import { limitAnswer } from './rate-limit';
import { apiCertificate, lookUp, lookupLimitAnswer } from './verification';

/**
 * The JSON routes that are called most (health checks, the public calculators and practice
 * problems, certificate look-ups, "who am I"), written once over a plain description of the
 * call so two transports can serve them: SvelteKit's route files (`kitRoute`, used by
 * `vite dev` and as the fallback) and, in the built server, `fast-api.ts`, which answers them
 * before SvelteKit builds a Request. Both give the same answer, headers and error shape.
 */

export interface ApiCall {
	/** Route parameters, decoded. */
	params: Record<string, string>;
	query: URLSearchParams;
	clientAddress: string;
	/** The body's text under the API's rules (415 unless JSON, 413 past the cap, 400 for bad UTF-8). */
	jsonText(): Promise<TextRead>;
	/** The signed-in person, or null. */
	identity(): Promise<Identity | null>;
}

export interface ApiRoute {
	/** SvelteKit's route id, such as `/api/v1/calculations/[id]`. */
	id: string;
	method: 'GET' | 'POST';
	/** The answer, given at once where nothing has to wait (a promise costs on the hot path, see JsonBodyRoute). */
	answer(call: ApiCall): Answer | Promise<Answer>;
}

/**
 * A route that answers a JSON body, in two steps the built server's front door can run without
 * a promise (each costs there: AsyncLocalStorage's hooks run for every one): what stops the call
 * before its body is read, then the answer to the body. `answer` runs the same steps for
 * SvelteKit's route file.
 */
export interface JsonBodyRoute extends ApiRoute {
	method: 'POST';
	/** An answer that stops the call before its body is read (the rate limit), null to go on, or a promise of either. */
	before(call: ApiCall): Answer | null | Promise<Answer | null>;
	/** The answer to the body, once it has been read under the API's rules (JSON, capped, UTF-8). */
	withBody(call: ApiCall, text: string): Answer;
}

function jsonBodyRoute(route: Omit<JsonBodyRoute, 'method' | 'answer'>): JsonBodyRoute {
	return {
		...route,
		method: 'POST',
		async answer(call) {
			const refused = await route.before(call);
			if (refused) return refused;
			const read = await call.jsonText();
			return read.ok ? route.withBody(call, read.text) : read.answer;
		}
	};
}

export const isJsonBodyRoute = (route: ApiRoute): route is JsonBodyRoute => 'withBody' in route;

export const health: ApiRoute = {
	id: '/api/v1/health',
	method: 'GET',
	async answer() {
		await sql`select 1`.execute(getDb());
		return { status: 200, body: { ok: true } };
	}
};

/** Runs one calculator on {"inputs": {...}}; no sign-in, limited per client address. */
export const calculation = jsonBodyRoute({
	id: '/api/v1/calculations/[id]',
	before: (call) => limitAnswer(call.clientAddress, CALCULATION_API_LIMIT),
	withBody: (call, text) => answerCalculation(call.params.id, text)
});

/** One problem for ?seed=N (the same seed, the same problem), without its answer. */
export const practiceProblem: ApiRoute = {
	id: '/api/v1/practice/[generator]',
	method: 'GET',
	answer(call) {
		return whenReady(limitAnswer(call.clientAddress, PRACTICE_API_LIMIT), (refused) => refused ?? answerProblem(call.params.generator, call.query.get('seed')));
	}
};

/** One certificate's public status. No sign-in; limited per address; 404 looks the same for malformed and unknown numbers. */
export const certificate: ApiRoute = {
	id: '/api/v1/certificates/[number]',
	method: 'GET',
	async answer(call) {
		const refused = await lookupLimitAnswer(call.clientAddress);
		if (refused) return refused;
		const found = await lookUp(call.params.number);
		return found ? { status: 200, body: apiCertificate(found) } : errorAnswer(404, 'not_found', 'No certificate has this number.');
	}
};

/** The signed-in person's identity: roles and companies, never secrets. */
export const me: ApiRoute = {
	id: '/api/v1/me',
	method: 'GET',
	async answer(call) {
		const user = await call.identity();
		return user ? { status: 200, body: user } : errorAnswer(401, 'unauthorized', 'Sign in first.');
	}
};

export const hotRoutes: readonly ApiRoute[] = [health, calculation, practiceProblem, certificate, me];

/** A route file's handler for one of these routes. */
export const kitRoute =
	(route: ApiRoute) =>
	async (event: RequestEvent): Promise<Response> =>
		toResponse(
			await route.answer({
				params: event.params as Record<string, string>,
				get query() {
					return event.url.searchParams;
				},
				get clientAddress() {
					return event.getClientAddress();
				},
				jsonText: () => readJsonAnswer(event.request),
				identity: async () => event.locals.user
			})
		);
