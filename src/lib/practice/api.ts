/**
 * The practice API's answers as plain data, so the routes stay thin and tests call the logic
 * without a server.
 *
 * GET  /api/v1/practice                        200 {generators}
 * GET  /api/v1/practice/{generator}?seed=N     200 the problem, without its answer (a random seed when none is given)
 * POST /api/v1/practice/{generator}/check      {"seed": N, "answer": {"value": x, "unit": "kg"}} or {"seed": N, "answer": {"choice": "inside"}}
 *                                              200 {correct, outcome, message, expected, steps, hint?}
 * 400 {error: {code, message, fields}} with a message per field for bad input; 404 {error: {code, message}}
 * for an unknown generator (the route adds 413 and 415 when it reads the body).
 */
import { z } from 'zod';
import { errorBody, zodFields } from '$lib/api-error';
import { unitChoices } from './grading';
import { checkAnswer, generateProblem, getGenerator, listGenerators, MAX_SEED, publicProblem, randomSeed } from './index';

/** Requests per client address per window, shared by every practice route. */
export const PRACTICE_API_LIMIT = { bucket: 'practice-api', limit: 240, windowMs: 60_000 } as const;

export type ApiAnswer = { status: number; body: Record<string, unknown> };

const seedSchema = z
	.number({ error: (issue) => (issue.input === undefined ? 'Required' : 'Must be a whole number') })
	.int('Must be a whole number')
	.min(0, `Must be between 0 and ${MAX_SEED}`)
	.max(MAX_SEED, `Must be between 0 and ${MAX_SEED}`);

const checkSchema = z.strictObject(
	{
		seed: seedSchema,
		answer: z.union(
			[
				z.strictObject({ value: z.union([z.number(), z.string().max(40, 'Too long')]).nullable(), unit: z.string().max(20, 'Too long').optional() }),
				z.strictObject({ choice: z.string().max(40, 'Too long') })
			],
			{ error: 'Must be {"value": number, "unit": "kg"} or {"choice": "..."}' }
		)
	},
	{ error: (issue) => (issue.code === 'invalid_type' ? 'Must be an object with "seed" and "answer"' : undefined) }
);

function unknown(id: string): ApiAnswer {
	return { status: 404, body: { ...errorBody('not_found', `Unknown generator "${id}". GET /api/v1/practice lists them.`) } };
}

export function answerListing(): ApiAnswer {
	return { status: 200, body: { generators: listGenerators() } };
}

/** `seedText` is the query parameter as sent, or null when absent. */
export function answerProblem(id: string, seedText: string | null): ApiAnswer {
	if (!getGenerator(id)) return unknown(id);
	let seed: number;
	if (seedText === null || seedText.trim() === '') seed = randomSeed();
	else {
		const parsed = seedSchema.safeParse(/^\d+$/.test(seedText.trim()) ? Number(seedText) : seedText);
		if (!parsed.success) return { status: 400, body: { ...errorBody('bad_request', 'The seed is not valid.', { seed: parsed.error.issues[0].message }) } };
		seed = parsed.data;
	}
	const problem = publicProblem(generateProblem(id, seed));
	return { status: 200, body: { ...problem, ...(problem.kind === 'numeric' ? { units: unitChoices(problem.unit) } : {}) } };
}

export function answerCheck(id: string, bodyText: string): ApiAnswer {
	if (!getGenerator(id)) return unknown(id);
	let body: unknown;
	try {
		body = JSON.parse(bodyText);
	} catch {
		return { status: 400, body: { ...errorBody('bad_request', 'The request body must be JSON: {"seed": N, "answer": {"value": x, "unit": "kg"}}.', { body: 'Not JSON' }) } };
	}
	const parsed = checkSchema.safeParse(body);
	if (!parsed.success) return { status: 400, body: { ...errorBody('bad_request', 'Some fields are missing or not valid.', zodFields(parsed.error)) } };
	const problem = generateProblem(id, parsed.data.seed);
	const answer = parsed.data.answer;
	if (problem.kind === 'choice' && !('choice' in answer)) {
		return { status: 400, body: { ...errorBody('bad_request', 'This problem is answered with a choice.', { 'answer.choice': 'Required' }) } };
	}
	if (problem.kind === 'numeric' && !('value' in answer)) {
		return { status: 400, body: { ...errorBody('bad_request', 'This problem is answered with a number and a unit.', { 'answer.value': 'Required' }) } };
	}
	const { correct, outcome, message, expected, steps, hint } = checkAnswer(problem, answer);
	return { status: 200, body: { correct, outcome, message, expected, steps, ...(hint ? { hint } : {}) } };
}
