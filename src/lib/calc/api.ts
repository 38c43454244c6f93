/**
 * The public calculation API's answers as plain data, so the routes stay thin and tests
 * can call the logic without a server.
 *
 * POST /api/v1/calculations/{id} with {"inputs": {...}}:
 *   200 {result, steps, sources, warnings}
 *   400 {error: {code, message, fields}} for a body that is not JSON or inputs that do not validate
 *   404 {error: {code, message}} for an unknown calculator
 * (the route adds 413 and 415 when it reads the body).
 */
import { errorBody } from '$lib/api-error';
import { getCalculator, listCalculators, runCalculation } from './index';

/** Requests per IP address per window, shared by the listing and the calculations. */
export const CALCULATION_API_LIMIT = { bucket: 'calc-api', limit: 120, windowMs: 60_000 } as const;

export type ApiAnswer = { status: number; body: Record<string, unknown> };

export function answerListing(): ApiAnswer {
	return { status: 200, body: { calculators: listCalculators() } };
}

export function answerCalculation(id: string, bodyText: string): ApiAnswer {
	if (!getCalculator(id)) {
		return { status: 404, body: { ...errorBody('not_found', `Unknown calculator "${id}". GET /api/v1/calculations lists them.`) } };
	}
	let body: unknown;
	try {
		body = JSON.parse(bodyText);
	} catch {
		return {
			status: 400,
			body: { ...errorBody('bad_request', 'The request body must be JSON of the form {"inputs": {"name": number, ...}}.', { body: 'Not JSON' }) }
		};
	}
	if (typeof body !== 'object' || body === null || Array.isArray(body) || !('inputs' in body)) {
		return {
			status: 400,
			body: { ...errorBody('bad_request', 'The request body must be an object with "inputs".', { inputs: 'Required' }) }
		};
	}
	const out = runCalculation(id, body.inputs);
	if (!out.ok) {
		return { status: out.status, body: { ...errorBody('bad_request', 'Some inputs are missing or out of range.', out.errors) } };
	}
	const { result, steps, sources, warnings } = out;
	return { status: 200, body: { result, steps, sources, warnings } };
}
