/**
 * The public calculation API's answers as plain data, so the routes stay thin and tests
 * can call the logic without a server.
 *
 * POST /api/v1/calculations/{id} with {"inputs": {...}}:
 *   200 {result, steps, sources, warnings}
 *   400 {error, errors} for a body that is not JSON or inputs that do not validate
 *   404 {error} for an unknown calculator
 */
import { getCalculator, listCalculators, runCalculation } from './index';

/** Requests per IP address per window, shared by the listing and the calculations. */
export const CALCULATION_API_LIMIT = { bucket: 'calc-api', limit: 120, windowMs: 60_000 } as const;

export type ApiAnswer = { status: number; body: Record<string, unknown> };

export function answerListing(): ApiAnswer {
	return { status: 200, body: { calculators: listCalculators() } };
}

export function answerCalculation(id: string, bodyText: string): ApiAnswer {
	if (!getCalculator(id)) {
		return { status: 404, body: { error: `Unknown calculator "${id}". GET /api/v1/calculations lists them.` } };
	}
	let body: unknown;
	try {
		body = JSON.parse(bodyText);
	} catch {
		return {
			status: 400,
			body: { error: 'The request body must be JSON of the form {"inputs": {"name": number, ...}}.' }
		};
	}
	if (typeof body !== 'object' || body === null || Array.isArray(body) || !('inputs' in body)) {
		return {
			status: 400,
			body: { error: 'The request body must be an object with "inputs".', errors: { inputs: 'Required' } }
		};
	}
	const out = runCalculation(id, body.inputs);
	if (!out.ok) {
		return { status: out.status, body: { error: 'Some inputs are missing or out of range.', errors: out.errors } };
	}
	const { result, steps, sources, warnings } = out;
	return { status: 200, body: { result, steps, sources, warnings } };
}
